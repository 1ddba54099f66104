// Jobs (work orders): code, name, place, dates, status, procedure, crew, pipe sizes, and
// the coils assigned to them. Edits use optimistic locking on `version`.
import type { JobStatus } from "@/domain/jobs/rules";
import type { CoilStatus } from "@/domain/coils/statuses";
import { conn, type Db } from "../client";
import type { CoilTableRow, JobRow as JobTableRow } from "../tables";
import { isoDay } from "./rows";

export type JobRecord = {
  id: number;
  code: string;
  name: string;
  place: string | null;
  latitude: number | null;
  longitude: number | null;
  startsOn: string | null;
  endsOn: string | null;
  status: JobStatus;
  procedureId: number;
  procedureCode: string;
  procedureName: string;
  crewId: number | null;
  crewName: string | null;
  pipeSizes: string | null;
  version: number;
  createdAt: Date;
  updatedAt: Date;
};

/** A jobs row with its procedure's code and name and its crew's name. */
type JobRow = JobTableRow & { procedure_code: string; procedure_name: string; crew_name: string | null };

function toJob(row: JobRow): JobRecord {
  return {
    id: row.id,
    code: row.code,
    name: row.name,
    place: row.place,
    latitude: row.latitude,
    longitude: row.longitude,
    startsOn: isoDay(row.starts_on),
    endsOn: isoDay(row.ends_on),
    status: row.status,
    procedureId: row.procedure_id,
    procedureCode: row.procedure_code,
    procedureName: row.procedure_name,
    crewId: row.crew_id,
    crewName: row.crew_name,
    pipeSizes: row.pipe_sizes,
    version: row.version,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

function baseQuery(trx?: Db) {
  return conn(trx)("jobs")
    .join("procedures", "procedures.id", "jobs.procedure_id")
    .leftJoin("crews", "crews.id", "jobs.crew_id")
    .select("jobs.*", "procedures.code as procedure_code", "procedures.name as procedure_name", "crews.name as crew_name");
}

export async function findJobById({ id, forUpdate = false }: { id: number; forUpdate?: boolean }, trx?: Db): Promise<JobRecord | null> {
  const q = baseQuery(trx).where("jobs.id", id);
  if (forUpdate) q.forUpdate();
  const row = (await q.first()) as JobRow | undefined;
  return row ? toJob(row) : null;
}

export async function listJobs({ status }: { status?: JobStatus } = {}, trx?: Db): Promise<JobRecord[]> {
  const q = baseQuery(trx).orderBy([{ column: "jobs.status", order: "desc" }, { column: "jobs.code", order: "asc" }]);
  if (status) q.where("jobs.status", status);
  return ((await q) as JobRow[]).map(toJob);
}

/**
 * Open jobs a fuser may record on: those of the fuser's crew, plus open jobs with no crew
 * assigned (anyone may work them). A fuser with no crew sees only the unassigned ones.
 */
export async function listOpenJobsForFuser({ userId, crewId }: { userId: number; crewId?: number | null }, trx?: Db): Promise<JobRecord[]> {
  const k = conn(trx);
  // The caller usually holds the person's record already (the session's): then no read of the crew.
  const crew = crewId !== undefined ? crewId : (((await k("users").where({ id: userId }).select("crew_id").first()) as { crew_id: number | null } | undefined)?.crew_id ?? null);
  const q = baseQuery(trx).where("jobs.status", "open").orderBy("jobs.code");
  if (crew) q.where((w) => w.where("jobs.crew_id", crew).orWhereNull("jobs.crew_id"));
  else q.whereNull("jobs.crew_id");
  return ((await q) as JobRow[]).map(toJob);
}

export type JobFields = {
  code: string;
  name: string;
  place?: string | null;
  latitude?: number | null;
  longitude?: number | null;
  startsOn?: string | null;
  endsOn?: string | null;
  procedureId: number;
  crewId?: number | null;
  pipeSizes?: string | null;
};

function jobColumns(input: JobFields) {
  return {
    code: input.code,
    name: input.name,
    place: input.place ?? null,
    latitude: input.latitude ?? null,
    longitude: input.longitude ?? null,
    starts_on: input.startsOn ?? null,
    ends_on: input.endsOn ?? null,
    procedure_id: input.procedureId,
    crew_id: input.crewId ?? null,
    pipe_sizes: input.pipeSizes ?? null,
  };
}

/** Inserts a job and its gap-free joint counter (one row per job). */
export async function insertJob(input: JobFields, trx?: Db): Promise<number> {
  const k = conn(trx);
  const [id] = await k("jobs").insert({ ...jobColumns(input), status: "open" });
  await k("job_counters").insert({ job_id: id, last_joint_no: 0 });
  return Number(id);
}

/** Optimistic update: false when `version` is stale (someone else changed the job). */
export async function updateJob(input: JobFields & { id: number; version: number }, trx?: Db): Promise<boolean> {
  const k = conn(trx);
  const changed = await k("jobs")
    .where({ id: input.id, version: input.version })
    .update({ ...jobColumns(input), version: k.raw("version + 1"), updated_at: k.fn.now(3) });
  return changed === 1;
}

/** Optimistic status change (open ↔ closed): false when `version` is stale. */
export async function updateJobStatus({ id, version, status }: { id: number; version: number; status: JobStatus }, trx?: Db): Promise<boolean> {
  const k = conn(trx);
  const changed = await k("jobs").where({ id, version }).update({ status, version: k.raw("version + 1"), updated_at: k.fn.now(3) });
  return changed === 1;
}

export type JobCoil = { id: number; coilCode: string; lot: string; nominalSize: string; sdr: number; status: CoilStatus; remainingM: number; version: number };

export async function listCoilsForJob({ jobId }: { jobId: number }, trx?: Db): Promise<JobCoil[]> {
  const rows = await conn(trx)("coils").where({ job_id: jobId }).orderBy("coil_code").select("id", "coil_code", "lot", "nominal_size", "sdr", "status", "remaining_m", "version");
  return rows.map(toJobCoil);
}

/** Coils that may be assigned to a job: not quarantined or used up, and not on another job. */
export async function listAssignableCoils({ jobId }: { jobId?: number } = {}, trx?: Db): Promise<JobCoil[]> {
  const q = conn(trx)("coils")
    .whereNotIn("status", ["quarantined", "used-up"])
    .orderBy("coil_code")
    .select("id", "coil_code", "lot", "nominal_size", "sdr", "status", "remaining_m", "version");
  if (jobId) q.where((w) => w.whereNull("job_id").orWhere("job_id", jobId));
  else q.whereNull("job_id");
  return (await q).map(toJobCoil);
}

function toJobCoil(r: Pick<CoilTableRow, "id" | "coil_code" | "lot" | "nominal_size" | "sdr" | "status" | "remaining_m" | "version">): JobCoil {
  return {
    id: r.id,
    coilCode: r.coil_code,
    lot: r.lot,
    nominalSize: r.nominal_size,
    sdr: Number(r.sdr),
    status: r.status,
    remainingM: Number(r.remaining_m),
    version: r.version,
  };
}

/**
 * Makes the job's assigned coils exactly `coilIds`: sets job_id on the new ones, clears it
 * on the dropped ones (bumping each coil's version so concurrent coil edits notice), and
 * logs a coil event for each. Returns what changed; throws nothing — the caller checks
 * eligibility first (see assignableProblems) inside the same transaction.
 */
export async function setCoilsForJob(
  { jobId, coilIds, byUserId }: { jobId: number; coilIds: number[]; byUserId: number },
  trx: Db,
): Promise<{ added: number[]; removed: number[] }> {
  const k = conn(trx);
  const current = (await k("coils").where({ job_id: jobId }).forUpdate().select("id", "status")) as { id: number; status: string }[];
  const wanted = new Set(coilIds);
  const have = new Set(current.map((c) => c.id));
  const added = coilIds.filter((id) => !have.has(id));
  const removed = current.filter((c) => !wanted.has(c.id)).map((c) => c.id);
  if (added.length) {
    await k("coils").whereIn("id", added).update({ job_id: jobId, version: k.raw("version + 1") });
  }
  if (removed.length) {
    await k("coils").whereIn("id", removed).update({ job_id: null, version: k.raw("version + 1") });
  }
  const statusById = new Map((await k("coils").whereIn("id", [...added, ...removed]).select("id", "status")).map((r: { id: number; status: string }) => [r.id, r.status]));
  for (const id of added) {
    await k("coil_events").insert({ coil_id: id, by_user_id: byUserId, from_status: statusById.get(id) ?? null, to_status: statusById.get(id) ?? "in-yard", reason: "Assigned to a job", job_id: jobId });
  }
  for (const id of removed) {
    await k("coil_events").insert({ coil_id: id, by_user_id: byUserId, from_status: statusById.get(id) ?? null, to_status: statusById.get(id) ?? "in-yard", reason: "Taken off the job", job_id: null });
  }
  return { added, removed };
}

/**
 * Why the given coils cannot be assigned to this job (empty when all can): unknown ids,
 * quarantined or used-up coils, coils on another job; and coils that would be taken off
 * while in use on it.
 */
export async function coilAssignmentProblems({ jobId, coilIds }: { jobId: number | null; coilIds: number[] }, trx?: Db): Promise<string[]> {
  const k = conn(trx);
  const problems: string[] = [];
  if (coilIds.length) {
    const rows = (await k("coils").whereIn("id", coilIds).select("id", "coil_code", "status", "job_id")) as { id: number; coil_code: string; status: string; job_id: number | null }[];
    const found = new Set(rows.map((r) => r.id));
    for (const id of coilIds) if (!found.has(id)) problems.push(`Coil ${id} does not exist.`);
    for (const r of rows) {
      if (r.job_id && r.job_id !== jobId) problems.push(`Coil ${r.coil_code} is assigned to another job.`);
      else if ((r.status === "quarantined" || r.status === "used-up") && (jobId === null || r.job_id !== jobId)) problems.push(`Coil ${r.coil_code} is ${r.status === "quarantined" ? "quarantined" : "used up"} and cannot be assigned.`);
    }
  }
  if (jobId) {
    const dropping = (await k("coils").where({ job_id: jobId }).whereNotIn("id", coilIds.length ? coilIds : [0]).whereIn("status", ["in-use", "used-up"]).select("coil_code")) as { coil_code: string }[];
    for (const r of dropping) problems.push(`Coil ${r.coil_code} is in use on this job (joints were made from it); it stays assigned.`);
  }
  return problems;
}

export async function countJointsOnJob({ jobId }: { jobId: number }, trx?: Db): Promise<number> {
  const row = await conn(trx)("joints").where({ job_id: jobId }).count({ n: "*" }).first();
  return Number(row?.n ?? 0);
}
