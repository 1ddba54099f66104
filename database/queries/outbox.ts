// The mail outbox: every e-mail Beadline sends is first a row here, written in the same
// transaction as the change that caused it, so a mail is never lost and never blocks the
// change. The texts are composed in app/_server/mail/. A sender (app/_server/mail/send-due-mails.ts) claims due rows with
// SELECT … FOR UPDATE SKIP LOCKED, so several app instances never send one mail twice.
// People with daily digest on get their events folded into one mail a day instead
// (mail_digest_items, see migration 20261202000700).
import type { Knex } from "knex";
import { afterFailedAttempt, MAX_MAIL_ATTEMPTS } from "@/domain/mail/backoff";
import { composeDigest, latestDigestCutoff, type DigestEvent } from "@/domain/mail/digest";
import { isoDateIn, UTC_ZONE } from "@/domain/dates/zone";
import { conn, db, isDuplicateKey, type Db } from "../client";
import type { MailOutboxRow } from "../tables";

export type MailStatus = "queued" | "sending" | "sent" | "failed";

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
  };
}

const clip = (text: string, max: number) => (text.length > max ? text.slice(0, max - 1) + "…" : text);

export type EnqueueMailInput = { to: string; subject: string; bodyText: string; kind: string; dedupeKey?: string | null };

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
    });
    return { id: Number(id), duplicate: false };
  } catch (error) {
    // A duplicate key rolls back only this statement, not the caller's transaction.
    if (input.dedupeKey && isDuplicateKey(error)) return { id: null, duplicate: true };
    throw error;
  }
}

export type Recipient = { id: number; email: string; dailyDigest: boolean };

/**
 * An event for one person: straight to the outbox, or — when the person chose the daily
 * digest — kept for that day's summary mail. Deduplicated on `dedupeKey` either way.
 */
export async function enqueueUserEvent(
  input: { recipient: Recipient; subject: string; bodyText: string; kind: string; dedupeKey: string },
  trx?: Db,
): Promise<{ queued: boolean; digest: boolean }> {
  const { recipient } = input;
  if (!recipient.dailyDigest) {
    const result = await enqueueMail({ to: recipient.email, subject: input.subject, bodyText: input.bodyText, kind: input.kind, dedupeKey: input.dedupeKey }, trx);
    return { queued: !result.duplicate, digest: false };
  }
  try {
    await conn(trx)("mail_digest_items").insert({
      user_id: recipient.id,
      to_address: recipient.email,
      kind: input.kind,
      subject: clip(input.subject, 300),
      body_text: input.bodyText,
      dedupe_key: input.dedupeKey,
    });
    return { queued: true, digest: true };
  } catch (error) {
    if (isDuplicateKey(error)) return { queued: false, digest: true };
    throw error;
  }
}

async function activeUsersWithRole(role: string, k: Db): Promise<Recipient[]> {
  const rows = (await k("users").where("is_active", true).whereRaw("FIND_IN_SET(?, roles) > 0", [role]).select("id", "email", "daily_digest").orderBy("id")) as {
    id: number;
    email: string;
    daily_digest: number | boolean;
  }[];
  return rows.map((r) => ({ id: r.id, email: r.email, dailyDigest: Boolean(r.daily_digest) }));
}

/** Active inspectors as recipients (alerts on out-of-limits joints). */
export async function listAlertInspectors(_: Record<string, never> = {}, trx?: Db): Promise<Recipient[]> {
  return activeUsersWithRole("inspector", conn(trx));
}

/** What an out-of-limits alert tells about a joint; findings are the recorded ones, then the latest pressure trace's. */
export type JointAlertFacts = {
  id: number;
  jointNo: number;
  /** The joint's outcome now: the projection's when it exists (a trace may have changed it), else the recorded one. */
  outcome: string;
  madeAt: Date;
  station: string | null;
  fuserId: number;
  fuserName: string;
  outsideDiameterMm: number;
  sdr: number;
  jobCode: string;
  jobName: string;
  machineTag: string | null;
  findingMessages: (string | null)[];
  traceFindingMessages: (string | null)[];
};

function parseFindings(text: string | null | undefined): (string | null)[] {
  try {
    return (JSON.parse(text ?? "") as { message?: string }[]).map((f) => f.message ?? null);
  } catch {
    return [];
  }
}

