// Joints recorded at the trench, their revisions and current state, gap-free joint numbers
// per job, and the inspector/admin overrides of blocking warnings. Joints and revisions
// are append-only (the app user may only SELECT and INSERT them); joint_states is the
// updatable projection of the latest revision. Values in canonical SI (°C, MPa, mm, s, m).
import type { Knex } from "knex";
import type { FusionPlan } from "@/domain/fusion/plan";
import type { JointFinding } from "@/domain/fusion/check";
import type { JointOutcome } from "@/domain/joints/outcomes";
import type { ReviewState } from "@/domain/joints/review-states";
import type { RevisionKind } from "@/domain/joints/revision-kinds";
import type { JointKind, Shelter, TimedPhase } from "@/domain/joints/schemas";
import { QUANTITY_VALUES, type RecordedValues } from "@/domain/joints/values";
import type { OverrideGrant } from "@/domain/joints/rules";
import { conn, type Db } from "../client";
import { coilQuery, toCoil, type Coil } from "./coils";
import { num, parseJson, recordedValueRow, setList, text, toRecordedValues, type DbRow } from "./rows";
import type { JointOverrideRow, JointRevisionRow, JointRow } from "../tables";

export type { ReviewState } from "@/domain/joints/review-states";
export type { RevisionKind } from "@/domain/joints/revision-kinds";

/** A joint as stored, with its recorded values (domain/joints/values) spread in. */
export type JointRecord = RecordedValues & {
  id: number;
  clientId: string;
  jobId: number;
  jobCode: string;
  jobName: string;
  jointNo: number;
  kind: JointKind;
  coilA: { id: number; code: string; lot: string; manufacturer: string } | null;
  coilB: { id: number; code: string; lot: string; manufacturer: string } | null;
  componentBText: string | null;
  lengthAM: number | null;
  lengthBM: number | null;
  outsideDiameterMm: number;
  sdr: number;
  procedureVersionId: number;
  procedureCode: string;
  procedureName: string;
  procedureVersionNo: number;
  machine: { id: number; assetTag: string };
  heater: { id: number; assetTag: string };
  fuser: { id: number; name: string };
  madeAt: Date;
  station: string | null;
  latitude: number | null;
  longitude: number | null;
  ambientC: number | null;
  shelter: Shelter | null;
  timedFields: TimedPhase[];
  plan: FusionPlan;
  outcome: JointOutcome;
  findings: JointFinding[];
  replacesJointId: number | null;
  replacesJointNo: number | null;
  replacedByJointId: number | null;
  replacedByJointNo: number | null;
  reviewState: ReviewState;
  revisionNo: number;
  recordedAt: Date;
  /** SHA-256 (hex) of the submission that recorded it (domain/joints/submission); null before fingerprints were kept. */
  submissionSha256: string | null;
};

type Row = DbRow;

/** The coil columns jointQuery reads for side `ca` or `cb` (null when the side has no coil). */
type CoilSide<P extends string> = { [K in `${P}_id`]: number | null } & { [K in `${P}_code` | `${P}_lot` | `${P}_manufacturer`]: string | null };

/** A row of jointQuery: the joint with its job, procedure, equipment, fuser, coils and state. */
type JointQueryRow = JointRow &
  CoilSide<"ca"> &
  CoilSide<"cb"> & {
    job_code: string;
    job_name: string;
    procedure_code: string;
    procedure_name: string;
    procedure_version_no: number;
    machine_tag: string;
    heater_tag: string;
    fuser_name: string;
    review_state: ReviewState | null;
    revision_no: number | null;
    replaced_by_joint_id: number | null;
    replaces_joint_no: number | null;
    replaced_by_joint_no: number | null;
  };

