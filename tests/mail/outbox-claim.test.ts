// The outbox claim (database/queries/outbox.ts claimDueMails, app/_server/mail/send-due-mails.ts)
// as two app instances see it: each sender on a knex pool of its own, delivering through
// the project's SMTP catcher (smtp-server on a free loopback port, one spool file per
// message received), so "sent once" is counted where the mail arrives, not in our tables.
// Checked: two senders over the same queued mails deliver each exactly once; the claim is
// committed before the SMTP conversation starts (another connection sees it); a claim whose
// sender died is taken over after the lease, and the dead sender's late mark changes nothing.
// source: common practice for a transactional outbox (no published standard).
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import knexFactory, { type Knex } from "knex";
import { afterAll, afterEach, beforeEach, describe, expect, it } from "vitest";
import { startLocalMailServer, type LocalMailServer } from "@/database/local/mail-server";
import { freePort } from "@/database/local/mariadb";
import { listDevMail } from "@/database/queries/dev-mailbox";
import { CLAIM_LEASE_S, claimDueMails, enqueueMail, markMailFailed, markMailSent } from "@/database/queries/outbox";
import { sendDueMails, type SendReport } from "@/app/_server/mail/send-due-mails";
import { createSmtpTransport, type MailTransport } from "@/app/_server/mail/transport";
import { closeOwnerDb, ownerDb, resetDatabase } from "../support/db";

// eslint-disable-next-line @typescript-eslint/no-require-imports
const config = require("../../knexfile.js") as Knex.Config;