/** The facts an out-of-limits alert needs; null when the joint does not exist. Inside the recording transaction the projection row may not exist yet. */
export async function findJointAlertFacts({ jointId }: { jointId: number }, trx?: Db): Promise<JointAlertFacts | null> {
  const k = conn(trx);
  const joint = (await k("joints as j")
    .join("jobs", "jobs.id", "j.job_id")
    .join("users as f", "f.id", "j.fuser_id")
    .leftJoin("fusion_machines as m", "m.id", "j.machine_id")
    .leftJoin("joint_states as js", "js.joint_id", "j.id")
    .where("j.id", jointId)
    .first(
      "j.id",
      "j.joint_no",
      "j.outcome",
      "js.outcome as state_outcome",
      "j.findings",
      "j.made_at",
      "j.station",
      "j.fuser_id",
      "j.outside_diameter_mm",
      "j.sdr",
      "jobs.code as job_code",
      "jobs.name as job_name",
      "f.name as fuser_name",
      "m.asset_tag as machine_tag",
    )) as
    | {
        id: number;
        joint_no: number;
        outcome: string;
        state_outcome: string | null;
        findings: string;
        made_at: Date;
        station: string | null;
        fuser_id: number;
        outside_diameter_mm: number;
        sdr: number;
        job_code: string;
        job_name: string;
        fuser_name: string;
        machine_tag: string | null;
      }
    | undefined;
  if (!joint) return null;
  const trace = (await k("joint_traces").where({ joint_id: jointId }).orderBy("id", "desc").first("findings")) as { findings: string } | undefined;
  return {
    id: joint.id,
    jointNo: joint.joint_no,
    outcome: joint.state_outcome ?? joint.outcome,
    madeAt: joint.made_at,
    station: joint.station,
    fuserId: joint.fuser_id,
    fuserName: joint.fuser_name,
    outsideDiameterMm: joint.outside_diameter_mm,
    sdr: joint.sdr,
    jobCode: joint.job_code,
    jobName: joint.job_name,
    machineTag: joint.machine_tag,
    findingMessages: parseFindings(joint.findings),
    // a trace row without readable findings adds nothing
    traceFindingMessages: trace ? parseFindings(trace.findings) : [],
  };
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
    .first("j.id", "j.joint_no", "j.station", "jobs.code as job_code", "jobs.name as job_name", "f.id as fuser_id", "f.email", "f.daily_digest", "f.is_active")) as
    | { id: number; joint_no: number; station: string | null; job_code: string; job_name: string; fuser_id: number; email: string; daily_digest: number; is_active: number }
    | undefined;
  if (!row || !row.is_active) return null;
  return { id: row.id, jointNo: row.joint_no, station: row.station, jobCode: row.job_code, jobName: row.job_name, fuser: { id: row.fuser_id, email: row.email, dailyDigest: Boolean(row.daily_digest) } };
}

/** Active admins as recipients (qualification and heater alerts). */
export async function listAlertAdmins(_: Record<string, never> = {}, trx?: Db): Promise<Recipient[]> {
  return activeUsersWithRole("admin", conn(trx));
}

// ---------------------------------------------------------------------------------------
// Sending side: claim, mark sent, mark failed.

/** A claimed mail stays "sending" this long; a sender that died mid-send frees it after. */
export const CLAIM_LEASE_S = 120;

/**
 * Claims up to `limit` due mails for this sender: rows queued (or left "sending" by a
 * sender whose lease ran out) with next_attempt_at ≤ now, locked FOR UPDATE SKIP LOCKED so
 * a concurrent sender skips them, then marked "sending" with attempts + 1, in one short
 * transaction. Mails whose attempts already reached the maximum are marked failed.
 */
export async function claimDueMails({ now, limit = 20, maxAttempts = MAX_MAIL_ATTEMPTS }: { now: Date; limit?: number; maxAttempts?: number }, knex?: Knex): Promise<OutboxMail[]> {
  const k = knex ?? db();
  return k.transaction(async (trx) => {
    const rows = (await trx("mail_outbox")
      .whereIn("status", ["queued", "sending"])
      .where("next_attempt_at", "<=", now)
      .orderBy([{ column: "next_attempt_at" }, { column: "id" }])
      .limit(limit)
      .forUpdate()
      .skipLocked()
      .select("*")) as OutboxRow[];
    if (rows.length === 0) return [];
    const spent = rows.filter((r) => Number(r.attempts) >= maxAttempts).map((r) => r.id);
    const due = rows.filter((r) => Number(r.attempts) < maxAttempts);
    if (spent.length) {
      await trx("mail_outbox").whereIn("id", spent).update({ status: "failed", last_error: trx.raw("COALESCE(last_error, ?)", ["The sender stopped while sending; gave up after the last attempt"]) });
    }
    if (due.length === 0) return [];
    await trx("mail_outbox")
      .whereIn(
        "id",
        due.map((r) => r.id),
      )
      .update({ status: "sending", attempts: trx.raw("attempts + 1"), next_attempt_at: new Date(now.getTime() + CLAIM_LEASE_S * 1000) });
    return due.map((r) => toMail({ ...r, status: "sending", attempts: Number(r.attempts) + 1 }));
  });
}