function toJoint(r: JointQueryRow): JointRecord {
  // The coil columns are NOT NULL: with a coil id (the LEFT JOIN found the coil) they are set.
  const coil = (prefix: "ca" | "cb") => {
    const id = r[`${prefix}_id`];
    return id == null ? null : { id: Number(id), code: r[`${prefix}_code`] ?? "", lot: r[`${prefix}_lot`] ?? "", manufacturer: r[`${prefix}_manufacturer`] ?? "" };
  };
  return {
    id: Number(r.id),
    clientId: r.client_id,
    jobId: Number(r.job_id),
    jobCode: r.job_code,
    jobName: r.job_name,
    jointNo: Number(r.joint_no),
    kind: r.kind as JointKind,
    coilA: coil("ca"),
    coilB: coil("cb"),
    componentBText: text(r.component_b_text),
    lengthAM: num(r.length_a_m),
    lengthBM: num(r.length_b_m),
    outsideDiameterMm: Number(r.outside_diameter_mm),
    sdr: Number(r.sdr),
    procedureVersionId: Number(r.procedure_version_id),
    procedureCode: r.procedure_code,
    procedureName: r.procedure_name,
    procedureVersionNo: Number(r.procedure_version_no),
    machine: { id: Number(r.machine_id), assetTag: r.machine_tag },
    heater: { id: Number(r.heater_id), assetTag: r.heater_tag },
    fuser: { id: Number(r.fuser_id), name: r.fuser_name },
    madeAt: r.made_at,
    station: text(r.station),
    latitude: num(r.latitude),
    longitude: num(r.longitude),
    ambientC: num(r.ambient_c),
    shelter: r.shelter ?? null,
    ...toRecordedValues(r),
    timedFields: setList<TimedPhase>(r.timed_fields),
    plan: parseJson<FusionPlan>(r.plan, null as unknown as FusionPlan),
    outcome: r.outcome,
    findings: parseJson<JointFinding[]>(r.findings, []),
    replacesJointId: num(r.replaces_joint_id),
    replacesJointNo: num(r.replaces_joint_no),
    replacedByJointId: num(r.replaced_by_joint_id),
    replacedByJointNo: num(r.replaced_by_joint_no),
    reviewState: r.review_state ?? "pending-review",
    revisionNo: Number(r.revision_no ?? 1),
    recordedAt: r.recorded_at,
    submissionSha256: r.submission_sha256 ?? null,
  };
}

/** Joins a query on `joints as j` to its job, fuser (`f`), machine (`m`) and heater plate (`h`). */
export function joinJointParts(q: Knex.QueryBuilder): Knex.QueryBuilder {
  return q.join("jobs", "jobs.id", "j.job_id").join("users as f", "f.id", "j.fuser_id").join("fusion_machines as m", "m.id", "j.machine_id").join("heater_plates as h", "h.id", "j.heater_id");
}

function jointQuery(trx?: Db) {
  return joinJointParts(conn(trx)("joints as j"))
    .join("procedure_versions as pv", "pv.id", "j.procedure_version_id")
    .join("procedures as p", "p.id", "pv.procedure_id")
    .leftJoin("coils as ca", "ca.id", "j.coil_a_id")
    .leftJoin("coils as cb", "cb.id", "j.coil_b_id")
    .leftJoin("joint_states as s", "s.joint_id", "j.id")
    .leftJoin("joints as rj", "rj.id", "j.replaces_joint_id")
    .leftJoin("joints as nj", "nj.id", "s.replaced_by_joint_id")
    .select(
      "j.*",
      "jobs.code as job_code",
      "jobs.name as job_name",
      "p.code as procedure_code",
      "p.name as procedure_name",
      "pv.version_no as procedure_version_no",
      "m.asset_tag as machine_tag",
      "h.asset_tag as heater_tag",
      "f.name as fuser_name",
      "ca.id as ca_id",
      "ca.coil_code as ca_code",
      "ca.lot as ca_lot",
      "ca.manufacturer as ca_manufacturer",
      "cb.id as cb_id",
      "cb.coil_code as cb_code",
      "cb.lot as cb_lot",
      "cb.manufacturer as cb_manufacturer",
      "s.review_state",
      "s.revision_no",
      "s.replaced_by_joint_id",
      "rj.joint_no as replaces_joint_no",
      "nj.joint_no as replaced_by_joint_no",
    );
}

export async function findJointById({ id }: { id: number }, trx?: Db): Promise<JointRecord | null> {
  const row = (await jointQuery(trx).where("j.id", id).first()) as JointQueryRow | undefined;
  return row ? toJoint(row) : null;
}

/** The joint a device submission created (idempotency key), with the fuser who made it. */
export async function findJointByClientId({ clientId }: { clientId: string }, trx?: Db): Promise<JointRecord | null> {
  const row = (await jointQuery(trx).where("j.client_id", clientId).first()) as JointQueryRow | undefined;
  return row ? toJoint(row) : null;
}

export type JointListFilter = { jobId?: number; fuserId?: number; clientId?: string; beforeId?: number; limit?: number };

