// Qualifications of people to make joints under a procedure (49 CFR 192.285): each
// qualification or requalification, and production joints found unacceptable by test.
// Both are append-only records; status is computed by the domain (qualificationStatus).
import type { QualificationMethod } from "@/domain/qualifications/schemas";
import { qualificationOverview, type PersonProcedureStatus } from "@/domain/qualifications/overview";
import { isoDateIn, UTC_ZONE } from "@/domain/dates/zone";
import { conn, type Db } from "../client";
import type { QualificationFailureRow, QualificationRow } from "../tables";
import { day, num } from "./rows";

export type QualificationRecord = {
  id: number;
  userId: number;
  userName: string;
  procedureId: number;
  procedureCode: string;
  qualifiedOn: string;
  method: QualificationMethod;
  specimenResult: string;
  evaluator: string;
  evidenceAttachmentId: number | null;
  recordedBy: number | null;
  recordedAt: Date;
};

export type QualificationFailureRecord = {
  id: number;
  userId: number;
  userName: string;
  procedureId: number;
  procedureCode: string;
  failedOn: string;
  jointId: number | null;
  notes: string | null;
  recordedBy: number | null;
  recordedAt: Date;
};

function qualificationQuery(trx?: Db) {
  return conn(trx)("qualifications")
    .join("users", "users.id", "qualifications.user_id")
    .join("procedures", "procedures.id", "qualifications.procedure_id")
    .select("qualifications.*", "users.name as user_name", "procedures.code as procedure_code");
}

function failureQuery(trx?: Db) {
  return conn(trx)("qualification_failures")
    .join("users", "users.id", "qualification_failures.user_id")
    .join("procedures", "procedures.id", "qualification_failures.procedure_id")
    .select("qualification_failures.*", "users.name as user_name", "procedures.code as procedure_code");
}

/** A qualifications or qualification_failures row with the person's name and the procedure's code. */
type Named = { user_name: string; procedure_code: string };

function toQualification(r: QualificationRow & Named): QualificationRecord {
  return {
    id: r.id,
    userId: r.user_id,
    userName: r.user_name,
    procedureId: r.procedure_id,
    procedureCode: r.procedure_code,
    qualifiedOn: day(r.qualified_on),
    method: r.method,
    specimenResult: r.specimen_result,
    evaluator: r.evaluator,
    evidenceAttachmentId: num(r.evidence_attachment_id),
    recordedBy: r.recorded_by ?? null,
    recordedAt: r.recorded_at,
  };
}

function toFailure(r: QualificationFailureRow & Named): QualificationFailureRecord {
  return {
    id: r.id,
    userId: r.user_id,
    userName: r.user_name,
    procedureId: r.procedure_id,
    procedureCode: r.procedure_code,
    failedOn: day(r.failed_on),
    jointId: num(r.joint_id),
    notes: r.notes ?? null,
    recordedBy: r.recorded_by ?? null,
    recordedAt: r.recorded_at,
  };
}

/** A person's qualifications (optionally for one procedure), newest first: the dates feed qualificationStatus. */
export async function listQualificationsForUser({ userId, procedureId }: { userId: number; procedureId?: number }, trx?: Db): Promise<QualificationRecord[]> {
  const q = qualificationQuery(trx).where("qualifications.user_id", userId).orderBy([{ column: "qualifications.qualified_on", order: "desc" }, { column: "qualifications.id", order: "desc" }]);
  if (procedureId) q.where("qualifications.procedure_id", procedureId);
  return ((await q) as (QualificationRow & Named)[]).map(toQualification);
}

/** A person's production-joint test failures (optionally for one procedure), newest first. */
export async function listQualificationFailuresForUser({ userId, procedureId }: { userId: number; procedureId?: number }, trx?: Db): Promise<QualificationFailureRecord[]> {
  const q = failureQuery(trx).where("qualification_failures.user_id", userId).orderBy([{ column: "qualification_failures.failed_on", order: "desc" }, { column: "qualification_failures.id", order: "desc" }]);
  if (procedureId) q.where("qualification_failures.procedure_id", procedureId);
  return ((await q) as (QualificationFailureRow & Named)[]).map(toFailure);
}

export async function listAllQualifications({ limit = 500 }: { limit?: number } = {}, trx?: Db): Promise<QualificationRecord[]> {
  return ((await qualificationQuery(trx).orderBy([{ column: "qualifications.qualified_on", order: "desc" }, { column: "qualifications.id", order: "desc" }]).limit(limit)) as (QualificationRow & Named)[]).map(toQualification);
}

