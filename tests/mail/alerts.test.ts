// E-mail alerts end to end against a real SMTP server (the project's fake, smtp-server on a
// free loopback port) and the real outbox: one alert per inspector for an out-of-limits
// joint, in each reader's units, grouped into mail by each person's choice (immediate
// burst window, hourly, daily), nothing lost or duplicated when the server is down and
// comes back, two workers at once never folding or sending one mail twice (SKIP LOCKED),
// back-off until "failed".
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { freePort } from "@/database/local/mariadb";
import { startLocalMailServer, type LocalMailServer } from "@/database/local/mail-server";
import { db } from "@/database/client";
import { listDevMail } from "@/database/queries/dev-mailbox";
import { enqueueJointAlert } from "@/app/_server/mail/joint-alert";
import { enqueueMail, listOutbox } from "@/database/queries/outbox";
import { foldNotifications } from "@/app/_server/mail/fold-notifications";
import { BURST_WINDOW_S } from "@/domain/mail/grouping";
import { sendDueMails } from "@/app/_server/mail/send-due-mails";
import { createSmtpTransport, type MailTransport } from "@/app/_server/mail/transport";
import { MAX_MAIL_ATTEMPTS, retryDelayS } from "@/domain/mail/backoff";
import { makeReviewBase, makeReviewJoint, type FaultName, type ReviewBase } from "@/fixtures/review-joints";
import { ownerDb, resetDatabase, setOrganisationZoneRow } from "../support/db";
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
  async function recordJoint(fuserId: number, fault?: FaultName) {
    const joint = await makeReviewJoint(ownerDb(), base, { fuserId, madeAt: MADE, fault });
    const queued = await db().transaction((trx) => enqueueJointAlert({ jointId: joint.jointId }, trx));
    return { joint, queued };
  }

  /** The alerts' creation times, set as the test needs (the database stamps them on insert). */
  async function stampAlerts(jointId: number, at: Date) {
    await ownerDb()("notifications").where("dedupe_key", "like", `joint-alert:${jointId}:%`).update({ created_at: at });
  }
  const after = (at: Date, s: number) => new Date(at.getTime() + s * 1000);

  it("an out-of-limits joint makes exactly one mail to each active inspector, in that inspector's units, none for a joint within limits", async () => {
    const fuser = await makeUser({ roles: ["fuser"] });
    const a = await makeUser({ roles: ["inspector"] });
    const b = await makeUser({ roles: ["inspector", "admin"], unitSystem: "us" });
    await makeUser({ roles: ["inspector"], isActive: false });
    await makeUser({ roles: ["clerk"] });
    server = await startLocalMailServer({ port, spoolDir: spool });
    const transport = createSmtpTransport({ port });

    const good = await recordJoint(fuser.id);
    expect(good.queued.queued).toBe(0);
    const bad = await recordJoint(fuser.id, "heater-cold");
    expect(bad.queued.queued).toBe(2);
    // Calling it again (a retried request) adds nothing: dedupe key per joint and inspector.
    expect((await enqueueJointAlert({ jointId: bad.joint.jointId })).queued).toBe(0);
    const at = new Date();
    await stampAlerts(bad.joint.jointId, at);
    // Immediate: held for the burst window, then one mail each.
    expect(await foldNotifications({ now: after(at, BURST_WINDOW_S - 1) })).toMatchObject({ mails: 0 });
    expect(await foldNotifications({ now: after(at, BURST_WINDOW_S) })).toMatchObject({ mails: 2, alerts: 2 });

    expect(await sendDueMails({ transport })).toMatchObject({ claimed: 2, sent: 2, failed: 0 });
    expect(await sendDueMails({ transport })).toMatchObject({ claimed: 0 });
    transport.close();

    const mail = await listDevMail({ dir: spool });
    expect(mail.map((m) => m.to).flat().sort()).toEqual([a.email, b.email].sort());
    const label = `${base.jobCode} joint ${bad.joint.jointNo}`;
    for (const m of mail) {
      expect(m.subject).toBe(`Out of limits: ${label} (1 finding)`);
      expect(m.bodyText).toContain(`Review it: http://127.0.0.1:3000/review?joint=${bad.joint.jointId}`);
      expect(m.bodyText).toMatch(/Heater temperature/);
    }
    // source: ASTM D3035 / D2513 IPS 2 in pipe, OD 2.375 in (60.33 mm; 1 in = 25.4 mm exactly, NIST SP 811).
    const si = mail.find((m) => m.to.includes(a.email))!.bodyText;
    const us = mail.find((m) => m.to.includes(b.email))!.bodyText;
    expect(si).toContain("OD 60.3 mm");
    expect(si).toMatch(/\d °C/);
    expect(si).not.toMatch(/°F/);
    expect(us).toContain("OD 2.375 in");
    expect(us).toMatch(/\d °F/);
    expect(us).not.toMatch(/°C/);
    expect((await listOutbox()).every((o) => o.status === "sent" && o.sentAt instanceof Date && [a.id, b.id].includes(o.userId!))).toBe(true);
  });

  it("a mail server that is down leaves the joint recorded and the mail queued; it is sent once the server is back", async () => {
    const fuser = await makeUser({ roles: ["fuser"] });
    const inspector = await makeUser({ roles: ["inspector"] });
    const { joint } = await recordJoint(fuser.id, "cooling-short");
    await foldNotifications({ now: after(new Date(), BURST_WINDOW_S + 5) });
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

  it("an hourly inspector gets three alerts made within a minute as one mail, with each joint and its link", async () => {
    await setOrganisationZoneRow("America/Chicago");
    const fuser = await makeUser({ roles: ["fuser"] });
    const hourly = await makeUser({ roles: ["inspector"] });
    await ownerDb()("users").where({ id: hourly.id }).update({ mail_grouping: "hourly" });
    server = await startLocalMailServer({ port, spoolDir: spool });
    const transport = createSmtpTransport({ port });
    // 10:20:00, 10:20:25 and 10:20:50 Chicago time (16:20 UTC: CST is UTC−6 on 2026-11-24).
    const first = new Date("2026-11-24T16:20:00Z");
    const joints = [];
    for (const [i, s] of [0, 25, 50].entries()) {
      const { joint } = await recordJoint(fuser.id, i === 1 ? "heater-cold" : "cooling-short");
      await stampAlerts(joint.jointId, after(first, s));
      joints.push(joint);
    }
    // Nothing before the local hour ends (11:00 Chicago = 17:00 UTC)…
    expect(await foldNotifications({ now: new Date("2026-11-24T16:59:59Z") })).toMatchObject({ mails: 0 });
    expect(await sendDueMails({ transport })).toMatchObject({ claimed: 0 });
    // …then one mail with all three.
    expect(await foldNotifications({ now: new Date("2026-11-24T17:00:00Z") })).toMatchObject({ mails: 1, alerts: 3 });
    expect(await foldNotifications({ now: new Date("2026-11-24T18:00:00Z") })).toMatchObject({ mails: 0 });
    expect(await sendDueMails({ transport })).toMatchObject({ sent: 1 });
    transport.close();
    const mail = await listDevMail({ dir: spool });
    expect(mail).toHaveLength(1);
    expect(mail[0]!.to).toEqual([hourly.email]);
    expect(mail[0]!.subject).toBe("Beadline: 3 alerts — joints out of limits");
    for (const j of joints) {
      expect(mail[0]!.bodyText).toContain(`${base.jobCode} joint ${j.jointNo}`);
      expect(mail[0]!.bodyText).toContain(`http://127.0.0.1:3000/review?joint=${j.jointId}`);
    }
    expect(mail[0]!.bodyText).toContain("since 2026-11-24 10:20 −06:00");
    expect(await ownerDb()("notifications").whereNull("outbox_id")).toHaveLength(0);
  });

  it("an immediate inspector gets a burst as one mail, but only within the burst window", async () => {
    const fuser = await makeUser({ roles: ["fuser"] });
    const inspector = await makeUser({ roles: ["inspector"] });
    server = await startLocalMailServer({ port, spoolDir: spool });
    const transport = createSmtpTransport({ port });
    const t0 = new Date("2026-11-24T10:00:00Z");
    // Three within the window (0, 30, 90 s), a fourth after it closed (200 s).
    const offsets = [0, 30, 90, 200];
    const joints = [];
    for (const s of offsets) {
      const { joint } = await recordJoint(fuser.id, "cooling-short");
      await stampAlerts(joint.jointId, after(t0, s));
      joints.push(joint);
    }
    expect(await foldNotifications({ now: after(t0, BURST_WINDOW_S - 1) })).toMatchObject({ mails: 0 });
    expect(await foldNotifications({ now: after(t0, BURST_WINDOW_S) })).toMatchObject({ mails: 1, alerts: 3 });
    expect(await foldNotifications({ now: after(t0, 200 + BURST_WINDOW_S - 1) })).toMatchObject({ mails: 0 });
    expect(await foldNotifications({ now: after(t0, 200 + BURST_WINDOW_S) })).toMatchObject({ mails: 1, alerts: 1 });
    expect(await sendDueMails({ transport })).toMatchObject({ sent: 2 });
    transport.close();
    const mail = (await listDevMail({ dir: spool })).sort((x, y) => x.subject.localeCompare(y.subject));
    expect(mail).toHaveLength(2);
    const burst = mail.find((m) => m.subject.startsWith("Beadline: 3 alerts"))!;
    for (const j of joints.slice(0, 3)) expect(burst.bodyText).toContain(`/review?joint=${j.jointId}`);
    expect(burst.bodyText).not.toContain(`/review?joint=${joints[3]!.jointId}`);
    const alone = mail.find((m) => m !== burst)!;
    expect(alone.subject).toBe(`Out of limits: ${base.jobCode} joint ${joints[3]!.jointNo} (1 finding)`);
    expect(alone.to).toEqual([inspector.email]);
  });

  it("two workers folding and sending at once make and send one mail, not two", async () => {
    const fuser = await makeUser({ roles: ["fuser"] });
    await makeUser({ roles: ["inspector"] });
    const t0 = new Date("2026-11-24T10:00:00Z");
    for (const s of [0, 10, 20]) {
      const { joint } = await recordJoint(fuser.id, "cooling-short");
      await stampAlerts(joint.jointId, after(t0, s));
    }
    const now = after(t0, 600);
    const folds = await Promise.all([foldNotifications({ now }), foldNotifications({ now }), foldNotifications({ now })]);
    expect(folds.reduce((n, f) => n + f.mails, 0)).toBe(1);
    expect(await listOutbox()).toHaveLength(1);
    const sent: string[] = [];
    const slow = (): MailTransport => ({ send: async ({ subject }) => void (await new Promise((r) => setTimeout(r, 20)), sent.push(subject)), close: () => undefined });
    await Promise.all([sendDueMails({ transport: slow() }), sendDueMails({ transport: slow() })]);
    expect(sent).toEqual(["Beadline: 3 alerts — joints out of limits"]);
  });

  it("a daily inspector gets one mail for the day (06:00 in the organisation's zone) instead of one per joint", async () => {
    await setOrganisationZoneRow("Europe/Berlin");
    const fuser = await makeUser({ roles: ["fuser"] });
    const daily = await makeUser({ roles: ["inspector"] });
    await ownerDb()("users").where({ id: daily.id }).update({ mail_grouping: "daily" });
    const j1 = await recordJoint(fuser.id, "cooling-short");
    const j2 = await recordJoint(fuser.id, "cooling-short");
    // 14:00 and 23:30 Berlin time on 2026-11-24 (CET, UTC+1): the day's mail at 06:00 on the 25th (05:00 UTC).
    await stampAlerts(j1.joint.jointId, new Date("2026-11-24T13:00:00Z"));
    await stampAlerts(j2.joint.jointId, new Date("2026-11-24T22:30:00Z"));
    expect(await foldNotifications({ now: new Date("2026-11-25T04:59:59Z") })).toMatchObject({ mails: 0 });
    expect(await listOutbox()).toHaveLength(0);
    expect(await foldNotifications({ now: new Date("2026-11-25T05:00:00Z") })).toMatchObject({ mails: 1, alerts: 2 });
    expect(await foldNotifications({ now: new Date("2026-11-26T05:00:00Z") })).toMatchObject({ mails: 0 });
    const [mail] = await listOutbox();
    expect(mail).toMatchObject({ to: daily.email, kind: "alert-summary", userId: daily.id });
    expect(mail!.subject).toBe("Beadline: 2 alerts — joints out of limits");
    expect(mail!.bodyText).toContain(`joint ${j1.joint.jointNo}`);
    expect(mail!.bodyText).toContain(`joint ${j2.joint.jointNo}`);
    expect(mail!.bodyText).toContain("one mail a day");
  });
});