/** Newest first (made at, then id). Keyset on id for the next page (`beforeId`). */
export async function listJoints({ jobId, fuserId, clientId, beforeId, limit = 50 }: JointListFilter = {}, trx?: Db): Promise<JointRecord[]> {
  const q = jointQuery(trx).orderBy([{ column: "j.made_at", order: "desc" }, { column: "j.id", order: "desc" }]).limit(limit);
  if (jobId) q.where("j.job_id", jobId);
  if (fuserId) q.where("j.fuser_id", fuserId);
  if (clientId) q.where("j.client_id", clientId);
  if (beforeId) {
    const anchor = (await conn(trx)("joints").where({ id: beforeId }).first("made_at")) as { made_at: Date } | undefined;
    if (anchor) q.where((w) => w.where("j.made_at", "<", anchor.made_at).orWhere((o) => o.where("j.made_at", anchor.made_at).andWhere("j.id", "<", beforeId)));
  }
  return ((await q) as JointQueryRow[]).map(toJoint);
}

/**
 * Joints between two of these coils (both sides among `coilIds`), newest first: the Trench
 * screen asks before the same two coils are joined again.
 */
export async function listJointsBetweenCoils(
  { coilIds, limit = 500 }: { coilIds: number[]; limit?: number },
  trx?: Db,
): Promise<{ id: number; jobId: number; jointNo: number; madeAt: Date; coilACode: string; coilBCode: string; outcome: JointOutcome; reviewState: ReviewState; replacedByJointId: number | null }[]> {
  if (coilIds.length === 0) return [];
  const rows = (await conn(trx)("joints as j")
    .join("coils as ca", "ca.id", "j.coil_a_id")
    .join("coils as cb", "cb.id", "j.coil_b_id")
    .leftJoin("joint_states as s", "s.joint_id", "j.id")
    .whereIn("j.coil_a_id", coilIds)
    .whereIn("j.coil_b_id", coilIds)
    .orderBy([{ column: "j.made_at", order: "desc" }, { column: "j.id", order: "desc" }])
    .limit(limit)
    .select("j.id", "j.job_id", "j.joint_no", "j.made_at", "j.outcome", "ca.coil_code as ca_code", "cb.coil_code as cb_code", "s.review_state", "s.replaced_by_joint_id")) as (Pick<JointRow, "id" | "job_id" | "joint_no" | "made_at" | "outcome"> & { ca_code: string; cb_code: string; review_state: ReviewState | null; replaced_by_joint_id: number | null })[];
  return rows.map((r) => ({
    id: Number(r.id),
    jobId: Number(r.job_id),
    jointNo: Number(r.joint_no),
    madeAt: r.made_at,
    coilACode: r.ca_code,
    coilBCode: r.cb_code,
    outcome: r.outcome,
    reviewState: r.review_state ?? "pending-review",
    replacedByJointId: num(r.replaced_by_joint_id),
  }));
}

/** Out-of-limits joints on these jobs that no remake has replaced yet (newest first). */
export async function listJointsAwaitingRemake({ jobIds, limit = 50 }: { jobIds: number[]; limit?: number }, trx?: Db): Promise<{ id: number; jobId: number; jointNo: number; madeAt: Date; reviewState: ReviewState; coilACode: string | null; findings: JointFinding[] }[]> {
  if (jobIds.length === 0) return [];
  const rows = (await conn(trx)("joints as j")
    .join("joint_states as s", "s.joint_id", "j.id")
    .leftJoin("coils as ca", "ca.id", "j.coil_a_id")
    .whereIn("j.job_id", jobIds)
    .whereNull("s.replaced_by_joint_id")
    .where((w) => w.where("j.outcome", "out-of-limits").orWhere("s.review_state", "cut-out"))
    .whereNot("s.review_state", "accepted")
    .orderBy([{ column: "j.made_at", order: "desc" }, { column: "j.id", order: "desc" }])
    .limit(limit)
    .select("j.id", "j.job_id", "j.joint_no", "j.made_at", "j.findings", "s.review_state", "ca.coil_code")) as (Pick<JointRow, "id" | "job_id" | "joint_no" | "made_at" | "findings"> & { review_state: ReviewState; coil_code: string | null })[];
  return rows.map((r) => ({
    id: Number(r.id),
    jobId: Number(r.job_id),
    jointNo: Number(r.joint_no),
    madeAt: r.made_at,
    reviewState: r.review_state,
    coilACode: r.coil_code ?? null,
    findings: parseJson<JointFinding[]>(r.findings, []),
  }));
}

