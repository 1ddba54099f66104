// Coils: receipt, status, length remaining and the event history of each coil. Lengths in
// m (DECIMAL(9,2) in the table), diameters in mm. The trench's record-joint transaction
// writes a pull (writeCoilPull) for each coil a joint lays pipe from.
import type { Knex } from "knex";
import { resolveScannedCoil } from "@/domain/coils/scanned-coil";
import { readScannedCoilText, type DamageKind, type PullPlan, type TraceCodeFlag } from "@/domain/coils/life";
import type { CoilStatus } from "@/domain/coils/statuses";
import type { PipeSeries } from "@/domain/pipe/catalogue";
import { conn, isDuplicateKey, type Db } from "../client";
import type { CoilEventRow, CoilTableRow } from "../tables";
import { bool, isoDay, num, parseJson, setList } from "./rows";
import { insertAuditEntry } from "./audit-log";

export type CoilInspection = {
  hasDamage: boolean;
  damageKinds: DamageKind[];
  damageNotes: string | null;
  gougeDepthMm: number | null;
  gougeLimitPct: number | null;
  ovalityPct: number | null;
  ovalityLimitPct: number | null;
  endCapsInPlace: boolean;
  passed: boolean;
  receivedById: number | null;
  receivedByName: string | null;
  receivedAt: Date;
};

export type Coil = {
  id: number;
  coilCode: string;
  manufacturer: string;
  manufacturerCode: string | null;
  lot: string;
  /** 'YYYY-MM-DD' or null. */
  productionDate: string | null;
  material: string;
  series: PipeSeries;
  nominalSize: string;
  outsideDiameterMm: number;
  sdr: number;
  lengthM: number;
  remainingM: number;
  printLine: string | null;
  traceCode: string | null;
  traceCodeFlags: TraceCodeFlag[];
  status: CoilStatus;
  statusReason: string | null;
  crewId: number | null;
  crewName: string | null;
  trailer: string | null;
  jobId: number | null;
  jobCode: string | null;
  jobName: string | null;
  /** The crew of the job the coil is assigned to (that job's crew, not the trailer's). */
  jobCrewId: number | null;
  jobCrewName: string | null;
  inspection: CoilInspection;
  labelPrintedAt: Date | null;
  version: number;
};

/** A coils row with its crew, job and receiver (coilQuery). */
export type CoilRow = CoilTableRow & {
  status: CoilStatus;
  crew_name: string | null;
  crew_trailer: string | null;
  job_code: string | null;
  job_name: string | null;
  job_crew_id?: number | null;
  job_crew_name?: string | null;
  received_by_name: string | null;
};

function parseFlags(text: string | null): TraceCodeFlag[] {
  const parsed = parseJson<unknown>(text, []);
  return Array.isArray(parsed) ? (parsed as TraceCodeFlag[]) : [];
}

export function toCoil(row: CoilRow): Coil {
  return {
    id: Number(row.id),
    coilCode: row.coil_code,
    manufacturer: row.manufacturer,
    manufacturerCode: row.manufacturer_code ?? null,
    lot: row.lot,
    productionDate: isoDay(row.production_date),
    material: row.material,
    series: row.series,
    nominalSize: row.nominal_size,
    outsideDiameterMm: Number(row.outside_diameter_mm),
    sdr: Number(row.sdr),
    lengthM: Number(row.length_m),
    remainingM: Number(row.remaining_m),
    printLine: row.print_line ?? null,
    traceCode: row.trace_code ?? null,
    traceCodeFlags: parseFlags(row.trace_code_flags),
    status: row.status,
    statusReason: row.status_reason ?? null,
    crewId: num(row.crew_id),
    crewName: row.crew_name ?? null,
    trailer: row.crew_trailer ?? null,
    jobId: num(row.job_id),
    jobCode: row.job_code ?? null,
    jobName: row.job_name ?? null,
    jobCrewId: num(row.job_crew_id ?? null),
    jobCrewName: row.job_crew_name ?? null,
    inspection: {
      hasDamage: Boolean(row.has_damage),
      damageKinds: setList<DamageKind>(row.damage_kinds),
      damageNotes: row.damage_notes ?? null,
      gougeDepthMm: num(row.gouge_depth_mm),
      gougeLimitPct: num(row.gouge_limit_pct),
      ovalityPct: num(row.ovality_pct),
      ovalityLimitPct: num(row.ovality_limit_pct),
      endCapsInPlace: bool(row.end_caps_in_place) ?? false,
      passed: bool(row.inspection_passed) ?? false,
      receivedById: num(row.received_by),
      receivedByName: row.received_by_name ?? null,
      receivedAt: row.received_at,
    },
    labelPrintedAt: row.label_printed_at ?? null,
    version: Number(row.version),
  };
}