export async function markMailSent({ id, now }: { id: number; now: Date }, trx?: Db): Promise<void> {
  await conn(trx)("mail_outbox").where({ id, status: "sending" }).update({ status: "sent", sent_at: now, last_error: null });
}

/**
 * Records a failed attempt: back to "queued" with the next attempt after the back-off
 * delay, or "failed" (kept, shown on the mailbox page) once the attempts are spent.
 */
export async function markMailFailed(
  { id, attempts, error, now, maxAttempts }: { id: number; attempts: number; error: string; now: Date; maxAttempts?: number },
  trx?: Db,
): Promise<{ status: "queued" | "failed"; nextAttemptAt: Date }> {
  const next = afterFailedAttempt(attempts, now, { maxAttempts });
  await conn(trx)("mail_outbox").where({ id }).update({ status: next.status, next_attempt_at: next.nextAttemptAt, last_error: clip(error, 500) });
  return next;
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
// Daily digest.

/**
 * Folds each digest person's waiting events created before the latest cut-off into one
 * outbox mail (dedupe key `digest:<userId>:<cut-off date>`), and links the events to it,
 * in one transaction per person. Returns the number of digest mails queued.
 */
export async function foldDailyDigests({ now, hour, timeZone = UTC_ZONE }: { now: Date; hour?: number; timeZone?: string }, knex?: Knex): Promise<number> {
  const k = knex ?? db();
  const cutoff = latestDigestCutoff(now, hour, timeZone);
  const day = isoDateIn(cutoff, timeZone);
  const people = (await k("mail_digest_items").whereNull("outbox_id").where("created_at", "<", cutoff).distinct("user_id", "to_address")) as { user_id: number; to_address: string }[];
  let made = 0;
  for (const person of people) {
    await k.transaction(async (trx) => {
      const rows = (await trx("mail_digest_items")
        .whereNull("outbox_id")
        .where({ user_id: person.user_id })
        .where("created_at", "<", cutoff)
        .orderBy("id")
        .forUpdate()
        .skipLocked()
        .select("id", "kind", "subject", "body_text", "created_at", "to_address")) as { id: number; kind: string; subject: string; body_text: string; created_at: Date; to_address: string }[];
      if (rows.length === 0) return;
      const events: DigestEvent[] = rows.map((r) => ({ kind: r.kind, subject: r.subject, bodyText: r.body_text, createdAt: r.created_at }));
      const { subject, bodyText } = composeDigest(events, day);
      let result = await enqueueMail({ to: rows[rows.length - 1]!.to_address, subject, bodyText, kind: "daily-digest", dedupeKey: `digest:${person.user_id}:${day}` }, trx);
      if (result.duplicate) {
        // Today's digest already went out (events arrived late in the same day): a second part.
        result = await enqueueMail({ to: rows[rows.length - 1]!.to_address, subject, bodyText, kind: "daily-digest", dedupeKey: `digest:${person.user_id}:${day}:${rows[0]!.id}` }, trx);
      }
      if (result.id === null) return;
      await trx("mail_digest_items")
        .whereIn(
          "id",
          rows.map((r) => r.id),
        )
        .update({ outbox_id: result.id });
      made += 1;
    });
  }
  return made;
}

export async function countWaitingDigestItems({ userId }: { userId?: number } = {}, trx?: Db): Promise<number> {
  const q = conn(trx)("mail_digest_items").whereNull("outbox_id");
  if (userId) q.where("user_id", userId);
  const row = await q.count({ n: "*" }).first();
  return Number(row?.n ?? 0);
}

/** A person's choice between one mail per alert and one summary a day. */
export async function updateDailyDigest({ userId, dailyDigest }: { userId: number; dailyDigest: boolean }, trx?: Db): Promise<void> {
  await conn(trx)("users").where({ id: userId }).update({ daily_digest: dailyDigest });
}