/**
 * Joints on any of these coils (either side) made from `since` up to `until`, newest first:
 * the handling wait's look-back when pipe is pulled from a coil. Two index lookups (one per
 * side), not a scan.
 */
export async function listRecentJointsOnCoils(
  { coilIds, since, until }: { coilIds: number[]; since: Date; until: Date },
  trx?: Db,
): Promise<{ coilId: number; jobCode: string; jointNo: number; madeAt: Date }[]> {
  if (!coilIds.length) return [];
  const side = (column: "coil_a_id" | "coil_b_id") =>
    conn(trx)("joints as j")
      .join("jobs", "jobs.id", "j.job_id")
      .whereIn(`j.${column}`, coilIds)
      .where("j.made_at", ">=", since)
      .where("j.made_at", "<=", until)
      .select(`j.${column} as coil_id`, "jobs.code as job_code", "j.joint_no", "j.made_at");
  const rows = [...(await side("coil_a_id")), ...(await side("coil_b_id"))] as { coil_id: number; job_code: string; joint_no: number; made_at: Date }[];
  return rows
    .map((r) => ({ coilId: Number(r.coil_id), jobCode: r.job_code, jointNo: Number(r.joint_no), madeAt: new Date(r.made_at) }))
    .sort((a, b) => b.madeAt.getTime() - a.madeAt.getTime());
}

/**
 * The next joint number of a job, gap-free under concurrent submissions: one statement bumps
 * the job's counter row and hands the new value back through LAST_INSERT_ID(expr) (the OK
 * packet's insert id), so the row is locked from here to the end of the caller's transaction
 * and no SELECT … FOR UPDATE round trip comes first. Call it as late as the transaction allows:
 * every submission on the job waits for this row. A rollback undoes the bump, so a refused
 * joint leaves no gap. Creates the counter row for a job that has none.
 */
export async function takeNextJointNo({ jobId }: { jobId: number }, trx: Knex.Transaction): Promise<number> {
  const bump = async () => {
    const [result] = (await trx.raw("UPDATE job_counters SET last_joint_no = LAST_INSERT_ID(last_joint_no + 1) WHERE job_id = ?", [jobId])) as unknown as [{ affectedRows: number; insertId: number }];
    return result;
  };
  let result = await bump();
  if (result.affectedRows !== 1) {
    await trx.raw("INSERT IGNORE INTO job_counters (job_id, last_joint_no) VALUES (?, 0)", [jobId]);
    result = await bump();
  }
  if (result.affectedRows === 1 && Number(result.insertId) > 0) return Number(result.insertId);
  // The row is ours until commit: read it when a driver does not pass the insert id on.
  const row = (await trx("job_counters").where({ job_id: jobId }).first("last_joint_no")) as { last_joint_no: number } | undefined;
  if (!row) throw new Error(`job ${jobId} has no joint counter`);
  return Number(row.last_joint_no);
}

/**
 * `value` as a DECIMAL column of `scale` keeps it: mysql2 sends a number as JavaScript prints
 * it, and MariaDB rounds such an exact literal to the column's scale half away from zero.
 * undefined when JavaScript prints it in exponent form (then it is not an exact literal).
 */
export function asStoredDecimal(value: number, scale: number): number | undefined {
  const text = String(value);
  if (!/^-?\d+(\.\d+)?$/.test(text)) return undefined;
  const negative = text.startsWith("-");
  const [whole, fraction = ""] = (negative ? text.slice(1) : text).split(".");
  if (fraction.length <= scale) return value;
  let digits = BigInt(whole + fraction.slice(0, scale));
  if (fraction.charCodeAt(scale) >= 53) digits += BigInt(1); // the next digit is 5 or more
  const padded = digits.toString().padStart(scale + 1, "0");
  const rounded = Number(`${padded.slice(0, padded.length - scale)}.${padded.slice(padded.length - scale)}`);
  return rounded === 0 ? 0 : negative ? -rounded : rounded;
}

let decimalScales: Promise<Map<string, number>> | undefined;

