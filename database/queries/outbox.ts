// The mail outbox: every e-mail Beadline sends is first a row here, written in the same
// transaction as the change that caused it, so a mail is never lost and never blocks the
// change. The texts are composed in app/_server/mail/. A sender (app/_server/mail/send-due-mails.ts)
// claims due rows in a short transaction of its own that commits before anything is sent
// (claimDueMails), so several app instances — on one server or on a Galera cluster — never
// send one mail twice.
// An alert for a person is first a notification (table notifications): the mail worker
// folds a person's waiting notifications into one outbox mail when the window of their
// chosen grouping closes (domain/mail/grouping, app/_server/mail/fold-notifications.ts).
import { randomUUID } from "node:crypto";
import type { Knex } from "knex";
import { afterFailedAttempt, MAX_MAIL_ATTEMPTS } from "@/domain/mail/backoff";
import type { MailGrouping } from "@/domain/mail/grouping";
import type { Role } from "@/domain/roles";
import type { UnitSystem } from "@/domain/units/format";
import { conn, db, isDuplicateKey, writeTransaction, type Db } from "../client";
import type { MailOutboxRow, NotificationRow } from "../tables";
import { parseRoles } from "./users";

import type { MailStatus } from "@/domain/mail/states";
export type { MailStatus } from "@/domain/mail/states";

export type OutboxMail = {
  id: number;
  to: string;
  subject: string;
  bodyText: string;
  kind: string;
  dedupeKey: string | null;
  status: MailStatus;
  attempts: number;
  nextAttemptAt: Date;
  lastError: string | null;
  createdAt: Date;
  sentAt: Date | null;
  userId: number | null;
};

type OutboxRow = MailOutboxRow;

function toMail(row: OutboxRow): OutboxMail {
  return {
    id: Number(row.id),
    to: row.to_address,
    subject: row.subject,
    bodyText: row.body_text,
    kind: row.kind,
    dedupeKey: row.dedupe_key,
    status: row.status,
    attempts: Number(row.attempts),
    nextAttemptAt: row.next_attempt_at,
    lastError: row.last_error,
    createdAt: row.created_at,
    sentAt: row.sent_at,
    userId: row.user_id === null || row.user_id === undefined ? null : Number(row.user_id),
  };
}

const clip = (text: string, max: number) => (text.length > max ? text.slice(0, max - 1) + "…" : text);

export type EnqueueMailInput = { to: string; subject: string; bodyText: string; kind: string; dedupeKey?: string | null; userId?: number | null };

/**
 * Puts one mail in the outbox, to be sent as soon as the sender runs. With a `dedupeKey`,
 * a second mail with the same key is not added (returns `{ id: null, duplicate: true }`).
 * Pass the caller's transaction so the mail exists exactly when the change does.
 */
export async function enqueueMail(input: EnqueueMailInput, trx?: Db): Promise<{ id: number | null; duplicate: boolean }> {
  try {
    const [id] = await conn(trx)("mail_outbox").insert({
      to_address: input.to,
      subject: clip(input.subject, 300),
      body_text: input.bodyText,
      kind: input.kind,
      dedupe_key: input.dedupeKey ?? null,
      user_id: input.userId ?? null,
    });
    return { id: Number(id), duplicate: false };
  } catch (error) {
    // A duplicate key rolls back only this statement, not the caller's transaction.
    if (input.dedupeKey && isDuplicateKey(error)) return { id: null, duplicate: true };
    throw error;
  }
}

/** A person an alert is for: whom to write to, in which units, and what their roles let them open. */
export type Recipient = { id: number; email: string; roles: Role[]; unitSystem: UnitSystem };

type RecipientRow = { id: number; email: string; roles: string; unit_system: UnitSystem };
const RECIPIENT_COLUMNS = ["id", "email", "roles", "unit_system"] as const;
const toRecipient = (r: RecipientRow): Recipient => ({ id: Number(r.id), email: r.email, roles: parseRoles(r.roles), unitSystem: r.unit_system });

/**
 * An alert for one person, kept until the mail worker folds it into a mail (their grouping
 * decides when). Deduplicated on `dedupeKey`: the same alert is kept once. Pass the
 * caller's transaction so the alert exists exactly when the change does.
 */