/** Coils with their crew, job and receiver: the select every coil reader starts from. */
export function coilQuery(trx?: Db) {
  return conn(trx)("coils")
    .leftJoin("crews", "crews.id", "coils.crew_id")
    .leftJoin("jobs", "jobs.id", "coils.job_id")
    .leftJoin("users as receiver", "receiver.id", "coils.received_by")
    .leftJoin("crews as job_crew", "job_crew.id", "jobs.crew_id")
    .select("coils.*", "crews.name as crew_name", "crews.trailer as crew_trailer", "jobs.code as job_code", "jobs.name as job_name", "receiver.name as received_by_name")
    .select("jobs.crew_id as job_crew_id", "job_crew.name as job_crew_name");
}

export async function findCoilById({ id }: { id: number }, trx?: Db): Promise<Coil | null> {
  const row = (await coilQuery(trx).where("coils.id", id).first()) as CoilRow | undefined;
  return row ? toCoil(row) : null;
}

export async function findCoilByCode({ coilCode }: { coilCode: string }, trx?: Db): Promise<Coil | null> {
  const row = (await coilQuery(trx).where("coils.coil_code", coilCode.trim()).first()) as CoilRow | undefined;
  return row ? toCoil(row) : null;
}

/** Every coil carrying this F2897 code (one lot of one size: several coils can share it). */
export async function listCoilsByTraceCode({ traceCode }: { traceCode: string }, trx?: Db): Promise<Coil[]> {
  // The column's collation ignores case, but F2897 codes are case-sensitive: compare bytes too.
  const rows = (await coilQuery(trx).where("coils.trace_code", traceCode).whereRaw("BINARY coils.trace_code = ?", [traceCode]).orderBy("coils.id")) as CoilRow[];
  return rows.map(toCoil);
}

/**
 * The coil a scanned or typed text names: our coil id, a URL ending in /coils/<code> (the
 * label's QR), or an F2897 16-character code. Reads the coils the text could name and lets
 * the domain's resolver pick (domain/coils/scanned-coil.ts: the same preference order the
 * Trench screen applies on the device). null when nothing matches.
 */
export async function findCoilByCodeOrTrace({ code, preferCrewId }: { code: string; preferCrewId?: number | null }, trx?: Db): Promise<Coil | null> {
  const scanned = readScannedCoilText(code);
  if (scanned.kind === "empty") return null;
  const byCode = await findCoilByCode({ coilCode: scanned.code }, trx);
  const candidates = byCode || scanned.kind === "coil-code" ? [] : await listCoilsByTraceCode({ traceCode: scanned.code }, trx);
  const coils = [...(byCode ? [byCode] : []), ...candidates];
  const picked = resolveScannedCoil(code, coils.map((c) => ({ id: c.id, code: c.coilCode, traceCode: c.traceCode, status: c.status, crewId: c.crewId })), { preferCrewId });
  return coils.find((c) => c.id === picked?.id) ?? null;
}

export type CoilListFilter = { status?: CoilStatus | "all"; search?: string; limit?: number };