/** The scale of each DECIMAL column of `joints`, read once per process (the schema changes only by migration, before the server starts). */
function jointDecimalScales(): Promise<Map<string, number>> {
  decimalScales ??= (async () => {
    const [rows] = (await conn().raw("SELECT column_name AS c, numeric_scale AS s FROM information_schema.columns WHERE table_schema = DATABASE() AND table_name = 'joints' AND data_type = 'decimal'")) as unknown as [{ c: string; s: number }[]];
    return new Map(rows.map((r) => [r.c, Number(r.s)]));
  })().catch((error: unknown) => {
    decimalScales = undefined;
    throw error;
  });
  return decimalScales;
}

/**
 * The recorded values and ambient temperature as the joints row keeps them (rounded to each
 * column's scale), so the answer to a submission can be built from what was written instead
 * of read back; null when one of them cannot be predicted (exponent form, unknown column).
 */
export async function recordedValuesAsStored(values: RecordedValues & { ambientC: number | null }): Promise<(RecordedValues & { ambientC: number | null }) | null> {
  const scales = await jointDecimalScales();
  const out: Record<string, unknown> = { ...values };
  for (const [key, column] of [...QUANTITY_VALUES.map((d) => [d.key, d.column] as const), ["ambientC", "ambient_c"] as const]) {
    const value = out[key];
    if (value === null || value === undefined) continue;
    const scale = scales.get(column);
    const stored = scale === undefined || typeof value !== "number" ? undefined : asStoredDecimal(value, scale);
    if (stored === undefined) return null;
    out[key] = stored;
  }
  return out as RecordedValues & { ambientC: number | null };
}

/** A joint to insert: the fields it shares with JointRecord, with ids for its coils and equipment. */
export type NewJoint = RecordedValues &
  Pick<
    JointRecord,
    | "clientId" | "jobId" | "jointNo" | "kind" | "componentBText" | "lengthAM" | "lengthBM" | "outsideDiameterMm" | "sdr" | "procedureVersionId"
    | "madeAt" | "station" | "latitude" | "longitude" | "ambientC" | "shelter" | "timedFields" | "plan" | "outcome" | "findings" | "replacesJointId"
  > & {
    coilAId: number | null;
    coilBId: number | null;
    machineId: number;
    heaterId: number;
    fuserId: number;
    recordedAt?: Date;
    /** SHA-256 (hex) of the submission's canonical text (domain/joints/submission). */
    submissionSha256?: string | null;
  };

/** Inserts the joint row; a second insert with the same client id fails with a duplicate key. */
export async function insertJoint(j: NewJoint, trx: Db): Promise<number> {
  const [id] = await conn(trx)("joints").insert({
    client_id: j.clientId,
    job_id: j.jobId,
    joint_no: j.jointNo,
    kind: j.kind,
    coil_a_id: j.coilAId,
    coil_b_id: j.coilBId,
    component_b_text: j.componentBText,
    length_a_m: j.lengthAM,
    length_b_m: j.lengthBM,
    outside_diameter_mm: j.outsideDiameterMm,
    sdr: j.sdr,
    procedure_version_id: j.procedureVersionId,
    machine_id: j.machineId,
    heater_id: j.heaterId,
    fuser_id: j.fuserId,
    made_at: j.madeAt,
    station: j.station,
    latitude: j.latitude,
    longitude: j.longitude,
    ambient_c: j.ambientC,
    shelter: j.shelter,
    ...recordedValueRow(j),
    timed_fields: j.timedFields.length ? j.timedFields.join(",") : null,
    plan: JSON.stringify(j.plan),
    outcome: j.outcome,
    findings: JSON.stringify(j.findings),
    finding_parameters: j.findings.length ? [...new Set(j.findings.map((f) => f.parameter))].join(",") : null,
    replaces_joint_id: j.replacesJointId,
    ...(j.recordedAt ? { recorded_at: j.recordedAt } : {}),
    ...(j.submissionSha256 ? { submission_sha256: j.submissionSha256 } : {}),
  });
  return Number(id);
}

export async function insertJointRevision(
  r: { jointId: number; revisionNo: number; kind: RevisionKind; byUserId: number; reason?: string | null; changes?: Record<string, unknown> | null; reviewState: ReviewState; at?: Date },
  trx: Db,
): Promise<number> {
  const [id] = await conn(trx)("joint_revisions").insert({
    joint_id: r.jointId,
    revision_no: r.revisionNo,
    kind: r.kind,
    by_user_id: r.byUserId,
    reason: r.reason ?? null,
    changes: r.changes ? JSON.stringify(r.changes) : null,
    review_state: r.reviewState,
    ...(r.at ? { at: r.at } : {}),
  });
  return Number(id);
}