export async function insertNotification(
  input: { userId: number; subject: string; bodyText: string; kind: string; linkPath: string | null; dedupeKey: string },
  trx?: Db,
): Promise<{ queued: boolean }> {
  try {
    await conn(trx)("notifications").insert({
      user_id: input.userId,
      kind: input.kind,
      subject: clip(input.subject, 300),
      body_text: input.bodyText,
      link_path: input.linkPath,
      dedupe_key: input.dedupeKey,
    });
    return { queued: true };
  } catch (error) {
    if (isDuplicateKey(error)) return { queued: false };
    throw error;
  }
}

async function activeUsersWithRole(role: string, k: Db): Promise<Recipient[]> {
  const rows = (await k("users").where("is_active", true).whereRaw("FIND_IN_SET(?, roles) > 0", [role]).select(...RECIPIENT_COLUMNS).orderBy("id")) as RecipientRow[];
  return rows.map(toRecipient);
}

/** An active person as a recipient; null when missing or inactive. */
export async function findRecipient({ userId }: { userId: number }, trx?: Db): Promise<Recipient | null> {
  const row = (await conn(trx)("users").where({ id: userId, is_active: true }).first(...RECIPIENT_COLUMNS)) as RecipientRow | undefined;
  return row ? toRecipient(row) : null;
}

/** Active inspectors as recipients (alerts on out-of-limits joints). */
export async function listAlertInspectors(_: Record<string, never> = {}, trx?: Db): Promise<Recipient[]> {
  return activeUsersWithRole("inspector", conn(trx));
}

/** The fuser of a joint as a recipient, with what a cut-out notice names; null when the joint is missing or its fuser inactive. */
export async function findCutOutNoticeFacts(
  { jointId }: { jointId: number },
  trx?: Db,
): Promise<{ id: number; jointNo: number; station: string | null; jobCode: string; jobName: string; fuser: Recipient } | null> {
  const row = (await conn(trx)("joints as j")
    .join("jobs", "jobs.id", "j.job_id")
    .join("users as f", "f.id", "j.fuser_id")
    .where("j.id", jointId)
    .first("j.id", "j.joint_no", "j.station", "jobs.code as job_code", "jobs.name as job_name", "f.id as fuser_id", "f.email", "f.roles", "f.unit_system", "f.is_active")) as
    | { id: number; joint_no: number; station: string | null; job_code: string; job_name: string; fuser_id: number; email: string; roles: string; unit_system: UnitSystem; is_active: number }
    | undefined;
  if (!row || !row.is_active) return null;
  return { id: row.id, jointNo: row.joint_no, station: row.station, jobCode: row.job_code, jobName: row.job_name, fuser: toRecipient({ id: row.fuser_id, email: row.email, roles: row.roles, unit_system: row.unit_system }) };
}

/** Active admins as recipients (qualification and heater alerts). */
export async function listAlertAdmins(_: Record<string, never> = {}, trx?: Db): Promise<Recipient[]> {
  return activeUsersWithRole("admin", conn(trx));
}

// ---------------------------------------------------------------------------------------
// Sending side: claim, mark sent, mark failed.

/** A claimed mail stays "sending" this long; a sender that died mid-send frees it after. */
export const CLAIM_LEASE_S = 120;

/** The lease in force: MAIL_CLAIM_LEASE_S when set (at least 10 s; tests and the cluster's fault test shorten it), else CLAIM_LEASE_S. */
export function claimLeaseS(): number {
  const set = Number(process.env.MAIL_CLAIM_LEASE_S);
  return Number.isFinite(set) && set >= 10 ? set : CLAIM_LEASE_S;
}

/** A mail this sender holds: `claim` is its claim id, needed to mark the mail sent or failed. */
export type ClaimedMail = OutboxMail & { claim: string };

/**
 * Claims up to `limit` due mails for this sender, in one short transaction of its own that
 * COMMITS BEFORE ANYTHING IS SENT: rows queued (or left "sending" by a sender whose lease
 * ran out) with next_attempt_at ≤ now become "sending" with this claim's id, claimed_at, and
 * attempts + 1, leased until now + CLAIM_LEASE_S. Mails whose attempts already reached the
 * maximum are marked failed.
 *
 * Why two senders never take one mail: the candidates are read FOR UPDATE SKIP LOCKED, so on
 * one server a concurrent sender skips them; but on a Galera cluster those row locks hold on
 * the local node only. There the UPDATE repeats the "still due" condition and the rows it
 * changed are read back by claim id, and two claims of one row on two nodes are conflicting
 * writes to that row: the later COMMIT fails certification (a deadlock error) and
 * writeTransaction runs the claim again, which then finds the row leased. So a mail is held
 * by one claim at a time, cluster-wide.
 *
 * The at-least-once edge: a sender that stalls or dies after its SMTP server accepted a mail
 * but before markMailSent committed leaves the mail "sending"; once the lease has run out
 * another sender claims it again and sends it a second time. Mail is therefore delivered at
 * least once, never lost; a duplicate needs a send that outlived its 120 s lease (the SMTP
 * transport gives up after 5 s to connect and 15 s of silence, well inside it).
 */
