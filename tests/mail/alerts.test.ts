// E-mail alerts end to end against a real SMTP server (the project's fake, smtp-server on a
// free loopback port) and the real outbox: one mail per inspector for an out-of-limits
// joint, nothing lost or duplicated when the server is down and comes back, several
// senders never sending one mail twice (SKIP LOCKED), back-off until "failed".
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { freePort } from "@/database/local/mariadb";
import { startLocalMailServer, type LocalMailServer } from "@/database/local/mail-server";
import { db } from "@/database/client";
import { listDevMail } from "@/database/queries/dev-mailbox";
import { enqueueJointAlert } from "@/app/_server/mail/joint-alert";
import { enqueueMail, foldDailyDigests, listOutbox } from "@/database/queries/outbox";
import { sendDueMails } from "@/app/_server/mail/send-due-mails";
import { createSmtpTransport, type MailTransport } from "@/app/_server/mail/transport";
import { MAX_MAIL_ATTEMPTS, retryDelayS } from "@/domain/mail/backoff";
import { makeReviewBase, makeReviewJoint, type ReviewBase } from "@/fixtures/review-joints";
import { ownerDb, resetDatabase } from "../support/db";
import { makeUser } from "../support/users";

const MADE = new Date("2026-11-24T10:00:00Z");