/** Coils for the list screen, newest received first; `search` matches coil id, lot or code. */
export async function listCoils({ status = "all", search, limit = 200 }: CoilListFilter = {}, trx?: Db): Promise<Coil[]> {
  const q = coilQuery(trx).orderBy("coils.received_at", "desc").orderBy("coils.id", "desc").limit(limit);
  if (status !== "all") q.where("coils.status", status);
  const text = search?.trim();
  if (text) {
    q.where((w) => {
      w.where("coils.coil_code", "like", `%${escapeLike(text)}%`).orWhere("coils.lot", text).orWhere("coils.trace_code", text);
    });
  }
  return ((await q) as CoilRow[]).map(toCoil);
}

export function escapeLike(text: string): string {
  return text.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** Coils by status, for the list screen's tabs. */
export async function countCoilsByStatus(_: Record<string, never> = {}, trx?: Db): Promise<Record<CoilStatus, number>> {
  const rows = (await conn(trx)("coils").select("status").count({ n: "*" }).groupBy("status")) as { status: CoilStatus; n: number }[];
  const counts: Record<CoilStatus, number> = { "in-yard": 0, "on-trailer": 0, "in-use": 0, "used-up": 0, quarantined: 0 };
  for (const row of rows) counts[row.status] = Number(row.n);
  return counts;
}

/** Suggested id for the next coil: the highest id of the latest coil's pattern, plus one. */
export async function latestCoilCode(_: Record<string, never> = {}, trx?: Db): Promise<string | null> {
  const row = (await conn(trx)("coils").select("coil_code").orderBy("id", "desc").first()) as { coil_code: string } | undefined;
  return row?.coil_code ?? null;
}

/** Pipe makers already on file with their F2897 ids, for the receipt form. */
export async function listKnownManufacturers(_: Record<string, never> = {}, trx?: Db): Promise<{ name: string; code: string | null }[]> {
  const rows = (await conn(trx)("coils").distinct("manufacturer", "manufacturer_code").orderBy("manufacturer")) as { manufacturer: string; manufacturer_code: string | null }[];
  return rows.map((r) => ({ name: r.manufacturer, code: r.manufacturer_code }));
}

/** Crews (with their trailers) and open jobs, for the status-move form. */
export async function listCoilMoveOptions(_: Record<string, never> = {}, trx?: Db): Promise<{ crews: { id: number; name: string; trailer: string | null }[]; jobs: { id: number; code: string; name: string }[] }> {
  const k = conn(trx);
  const crews = (await k("crews").select("id", "name", "trailer").where("is_active", true).orderBy("name")) as { id: number; name: string; trailer: string | null }[];
  const jobs = (await k("jobs").select("id", "code", "name").where("status", "open").orderBy("code")) as { id: number; code: string; name: string }[];
  return { crews: crews.map((c) => ({ ...c, id: Number(c.id) })), jobs: jobs.map((j) => ({ ...j, id: Number(j.id) })) };
}

/** A coil as received: the fields it shares with Coil, plus the receipt inspection. */
export type NewCoil = Pick<
  Coil,
  "coilCode" | "manufacturer" | "manufacturerCode" | "lot" | "productionDate" | "material" | "series" | "nominalSize" | "outsideDiameterMm" | "sdr" | "lengthM" | "printLine" | "traceCode" | "traceCodeFlags"
> & {
  damageKinds: DamageKind[];
  damageNotes: string | null;
  gougeDepthMm: number | null;
  gougeLimitPct: number;
  ovalityPct: number | null;
  ovalityLimitPct: number;
  endCapsInPlace: boolean;
  inspectionPassed: boolean;
  /** Set when the inspection failed: why the coil is quarantined. */
  quarantineReason: string | null;
  receivedBy: number;
  receivedAt?: Date;
};

/** insertCoil's answer: the new coil's id, or that the coil id is already on file. */
export type InsertCoilResult = { ok: true; id: number } | { ok: false; reason: "duplicate-coil-code" };

/**
 * Inserts a received coil (in the yard, or quarantined when its inspection failed) with
 * its first coil event. Inside the caller's transaction. A duplicate coil id writes
 * nothing and answers { ok: false } (the caller words the conflict).
 */
export async function insertCoil(coil: NewCoil, trx: Db): Promise<InsertCoilResult> {
  const status: CoilStatus = coil.inspectionPassed ? "in-yard" : "quarantined";
  let id: number;
  try {
    const [inserted] = await trx("coils").insert({
      coil_code: coil.coilCode,
      manufacturer: coil.manufacturer,
      manufacturer_code: coil.manufacturerCode,
      lot: coil.lot,
      production_date: coil.productionDate,
      material: coil.material,
      series: coil.series,
      nominal_size: coil.nominalSize,
      outside_diameter_mm: coil.outsideDiameterMm,
      sdr: coil.sdr,
      length_m: coil.lengthM,
      remaining_m: coil.lengthM,
      print_line: coil.printLine,
      trace_code: coil.traceCode,
      trace_code_flags: coil.traceCodeFlags.length ? JSON.stringify(coil.traceCodeFlags) : null,
      status,
      status_reason: coil.quarantineReason,
      has_damage: coil.damageKinds.length > 0 || (coil.gougeDepthMm ?? 0) > 0,
      damage_kinds: coil.damageKinds.length ? coil.damageKinds.join(",") : null,
      damage_notes: coil.damageNotes,
      gouge_depth_mm: coil.gougeDepthMm,
      gouge_limit_pct: coil.gougeLimitPct,
      ovality_pct: coil.ovalityPct,
      ovality_limit_pct: coil.ovalityLimitPct,
      end_caps_in_place: coil.endCapsInPlace,
      inspection_passed: coil.inspectionPassed,
      received_by: coil.receivedBy,
      ...(coil.receivedAt ? { received_at: coil.receivedAt } : {}),
    });
    id = Number(inserted);
  } catch (error) {
    if (isDuplicateKey(error)) return { ok: false, reason: "duplicate-coil-code" };
    throw error;
  }
  await trx("coil_events").insert({
    coil_id: id,
    by_user_id: coil.receivedBy,
    from_status: null,
    to_status: status,
    reason: coil.quarantineReason ?? "Received",
    remaining_m: coil.lengthM,
  });
  return { ok: true, id };
}

/** Locks a coil row for the rest of the transaction (SELECT … FOR UPDATE). */
export async function lockCoil({ id }: { id: number }, trx: Knex.Transaction): Promise<Coil | null> {
  const locked = await trx("coils").select("id").where("id", id).forUpdate().first();
  if (!locked) return null;
  return findCoilById({ id }, trx);
}

/**
 * Moves a locked coil to a status (the caller has checked the move against the domain
 * rules and the version), bumps its version and writes the coil event. On trailer keeps
 * the crew; in the yard clears crew and job. false (nothing written) when the coil's
 * version is no longer `coil.version`: someone else changed it.
 */
export async function updateCoilStatus(
  { coil, to, reason, crewId, jobId, userId }: { coil: Coil; to: CoilStatus; reason: string | null; crewId?: number | null; jobId?: number | null; userId: number },
  trx: Db,
): Promise<boolean> {
  const patch: Partial<CoilTableRow> = { status: to, status_reason: reason, version: coil.version + 1 };
  if (to === "in-yard") Object.assign(patch, { crew_id: null, job_id: null });
  if (to === "on-trailer") Object.assign(patch, { crew_id: crewId ?? coil.crewId, job_id: null });
  if (to === "in-use") Object.assign(patch, { job_id: jobId ?? coil.jobId, ...(crewId ? { crew_id: crewId } : {}) });
  const changed = await trx("coils").where({ id: coil.id, version: coil.version }).update(patch);
  if (changed !== 1) return false;
  await trx("coil_events").insert({
    coil_id: coil.id,
    by_user_id: userId,
    from_status: coil.status,
    to_status: to,
    reason,
    job_id: patch.job_id ?? coil.jobId,
    crew_id: patch.crew_id ?? coil.crewId,
    remaining_m: coil.remainingM,
  });
  return true;
}

export type DrawDownResult = {
  coilId: number;
  coilCode: string;
  pulledM: number;
  remainingM: number;
  status: CoilStatus;
  fromStatus: CoilStatus;
  /** The job and crew the coil event names. */
  jobId: number | null;
  crewId: number | null;
  /** The length as asked for (the event's words). */
  requestedM: number;
};

/**
 * Writes a pull already judged by planPull (domain/coils/life) off a coil locked FOR
 * UPDATE in the caller's transaction: the length left, the status (in use, used up at 0),
 * the joint's job when the coil had none, and a coil_events row with the pull, the length
 * left and the joint. The refusals and their words are the caller's
 * (app/_server/coils/draw-down-coil.ts); so is the audit entry (the joint record).
 */
export async function writeCoilPull(
  { coil, pull, pullM, jointId, userId, jobId }: { coil: LockedCoil; pull: Extract<PullPlan, { ok: true }>; pullM: number; jointId?: number | null; userId: number; jobId?: number | null },
  trx: Knex.Transaction,
): Promise<DrawDownResult> {
  let useJobId = jobId ?? null;
  if (useJobId == null && jointId != null) {
    const joint = (await trx("joints").select("job_id").where("id", jointId).first()) as { job_id: number } | undefined;
    useJobId = joint ? Number(joint.job_id) : null;
  }
  const drawn = await writeCoilLength({ coil, pull, pullM, jobId: useJobId }, trx);
  await insertPullEvents({ pulls: [drawn], jointId: jointId ?? null, userId }, trx);
  return drawn;
}

/** What a joint's transaction needs of a coil it has locked: enough to judge and write a pull. */
export type LockedCoil = Pick<Coil, "id" | "coilCode" | "status" | "statusReason" | "remainingM" | "jobId" | "crewId" | "version">;

/**
 * Locks these coil rows for the rest of the transaction in ONE statement, in id order (the
 * primary key's order, so two transactions locking overlapping coils queue up instead of
 * deadlocking): FOR UPDATE when pipe is pulled from them, LOCK IN SHARE MODE otherwise (a
 * joint that only names a coil lets other joints name it too). Returns each row as it stands
 * now (a locking read sees the latest committed version).
 */
export async function lockCoils({ ids, exclusive }: { ids: number[]; exclusive: boolean }, trx: Knex.Transaction): Promise<Map<number, LockedCoil>> {
  if (!ids.length) return new Map();
  const q = trx("coils").whereIn("id", [...new Set(ids)]).orderBy("id").select("id", "coil_code", "status", "status_reason", "remaining_m", "job_id", "crew_id", "version");
  const rows = (await (exclusive ? q.forUpdate() : q.forShare())) as Pick<CoilTableRow, "id" | "coil_code" | "status" | "status_reason" | "remaining_m" | "job_id" | "crew_id" | "version">[];
  return new Map(
    rows.map((r) => [
      Number(r.id),
      { id: Number(r.id), coilCode: r.coil_code, status: r.status as CoilStatus, statusReason: r.status_reason ?? null, remainingM: Number(r.remaining_m), jobId: num(r.job_id), crewId: num(r.crew_id), version: Number(r.version) },
    ]),
  );
}

/**
 * The coil half of a pull (writeCoilPull without its event): the length left, the status and
 * the joint's job when the coil had none, on a coil locked FOR UPDATE. The record-joint use
 * case writes this before it takes the joint's number and the event (insertPullEvents) after
 * the joint exists.
 */
export async function writeCoilLength(
  { coil, pull, pullM, jobId }: { coil: LockedCoil; pull: Extract<PullPlan, { ok: true }>; pullM: number; jobId: number | null },
  trx: Knex.Transaction,
): Promise<DrawDownResult> {
  const patch: Partial<CoilTableRow> = { remaining_m: pull.remainingM, status: pull.status, version: coil.version + 1 };
  if (coil.jobId == null && jobId != null) patch.job_id = jobId;
  patch.status_reason = pull.isUsedUp ? "All of the coil has been laid" : null;
  await trx("coils").where({ id: coil.id }).update(patch);
  return { coilId: coil.id, coilCode: coil.coilCode, pulledM: Math.round(pullM * 100) / 100, remainingM: pull.remainingM, status: pull.status, fromStatus: coil.status, jobId: jobId ?? coil.jobId, crewId: coil.crewId, requestedM: pullM };
}

/** The coil_events rows of pulls (one statement): the pull, the length left and the joint. */
export async function insertPullEvents({ pulls, jointId, userId }: { pulls: DrawDownResult[]; jointId: number | null; userId: number }, trx: Knex.Transaction): Promise<void> {
  if (!pulls.length) return;
  await trx("coil_events").insert(
    pulls.map((p) => ({
      coil_id: p.coilId,
      by_user_id: userId,
      from_status: p.fromStatus,
      to_status: p.status,
      reason: jointId != null ? `Pulled ${p.requestedM.toFixed(2)} m for joint ${jointId}` : `Pulled ${p.requestedM.toFixed(2)} m`,
      job_id: p.jobId,
      crew_id: p.crewId,
      pull_m: Math.round(p.requestedM * 100) / 100,
      remaining_m: p.remainingM,
      joint_id: jointId,
    })),
  );
}

export type CoilEvent = {
  id: number;
  at: Date;
  byUserId: number | null;
  byUserName: string | null;
  fromStatus: CoilStatus | null;
  toStatus: CoilStatus;
  reason: string | null;
  pullM: number | null;
  remainingM: number | null;
  jointId: number | null;
  jointNo: number | null;
  jobCode: string | null;
  crewName: string | null;
};

/** A coil_events row with who made it, the joint's number, the job's code and the crew's name. */
type CoilEventListRow = CoilEventRow & {
  from_status: CoilStatus | null;
  to_status: CoilStatus;
  by_user_name: string | null;
  joint_no: number | null;
  job_code: string | null;
  crew_name: string | null;
};

/** The history of a coil, newest first: receipt, moves and each pull with the joint it went into. */
export async function listCoilEvents({ coilId, limit = 200 }: { coilId: number; limit?: number }, trx?: Db): Promise<CoilEvent[]> {
  const rows = (await conn(trx)("coil_events as e")
    .leftJoin("users as u", "u.id", "e.by_user_id")
    .leftJoin("joints as j", "j.id", "e.joint_id")
    .leftJoin("jobs as jb", "jb.id", "e.job_id")
    .leftJoin("crews as c", "c.id", "e.crew_id")
    .select("e.*", "u.name as by_user_name", "j.joint_no", "jb.code as job_code", "c.name as crew_name")
    .where("e.coil_id", coilId)
    .orderBy("e.at", "desc")
    .orderBy("e.id", "desc")
    .limit(limit)) as CoilEventListRow[];
  return rows.map((r) => ({
    id: Number(r.id),
    at: r.at,
    byUserId: num(r.by_user_id),
    byUserName: r.by_user_name ?? null,
    fromStatus: r.from_status ?? null,
    toStatus: r.to_status,
    reason: r.reason ?? null,
    pullM: num(r.pull_m),
    remainingM: num(r.remaining_m),
    jointId: num(r.joint_id),
    jointNo: num(r.joint_no),
    jobCode: r.job_code ?? null,
    crewName: r.crew_name ?? null,
  }));
}

/** Stamps label_printed_at (now) on coils whose label was printed or downloaded, with an audit entry each. */
export async function markCoilLabelsPrinted({ coilIds, userId, requestId, how }: { coilIds: number[]; userId: number; requestId?: string | null; how: "print" | "png" | "svg" }, trx: Db): Promise<number> {
  if (!coilIds.length) return 0;
  const ids = [...new Set(coilIds)];
  const changed = await trx("coils").whereIn("id", ids).update({ label_printed_at: trx.fn.now(3) });
  for (const id of ids) {
    await insertAuditEntry({ actorUserId: userId, action: "coil-label-printed", entityType: "coil", entityId: id, details: { how }, requestId }, trx);
  }
  return Number(changed);
}