export async function claimDueMails({ now, limit = 20, maxAttempts = MAX_MAIL_ATTEMPTS, leaseS = claimLeaseS() }: { now: Date; limit?: number; maxAttempts?: number; leaseS?: number }, knex?: Knex): Promise<ClaimedMail[]> {
  const claim = randomUUID();
  const due = (q: Knex.QueryBuilder) => q.whereIn("status", ["queued", "sending"]).where("next_attempt_at", "<=", now);
  return writeTransaction(knex ?? db(), async (trx) => {
    const rows = (await due(trx("mail_outbox"))
      .orderBy([{ column: "next_attempt_at" }, { column: "id" }])
      .limit(limit)
      .forUpdate()
      .skipLocked()
      .select("id", "attempts")) as { id: number; attempts: number }[];
    if (rows.length === 0) return [];
    const spent = rows.filter((r) => Number(r.attempts) >= maxAttempts).map((r) => r.id);
    const ids = rows.filter((r) => Number(r.attempts) < maxAttempts).map((r) => r.id);
    if (spent.length) {
      await due(trx("mail_outbox").whereIn("id", spent)).update({
        status: "failed",
        claimed_by: null,
        last_error: trx.raw("COALESCE(last_error, ?)", ["The sender stopped while sending; gave up after the last attempt"]),
      });
    }
    if (ids.length === 0) return [];
    await due(trx("mail_outbox").whereIn("id", ids)).update({
      status: "sending",
      claimed_by: claim,
      claimed_at: now,
      attempts: trx.raw("attempts + 1"),
      next_attempt_at: new Date(now.getTime() + leaseS * 1000),
    });
    const claimed = (await trx("mail_outbox").whereIn("id", ids).where({ claimed_by: claim }).orderBy("id").select("*")) as OutboxRow[];
    return claimed.map((r) => ({ ...toMail(r), claim }));
  });
}

/** Hands claimed mails this sender will not send back to the queue, due now, as if never claimed. */
export async function releaseClaim({ ids, claim, now }: { ids: number[]; claim: string; now: Date }, trx?: Db): Promise<number> {
  if (ids.length === 0) return 0;
  return conn(trx)("mail_outbox")
    .whereIn("id", ids)
    .where({ status: "sending", claimed_by: claim })
    .update({ status: "queued", claimed_by: null, claimed_at: null, next_attempt_at: now, attempts: conn(trx).raw("GREATEST(attempts, 1) - 1") });
}

/**
 * Marks a mail sent while this sender's claim still holds it; false when the lease ran out
 * and another sender claimed the mail since (it may send it again: the at-least-once edge
 * above), in which case that sender's result stands.
 */
export async function markMailSent({ id, claim, now }: { id: number; claim: string; now: Date }, trx?: Db): Promise<boolean> {
  const changed = await conn(trx)("mail_outbox").where({ id, status: "sending", claimed_by: claim }).update({ status: "sent", sent_at: now, last_error: null, claimed_by: null });
  return changed === 1;
}

/**
 * Records a failed attempt: back to "queued" with the next attempt after the back-off
 * delay, or "failed" (kept, shown on the mailbox page) once the attempts are spent — only
 * while this sender's claim still holds the mail (`held`: false when another sender took it
 * over after the lease ran out; nothing is changed then).
 */
export async function markMailFailed(
  { id, claim, attempts, error, now, maxAttempts }: { id: number; claim: string; attempts: number; error: string; now: Date; maxAttempts?: number },
  trx?: Db,
): Promise<{ status: "queued" | "failed"; nextAttemptAt: Date; held: boolean }> {
  const next = afterFailedAttempt(attempts, now, { maxAttempts });
  const changed = await conn(trx)("mail_outbox")
    .where({ id, status: "sending", claimed_by: claim })
    .update({ status: next.status, next_attempt_at: next.nextAttemptAt, last_error: clip(error, 500), claimed_by: null });
  return { ...next, held: changed === 1 };
}