describe("outbox claims across two app instances", () => {
  let server: LocalMailServer;
  let spool: string;
  let port: number;
  const pools: Knex[] = [];
  /** A pool of its own, as a second `next start` process would have. */
  const instancePool = () => {
    const k = knexFactory(config);
    pools.push(k);
    return k;
  };

  beforeEach(async () => {
    await resetDatabase();
    spool = mkdtempSync(path.join(os.tmpdir(), "beadline-claim-test-"));
    port = await freePort();
    server = await startLocalMailServer({ port, spoolDir: spool });
  });
  afterEach(async () => {
    await server.stop();
    rmSync(spool, { recursive: true, force: true });
    await Promise.all(pools.splice(0).map((k) => k.destroy()));
  });
  afterAll(async () => {
    await closeOwnerDb();
  });

  /** One instance's worker: passes until a pass claims nothing. */
  async function drain(knex: Knex, transport: MailTransport): Promise<SendReport[]> {
    const reports: SendReport[] = [];
    for (;;) {
      const r = await sendDueMails({ knex, transport, limit: 5, now: new Date() });
      reports.push(r);
      if (r.claimed === 0) return reports;
    }
  }

  it("two senders draining the same 30 queued mails at once deliver each exactly once", async () => {
    for (let i = 0; i < 30; i += 1) await enqueueMail({ to: `person${i}@test.example`, subject: `Claim test ${i}`, bodyText: `Mail number ${i}`, kind: "test" });
    const [one, two] = [createSmtpTransport({ port }), createSmtpTransport({ port })];
    try {
      const [a, b] = await Promise.all([drain(instancePool(), one), drain(instancePool(), two)]);
      const sent = [...a, ...b].reduce((n, r) => n + r.sent, 0);
      expect(sent).toBe(30);
      expect([...a, ...b].reduce((n, r) => n + r.takenOver, 0)).toBe(0);
    } finally {
      one.close();
      two.close();
    }
    // At the SMTP server: 30 messages, one per subject.
    const arrived = await listDevMail({ dir: spool, limit: 1000 });
    expect(arrived).toHaveLength(30);
    expect(new Set(arrived.map((m) => m.subject)).size).toBe(30);
    const rows = (await ownerDb()("mail_outbox").select("status", "attempts", "claimed_by")) as { status: string; attempts: number; claimed_by: string | null }[];
    expect(rows.every((r) => r.status === "sent" && Number(r.attempts) === 1 && r.claimed_by === null)).toBe(true);
  });

  it("the claim is committed before the mail is handed to the SMTP server", async () => {
    await enqueueMail({ to: "someone@test.example", subject: "Seen while sending", bodyText: "x", kind: "test" });
    const smtp = createSmtpTransport({ port });
    let seenDuringSend: { status: string; attempts: number; claimed_by: string | null } | undefined;
    const watching: MailTransport = {
      // Another connection (the owner's pool) reads the row while the send is under way:
      // it sees only committed data, so it sees the claim only if the claim was committed.
      send: async (mail) => {
        seenDuringSend = await ownerDb()("mail_outbox").where({ subject: "Seen while sending" }).first("status", "attempts", "claimed_by");
        await smtp.send(mail);
      },
      close: () => smtp.close(),
    };
    try {
      expect(await sendDueMails({ knex: instancePool(), transport: watching })).toMatchObject({ claimed: 1, sent: 1 });
    } finally {
      smtp.close();
    }
    expect(seenDuringSend).toMatchObject({ status: "sending", attempts: 1, claimed_by: expect.stringMatching(/^[0-9a-f-]{36}$/) });
    expect(await listDevMail({ dir: spool })).toHaveLength(1);
  });

  it("a claim whose sender died is taken over after the lease; the dead sender's late marks change nothing", async () => {
    await enqueueMail({ to: "late@test.example", subject: "Taken over", bodyText: "x", kind: "test" });
    const t0 = new Date();
    // Instance A claims and then stops (never sends, never marks).
    const [held] = await claimDueMails({ now: t0 }, instancePool());
    expect(held).toMatchObject({ status: "sending", attempts: 1 });
    const b = instancePool();
    const smtp = createSmtpTransport({ port });
    try {
      // Within the lease instance B finds nothing to send.
      expect((await sendDueMails({ knex: b, transport: smtp, now: new Date(t0.getTime() + (CLAIM_LEASE_S - 1) * 1000) })).claimed).toBe(0);
      // After it, B claims the mail again and delivers it.
      expect(await sendDueMails({ knex: b, transport: smtp, now: new Date(t0.getTime() + (CLAIM_LEASE_S + 1) * 1000) })).toMatchObject({ claimed: 1, sent: 1 });
    } finally {
      smtp.close();
    }
    // A comes back and tries to record its result: its claim no longer holds the mail.
    expect(await markMailSent({ id: held!.id, claim: held!.claim, now: new Date() })).toBe(false);
    expect(await markMailFailed({ id: held!.id, claim: held!.claim, attempts: held!.attempts, error: "late", now: new Date() })).toMatchObject({ held: false });
    const row = await ownerDb()("mail_outbox").where({ id: held!.id }).first("status", "attempts", "last_error", "claimed_by");
    expect(row).toMatchObject({ status: "sent", attempts: 2, last_error: null, claimed_by: null });
    expect(await listDevMail({ dir: spool })).toHaveLength(1);
  });

  it("a sender that is still busy at half its lease starts no more sends and hands the rest back", async () => {
    for (let i = 0; i < 3; i += 1) await enqueueMail({ to: `slow${i}@test.example`, subject: `Slow ${i}`, bodyText: "x", kind: "test" });
    const previous = process.env.MAIL_CLAIM_LEASE_S;
    process.env.MAIL_CLAIM_LEASE_S = "10"; // the shortest lease allowed: sends may start for 5 s
    const smtp = createSmtpTransport({ port });
    // The first send takes longer than half the lease (a slow mail server).
    let first = true;
    const slow: MailTransport = {
      send: async (mail) => {
        if (first) await new Promise((r) => setTimeout(r, 5_500));
        first = false;
        await smtp.send(mail);
      },
      close: () => undefined,
    };
    try {
      const k = instancePool();
      expect(await sendDueMails({ knex: k, transport: slow, limit: 3 })).toMatchObject({ claimed: 3, sent: 1, released: 2 });
      const back = (await ownerDb()("mail_outbox").where({ status: "queued" }).select("attempts", "claimed_by")) as { attempts: number; claimed_by: string | null }[];
      expect(back).toEqual([
        { attempts: 0, claimed_by: null },
        { attempts: 0, claimed_by: null },
      ]);
      // The next pass sends them.
      expect(await sendDueMails({ knex: k, transport: slow, limit: 3 })).toMatchObject({ claimed: 2, sent: 2, released: 0 });
    } finally {
      smtp.close();
      if (previous === undefined) delete process.env.MAIL_CLAIM_LEASE_S;
      else process.env.MAIL_CLAIM_LEASE_S = previous;
    }
    expect(await listDevMail({ dir: spool })).toHaveLength(3);
  });
});