export async function insertJointState(s: { jointId: number; reviewState: ReviewState; revisionNo: number; outcome: JointOutcome; madeAt: Date }, trx: Db): Promise<void> {
  await conn(trx)("joint_states").insert({ joint_id: s.jointId, review_state: s.reviewState, revision_no: s.revisionNo, outcome: s.outcome, made_at: s.madeAt, replaced_by_joint_id: null });
}

/**
 * Links a cut-out or out-of-limits joint to the remake that replaces it. Only one remake
 * per joint: false when another remake got there first.
 */
export async function markJointReplaced({ jointId, replacedByJointId }: { jointId: number; replacedByJointId: number }, trx: Db): Promise<boolean> {
  const changed = await conn(trx)("joint_states").where({ joint_id: jointId }).whereNull("replaced_by_joint_id").update({ replaced_by_joint_id: replacedByJointId, updated_at: conn(trx).fn.now(3) });
  return changed === 1;
}

/** The joint a remake names, locked for the rest of the transaction, with its state. */
export async function lockJointForRemake({ id }: { id: number }, trx: Knex.Transaction): Promise<{ id: number; jobId: number; jointNo: number; outcome: JointOutcome; reviewState: ReviewState; replacedByJointId: number | null } | null> {
  const row = (await trx("joint_states as s").join("joints as j", "j.id", "s.joint_id").where("s.joint_id", id).forUpdate().first("j.id", "j.job_id", "j.joint_no", "j.outcome", "s.review_state", "s.replaced_by_joint_id")) as Row | undefined;
  if (!row) return null;
  return {
    id: Number(row.id),
    jobId: Number(row.job_id),
    jointNo: Number(row.joint_no),
    outcome: row.outcome as JointOutcome,
    reviewState: row.review_state as ReviewState,
    replacedByJointId: num(row.replaced_by_joint_id),
  };
}

export type JointRevision = {
  id: number;
  revisionNo: number;
  kind: RevisionKind;
  byUserId: number;
  byUserName: string;
  at: Date;
  reason: string | null;
  changes: Record<string, unknown> | null;
  reviewState: ReviewState;
};

export async function listJointRevisions({ jointId }: { jointId: number }, trx?: Db): Promise<JointRevision[]> {
  const rows = (await conn(trx)("joint_revisions as r").join("users as u", "u.id", "r.by_user_id").where("r.joint_id", jointId).orderBy("r.revision_no").select("r.*", "u.name as by_user_name")) as (JointRevisionRow & { by_user_name: string })[];
  return rows.map((r) => ({
    id: Number(r.id),
    revisionNo: Number(r.revision_no),
    kind: r.kind,
    byUserId: Number(r.by_user_id),
    byUserName: r.by_user_name,
    at: r.at,
    reason: r.reason ?? null,
    changes: parseJson<JointRevision["changes"]>(r.changes, null),
    reviewState: r.review_state,
  }));
}

export async function countJoints({ jobId }: { jobId?: number } = {}, trx?: Db): Promise<number> {
  const q = conn(trx)("joints").count({ n: "*" });
  if (jobId) q.where({ job_id: jobId });
  const row = (await q.first()) as { n: number | string } | undefined;
  return Number(row?.n ?? 0);
}

// ---------------------------------------------------------------------------------------
// Overrides of blocking warnings

export type OverrideRecord = OverrideGrant & { reason: string; grantedById: number; grantedByName: string; jobCode: string; subjectLabel: string };

/** A row of overrideQuery: the override with its job code, grantor and subject's tag or coil id. */
type OverrideRow = JointOverrideRow & { job_code: string; granted_by_name: string; heater_tag: string | null; coil_code: string | null };

function toOverride(r: OverrideRow): OverrideRecord {
  return {
    id: Number(r.id),
    jobId: Number(r.job_id),
    jobCode: r.job_code,
    subjectType: r.subject_type,
    subjectId: Number(r.subject_id),
    subjectLabel: (r.subject_type === "heater" ? r.heater_tag : r.coil_code) ?? `#${String(r.subject_id)}`,
    reason: r.reason,
    grantedById: Number(r.granted_by),
    grantedByName: r.granted_by_name,
    grantedAt: r.granted_at,
    expiresAt: r.expires_at,
  };
}