/** Puts a failed mail back in the queue with a fresh set of attempts (admin, mailbox page). */
export async function requeueMail({ id, now }: { id: number; now: Date }, trx?: Db): Promise<boolean> {
  const changed = await conn(trx)("mail_outbox").where({ id, status: "failed" }).update({ status: "queued", attempts: 0, next_attempt_at: now });
  return changed === 1;
}

export type OutboxFilter = { status?: MailStatus; kind?: string; to?: string; limit?: number };

export async function listOutbox({ status, kind, to, limit = 200 }: OutboxFilter = {}, trx?: Db): Promise<OutboxMail[]> {
  const q = conn(trx)("mail_outbox").orderBy("id", "desc").limit(limit);
  if (status) q.where("status", status);
  if (kind) q.where("kind", kind);
  if (to) q.where("to_address", to);
  return ((await q) as OutboxRow[]).map(toMail);
}

export async function countOutboxByStatus(_: Record<string, never> = {}, trx?: Db): Promise<Record<MailStatus, number>> {
  const rows = (await conn(trx)("mail_outbox").select("status").count({ n: "*" }).groupBy("status")) as { status: MailStatus; n: number }[];
  const counts: Record<MailStatus, number> = { queued: 0, sending: 0, sent: 0, failed: 0 };
  for (const r of rows) counts[r.status] = Number(r.n);
  return counts;
}

// ---------------------------------------------------------------------------------------
// Notifications: waiting alerts, folding them into mail, a person's own mail.

export type Notification = { id: number; userId: number; kind: string; subject: string; bodyText: string; linkPath: string | null; createdAt: Date; outboxId: number | null };

const toNotification = (r: NotificationRow): Notification => ({
  id: Number(r.id),
  userId: Number(r.user_id),
  kind: r.kind,
  subject: r.subject,
  bodyText: r.body_text,
  linkPath: r.link_path,
  createdAt: r.created_at,
  outboxId: r.outbox_id === null ? null : Number(r.outbox_id),
});

/** People who have notifications not yet in a mail, with their address and grouping (active or not: an alert already made is still delivered). */
export async function listPeopleWithWaitingNotifications(_: Record<string, never> = {}, trx?: Db): Promise<{ userId: number; email: string; grouping: MailGrouping }[]> {
  const rows = (await conn(trx)("users")
    .whereIn("id", conn(trx)("notifications").whereNull("outbox_id").select("user_id"))
    .orderBy("id")
    .select("id", "email", "mail_grouping")) as { id: number; email: string; mail_grouping: MailGrouping }[];
  return rows.map((r) => ({ userId: Number(r.id), email: r.email, grouping: r.mail_grouping }));
}

/**
 * Claims a person's waiting notifications for folding: locked FOR UPDATE SKIP LOCKED in the
 * caller's transaction, so a second worker folding at the same time sees none of them and
 * nothing is put in two mails. Oldest first.
 */
export async function lockWaitingNotifications({ userId }: { userId: number }, trx: Knex.Transaction): Promise<Notification[]> {
  const rows = (await trx("notifications").whereNull("outbox_id").where({ user_id: userId }).orderBy("id").forUpdate().skipLocked().select("*")) as NotificationRow[];
  return rows.map(toNotification);
}

/** Ties notifications to the mail they went out in. */
export async function markNotificationsMailed({ ids, outboxId }: { ids: number[]; outboxId: number }, trx: Db): Promise<void> {
  await conn(trx)("notifications").whereIn("id", ids).whereNull("outbox_id").update({ outbox_id: outboxId });
}

/** A person's notifications not yet in a mail, oldest first. */
export async function listWaitingNotifications({ userId }: { userId: number }, trx?: Db): Promise<Notification[]> {
  const rows = (await conn(trx)("notifications").whereNull("outbox_id").where({ user_id: userId }).orderBy("id").limit(500).select("*")) as NotificationRow[];
  return rows.map(toNotification);
}

/** The mail made for one person, newest first (their Notifications screen). */
export async function listMailForUser({ userId, limit = 50 }: { userId: number; limit?: number }, trx?: Db): Promise<OutboxMail[]> {
  return ((await conn(trx)("mail_outbox").where({ user_id: userId }).orderBy("id", "desc").limit(limit)) as OutboxRow[]).map(toMail);
}

/** A person's choice of how alerts are grouped into mail. */
export async function updateMailGrouping({ userId, grouping }: { userId: number; grouping: MailGrouping }, trx?: Db): Promise<void> {
  await conn(trx)("users").where({ id: userId }).update({ mail_grouping: grouping });
}