export async function listAllQualificationFailures({ limit = 500 }: { limit?: number } = {}, trx?: Db): Promise<QualificationFailureRecord[]> {
  return ((await failureQuery(trx).orderBy([{ column: "qualification_failures.failed_on", order: "desc" }, { column: "qualification_failures.id", order: "desc" }]).limit(limit)) as (QualificationFailureRow & Named)[]).map(toFailure);
}

export type QualificationStatusRow = PersonProcedureStatus & { userName: string; userIsActive: boolean; procedureCode: string; procedureName: string };

/**
 * Status of every person × procedure with a record, on `now`'s local calendar day in
 * `timeZone` (the organisation's) or on the given ISO date — from the domain's 49 CFR
 * 192.285(c) rule. Optionally one person.
 */
export async function qualificationStatusOverview(
  { now = new Date(), timeZone = UTC_ZONE, on, userId }: { now?: Date; timeZone?: string; on?: string; userId?: number } = {},
  trx?: Db,
): Promise<QualificationStatusRow[]> {
  const k = conn(trx);
  const qq = k("qualifications").select("user_id", "procedure_id", "qualified_on");
  const fq = k("qualification_failures").select("user_id", "procedure_id", "failed_on");
  if (userId) {
    qq.where({ user_id: userId });
    fq.where({ user_id: userId });
  }
  const [qs, fs] = (await Promise.all([qq, fq])) as [Pick<QualificationRow, "user_id" | "procedure_id" | "qualified_on">[], Pick<QualificationFailureRow, "user_id" | "procedure_id" | "failed_on">[]];
  const rows = qualificationOverview({
    qualifications: qs.map((r) => ({ userId: r.user_id, procedureId: r.procedure_id, qualifiedOn: day(r.qualified_on) })),
    failures: fs.map((r) => ({ userId: r.user_id, procedureId: r.procedure_id, failedOn: day(r.failed_on) })),
    on: on ?? isoDateIn(now, timeZone),
  });
  if (!rows.length) return [];
  const users = new Map(
    (await k("users").whereIn("id", [...new Set(rows.map((r) => r.userId))]).select("id", "name", "is_active")).map((u: { id: number; name: string; is_active: number }) => [u.id, u]),
  );
  const procedures = new Map(
    (await k("procedures").whereIn("id", [...new Set(rows.map((r) => r.procedureId))]).select("id", "code", "name")).map((p: { id: number; code: string; name: string }) => [p.id, p]),
  );
  return rows
    .map((r) => ({
      ...r,
      userName: users.get(r.userId)?.name ?? `Person ${r.userId}`,
      userIsActive: Boolean(users.get(r.userId)?.is_active),
      procedureCode: procedures.get(r.procedureId)?.code ?? `Procedure ${r.procedureId}`,
      procedureName: procedures.get(r.procedureId)?.name ?? "",
    }))
    .sort((a, b) => a.userName.localeCompare(b.userName) || a.procedureCode.localeCompare(b.procedureCode));
}

export async function insertQualification(
  input: { userId: number; procedureId: number; qualifiedOn: string; method: QualificationMethod; specimenResult: string; evaluator: string; evidenceAttachmentId?: number | null; recordedBy: number },
  trx?: Db,
): Promise<number> {
  const [id] = await conn(trx)("qualifications").insert({
    user_id: input.userId,
    procedure_id: input.procedureId,
    qualified_on: input.qualifiedOn,
    method: input.method,
    specimen_result: input.specimenResult,
    evaluator: input.evaluator,
    evidence_attachment_id: input.evidenceAttachmentId ?? null,
    recorded_by: input.recordedBy,
  });
  return Number(id);
}

export async function insertQualificationFailure(
  input: { userId: number; procedureId: number; failedOn: string; jointId?: number | null; notes: string; recordedBy: number },
  trx?: Db,
): Promise<number> {
  const [id] = await conn(trx)("qualification_failures").insert({
    user_id: input.userId,
    procedure_id: input.procedureId,
    failed_on: input.failedOn,
    joint_id: input.jointId ?? null,
    notes: input.notes,
    recorded_by: input.recordedBy,
  });
  return Number(id);
}

/** Who made a joint (to check a failure record names the right person); null if no such joint. */
export async function findJointFuserId({ jointId }: { jointId: number }, trx?: Db): Promise<number | null> {
  const row = (await conn(trx)("joints").where({ id: jointId }).first("fuser_id")) as { fuser_id: number } | undefined;
  return row ? Number(row.fuser_id) : null;
}