function overrideQuery(trx?: Db) {
  return conn(trx)("joint_overrides as o")
    .join("jobs", "jobs.id", "o.job_id")
    .join("users as u", "u.id", "o.granted_by")
    .leftJoin("heater_plates as h", (j) => j.on("h.id", "o.subject_id").andOnVal("o.subject_type", "heater"))
    .leftJoin("coils as c", (j) => j.on("c.id", "o.subject_id").andOnVal("o.subject_type", "coil"))
    .select("o.*", "jobs.code as job_code", "u.name as granted_by_name", "h.asset_tag as heater_tag", "c.coil_code as coil_code");
}

export async function insertJointOverride(
  o: { jobId: number; subjectType: "heater" | "coil"; subjectId: number; reason: string; grantedBy: number; grantedAt: Date; expiresAt: Date },
  trx: Db,
): Promise<number> {
  const [id] = await conn(trx)("joint_overrides").insert({
    job_id: o.jobId,
    subject_type: o.subjectType,
    subject_id: o.subjectId,
    reason: o.reason,
    granted_by: o.grantedBy,
    granted_at: o.grantedAt,
    expires_at: o.expiresAt,
  });
  return Number(id);
}

/** Overrides on these jobs that have not expired by `at` (newest first). */
export async function listOverridesForJobs({ jobIds, at }: { jobIds: number[]; at: Date }, trx?: Db): Promise<OverrideRecord[]> {
  if (jobIds.length === 0) return [];
  const rows = (await overrideQuery(trx).whereIn("o.job_id", jobIds).where("o.expires_at", ">=", at).orderBy("o.id", "desc")) as OverrideRow[];
  return rows.map(toOverride);
}

/** Overrides that could cover a joint made at `madeAt` (the domain decides which applies). */
export async function listOverridesForSubjects(
  { jobId, subjects, madeAt }: { jobId: number; subjects: { type: "heater" | "coil"; id: number }[]; madeAt: Date },
  trx?: Db,
): Promise<OverrideRecord[]> {
  if (subjects.length === 0) return [];
  const q = overrideQuery(trx).where("o.job_id", jobId).where("o.expires_at", ">=", madeAt);
  q.where((w) => {
    for (const s of subjects) w.orWhere((o) => o.where("o.subject_type", s.type).andWhere("o.subject_id", s.id));
  });
  return ((await q.orderBy("o.id", "desc")) as OverrideRow[]).map(toOverride);
}

/** The override uses of one joint (the grants it used), in one statement. */
export async function insertOverrideUses(uses: { jointId: number; overrideId: number; blockKind: string; message: string }[], trx: Db): Promise<void> {
  if (!uses.length) return;
  await conn(trx)("joint_override_uses").insert(uses.map((u) => ({ joint_id: u.jointId, override_id: u.overrideId, block_kind: u.blockKind, message: u.message.slice(0, 500) })));
}

export async function listOverrideUsesForJoint({ jointId }: { jointId: number }, trx?: Db): Promise<(OverrideRecord & { blockKind: string; message: string })[]> {
  const rows = (await overrideQuery(trx).join("joint_override_uses as ou", "ou.override_id", "o.id").where("ou.joint_id", jointId).select("ou.block_kind", "ou.message").orderBy("o.id")) as (OverrideRow & { block_kind: string; message: string })[];
  return rows.map((r) => ({ ...toOverride(r), blockKind: r.block_kind, message: r.message }));
}

// ---------------------------------------------------------------------------------------
// What the Trench device keeps for offline use

/**
 * Coils the fuser's device should know without signal: those with the fuser's crew or on
 * the fuser's open jobs (any status, so a quarantined coil still shows its warning).
 */
export async function listCoilsForTrench({ crewId, jobIds, limit = 300 }: { crewId: number | null; jobIds: number[]; limit?: number }, trx?: Db): Promise<Coil[]> {
  if (crewId === null && jobIds.length === 0) return [];
  // coilQuery, so each coil comes with its job and that job's crew (whose coil it is).
  const rows = (await coilQuery(trx)
    .where((w) => {
      if (crewId !== null) w.orWhere("coils.crew_id", crewId);
      if (jobIds.length) w.orWhereIn("coils.job_id", jobIds);
    })
    .orderBy("coils.coil_code")
    .limit(limit)) as Parameters<typeof toCoil>[0][];
  return rows.map(toCoil);
}