describe("out-of-limits alerts through SMTP", () => {
  let server: LocalMailServer | null = null;
  let spool: string;
  let port: number;
  let base: ReviewBase;

  beforeEach(async () => {
    await resetDatabase();
    spool = mkdtempSync(path.join(os.tmpdir(), "beadline-mail-test-"));
    port = await freePort();
    base = await makeReviewBase(ownerDb());
  });
  afterEach(async () => {
    if (server) await server.stop();
    server = null;
    rmSync(spool, { recursive: true, force: true });
  });

  /** What the trench does: the joint and its alert in one transaction. */
  async function recordJoint(fuserId: number, fault?: "cooling-short") {
    const joint = await makeReviewJoint(ownerDb(), base, { fuserId, madeAt: MADE, fault });
    const queued = await db().transaction((trx) => enqueueJointAlert({ jointId: joint.jointId }, trx));
    return { joint, queued };
  }

  it("an out-of-limits joint makes exactly one mail to each active inspector, none for a joint within limits", async () => {
    const fuser = await makeUser({ roles: ["fuser"] });
    const a = await makeUser({ roles: ["inspector"] });
    const b = await makeUser({ roles: ["inspector", "admin"] });
    await makeUser({ roles: ["inspector"], isActive: false });
    await makeUser({ roles: ["clerk"] });
    server = await startLocalMailServer({ port, spoolDir: spool });
    const transport = createSmtpTransport({ port });

    const good = await recordJoint(fuser.id);
    expect(good.queued.queued).toBe(0);
    const bad = await recordJoint(fuser.id, "cooling-short");
    expect(bad.queued.queued).toBe(2);
    // Calling it again (a retried request) adds nothing: dedupe key per joint and inspector.
    expect((await enqueueJointAlert({ jointId: bad.joint.jointId })).queued).toBe(0);

    expect(await sendDueMails({ transport })).toMatchObject({ claimed: 2, sent: 2, failed: 0 });
    expect(await sendDueMails({ transport })).toMatchObject({ claimed: 0 });
    transport.close();

    const mail = await listDevMail({ dir: spool });
    expect(mail.map((m) => m.to).flat().sort()).toEqual([a.email, b.email].sort());
    const label = `${base.jobCode} joint ${bad.joint.jointNo}`;
    for (const m of mail) {
      expect(m.subject).toBe(`Out of limits: ${label} (1 finding)`);
      expect(m.bodyText).toContain(bad.joint.check.findings[0]!.message);
      expect(m.bodyText).toContain(`/review?joint=${bad.joint.jointId}`);
    }
    expect((await listOutbox()).every((o) => o.status === "sent" && o.sentAt instanceof Date)).toBe(true);
  });

  it("a mail server that is down leaves the joint recorded and the mail queued; it is sent once the server is back", async () => {
    const fuser = await makeUser({ roles: ["fuser"] });
    const inspector = await makeUser({ roles: ["inspector"] });
    const { joint } = await recordJoint(fuser.id, "cooling-short");
    const down = createSmtpTransport({ port }); // nothing listens on this port yet

    const first = await sendDueMails({ transport: down });
    expect(first).toMatchObject({ claimed: 1, sent: 0, failed: 1 });
    expect(await ownerDb()("joints").where({ id: joint.jointId })).toHaveLength(1);
    const [queued] = await listOutbox();
    expect(queued).toMatchObject({ status: "queued", attempts: 1, to: inspector.email });
    expect(queued!.lastError).toMatch(/ECONNREFUSED|connect/i);
    // Not retried before its back-off delay…
    expect((await sendDueMails({ transport: down, now: new Date() })).claimed).toBe(0);
    down.close();

    server = await startLocalMailServer({ port, spoolDir: spool });
    const up = createSmtpTransport({ port });
    // …and sent on the first pass after it.
    const later = new Date(queued!.nextAttemptAt.getTime() + 1000);
    expect(await sendDueMails({ transport: up, now: later })).toMatchObject({ claimed: 1, sent: 1 });
    up.close();
    const [sent] = await listOutbox();
    expect(sent).toMatchObject({ status: "sent", attempts: 2, lastError: null });
    const mail = await listDevMail({ dir: spool });
    expect(mail).toHaveLength(1);
    expect(mail[0]!.to).toEqual([inspector.email]);
  });

  it("two senders at once never send one mail twice (FOR UPDATE SKIP LOCKED)", async () => {
    for (let i = 0; i < 12; i += 1) await enqueueMail({ to: `person${i}@test.example`, subject: `Mail ${i}`, bodyText: "x", kind: "test" });
    const sentTo: string[] = [];
    const slow = (): MailTransport => ({
      send: async ({ to }) => {
        await new Promise((r) => setTimeout(r, 20));
        sentTo.push(to);
      },
      close: () => undefined,
    });
    const [r1, r2] = await Promise.all([sendDueMails({ transport: slow(), limit: 8 }), sendDueMails({ transport: slow(), limit: 8 })]);
    const r3 = await sendDueMails({ transport: slow(), limit: 8 });
    expect(r1.sent + r2.sent + r3.sent).toBe(12);
    expect(new Set(sentTo).size).toBe(12);
    expect(sentTo).toHaveLength(12);
  });

  it("retries with growing delays and marks the mail failed, still listed, after the last attempt", async () => {
    // common practice (no published source): exponential back-off, doubling, capped.
    expect([1, 2, 3, 4].map((n) => retryDelayS(n))).toEqual([10, 20, 40, 80]);
    expect(retryDelayS(30)).toBe(3600);
    await enqueueMail({ to: "nobody@test.example", subject: "Will fail", bodyText: "x", kind: "test" });
    const failing: MailTransport = { send: async () => Promise.reject(Object.assign(new Error("550 mailbox unavailable"), { code: "EENVELOPE" })), close: () => undefined };
    let now = new Date();
    const delays: number[] = [];
    for (let attempt = 1; attempt <= MAX_MAIL_ATTEMPTS; attempt += 1) {
      const r = await sendDueMails({ transport: failing, now });
      expect(r.claimed).toBe(1);
      const [m] = await listOutbox();
      if (attempt < MAX_MAIL_ATTEMPTS) {
        expect(m).toMatchObject({ status: "queued", attempts: attempt });
        delays.push(Math.round((m!.nextAttemptAt.getTime() - Date.now()) / 1000));
        now = new Date(m!.nextAttemptAt.getTime() + 1000);
      } else {
        expect(m).toMatchObject({ status: "failed", attempts: MAX_MAIL_ATTEMPTS, lastError: "EENVELOPE: 550 mailbox unavailable" });
      }
    }
    for (let i = 1; i < delays.length; i += 1) expect(delays[i]!).toBeGreaterThanOrEqual(delays[i - 1]!);
    expect((await sendDueMails({ transport: failing, now: new Date(now.getTime() + 86_400_000) })).claimed).toBe(0);
    expect(await listOutbox({ status: "failed" })).toHaveLength(1);
  });

  it("an inspector with the daily digest gets one summary mail for the day instead of one per joint", async () => {
    const fuser = await makeUser({ roles: ["fuser"] });
    const digest = await makeUser({ roles: ["inspector"] });
    await ownerDb()("users").where({ id: digest.id }).update({ daily_digest: true });
    const j1 = await recordJoint(fuser.id, "cooling-short");
    const j2 = await recordJoint(fuser.id, "cooling-short");
    expect(await listOutbox()).toHaveLength(0);
    // Before the day's cut-off nothing is folded; after it, one mail with both joints.
    const created = (await ownerDb()("mail_digest_items").min({ t: "created_at" }).first())!.t as Date;
    expect(await foldDailyDigests({ now: new Date(created.getTime() - 1000), hour: (created.getUTCHours() + 1) % 24 })).toBe(0);
    const nextDay = new Date(created.getTime() + 86_400_000);
    expect(await foldDailyDigests({ now: nextDay })).toBe(1);
    expect(await foldDailyDigests({ now: nextDay })).toBe(0);
    const [mail] = await listOutbox();
    expect(mail).toMatchObject({ to: digest.email, kind: "daily-digest" });
    expect(mail!.subject).toMatch(/daily summary .*: 2 events/);
    expect(mail!.bodyText).toContain(`joint ${j1.joint.jointNo}`);
    expect(mail!.bodyText).toContain(`joint ${j2.joint.jointNo}`);
  });
});
