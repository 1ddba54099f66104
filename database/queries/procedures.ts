// The operator's written joining procedures and their versions. A version's definition
// (domain ProcedureDefinition, JSON) is never changed once published: tightening publishes
// a new version and marks the previous one superseded. Joints keep the version id they
// were checked against.
import type { FusionStandard, ProcedureDefinition } from "@/domain/procedures";
import { parseProcedureDefinition } from "@/domain/fusion/schemas";
import { conn, type Db } from "../client";
import type { ProcedureRow, ProcedureVersionRow } from "../tables";

export type ProcedureRecord = {
  id: number;
  code: string;
  name: string;
  standard: FusionStandard;
  isActive: boolean;
  createdAt: Date;
};

export type ProcedureVersionRecord = {
  id: number;
  procedureId: number;
  procedureCode: string;
  procedureName: string;
  versionNo: number;
  definition: ProcedureDefinition;
  notes: string | null;
  publishedBy: number | null;
  publishedByName: string | null;
  publishedAt: Date;
  supersededAt: Date | null;
  isCurrent: boolean;
};

function toProcedure(r: ProcedureRow): ProcedureRecord {
  return {
    id: r.id,
    code: r.code,
    name: r.name,
    // The column holds a domain/fusion standard id (written from FusionStandard only).
    standard: r.standard as FusionStandard,
    isActive: Boolean(r.is_active),
    createdAt: r.created_at,
  };
}

/** A procedure_versions row with its procedure's code and name and the publisher's name (versionQuery). */
type VersionRow = ProcedureVersionRow & { procedure_code: string; procedure_name: string; published_by_name: string | null };

function toVersion(r: VersionRow): ProcedureVersionRecord {
  const parsed = parseProcedureDefinition(r.definition);
  if (!parsed.ok) throw new Error(`Procedure version ${String(r.id)}: ${parsed.errors.map((e) => (e.field ? `${e.field}: ${e.message}` : e.message)).join('; ')}`);
  return {
    id: r.id,
    procedureId: r.procedure_id,
    procedureCode: r.procedure_code,
    procedureName: r.procedure_name,
    versionNo: r.version_no,
    definition: parsed.procedure,
    notes: r.notes ?? null,
    publishedBy: r.published_by ?? null,
    publishedByName: r.published_by_name ?? null,
    publishedAt: r.published_at,
    supersededAt: r.superseded_at ?? null,
    isCurrent: r.superseded_at == null,
  };
}

function versionQuery(trx?: Db) {
  return conn(trx)("procedure_versions")
    .join("procedures", "procedures.id", "procedure_versions.procedure_id")
    .leftJoin("users", "users.id", "procedure_versions.published_by")
    .select("procedure_versions.*", "procedures.code as procedure_code", "procedures.name as procedure_name", "users.name as published_by_name");
}

export async function findProcedureById({ id, forUpdate = false }: { id: number; forUpdate?: boolean }, trx?: Db): Promise<ProcedureRecord | null> {
  const q = conn(trx)("procedures").where({ id });
  if (forUpdate) q.forUpdate();
  const row = await q.first();
  return row ? toProcedure(row) : null;
}

export async function listProcedures({ activeOnly = false }: { activeOnly?: boolean } = {}, trx?: Db): Promise<ProcedureRecord[]> {
  const q = conn(trx)("procedures").orderBy("code");
  if (activeOnly) q.where("is_active", true);
  return (await q).map(toProcedure);
}

export async function findProcedureVersionById({ id, forUpdate = false }: { id: number; forUpdate?: boolean }, trx?: Db): Promise<ProcedureVersionRecord | null> {
  const q = versionQuery(trx).where("procedure_versions.id", id);
  if (forUpdate) q.forUpdate();
  const row = await q.first();
  return row ? toVersion(row) : null;
}

/** The latest version not superseded (the one new joints are checked against). */
export async function currentProcedureVersion({ procedureId }: { procedureId: number }, trx?: Db): Promise<ProcedureVersionRecord | null> {
  const row = await versionQuery(trx).where("procedure_versions.procedure_id", procedureId).whereNull("procedure_versions.superseded_at").orderBy("procedure_versions.version_no", "desc").first();
  return row ? toVersion(row) : null;
}

/** Current version of the job's procedure, with its parsed definition; null if the job is unknown. */
export async function currentProcedureVersionForJob({ jobId }: { jobId: number }, trx?: Db): Promise<ProcedureVersionRecord | null> {
  const job = (await conn(trx)("jobs").where({ id: jobId }).select("procedure_id").first()) as { procedure_id: number } | undefined;
  if (!job) return null;
  return currentProcedureVersion({ procedureId: job.procedure_id }, trx);
}

/**
 * The current version of every procedure, active or not, in one query (the latest version not
 * superseded per procedure, as currentProcedureVersion picks it): request-independent, so the
 * server keeps it (app/_server/reference/procedure-versions.ts).
 */
export async function listCurrentVersionOfEveryProcedure(_: Record<string, never> = {}, trx?: Db): Promise<ProcedureVersionRecord[]> {
  const rows = (await versionQuery(trx)
    .whereNull("procedure_versions.superseded_at")
    .orderBy([{ column: "procedure_versions.procedure_id" }, { column: "procedure_versions.version_no", order: "desc" }])) as VersionRow[];
  const seen = new Set<number>();
  return rows.filter((r) => !seen.has(r.procedure_id) && Boolean(seen.add(r.procedure_id))).map(toVersion);
}

export type ProcedureVersionSummary = ProcedureVersionRecord & { jointCount: number };

/** All versions of a procedure, newest first, each with how many joints were checked against it. */
export async function listProcedureVersions({ procedureId }: { procedureId: number }, trx?: Db): Promise<ProcedureVersionSummary[]> {
  const k = conn(trx);
  const rows = await versionQuery(trx)
    .where("procedure_versions.procedure_id", procedureId)
    .orderBy("procedure_versions.version_no", "desc")
    .select(k("joints").count("*").whereRaw("joints.procedure_version_id = procedure_versions.id").as("joint_count"));
  return rows.map((r: VersionRow & { joint_count: number | null }) => ({ ...toVersion(r), jointCount: Number(r.joint_count ?? 0) }));
}

/** Current versions of all active procedures (for pickers: jobs, heater checks). */
export async function listCurrentProcedureVersions(_: Record<string, never> = {}, trx?: Db): Promise<ProcedureVersionRecord[]> {
  const rows = await versionQuery(trx).where("procedures.is_active", true).whereNull("procedure_versions.superseded_at").orderBy("procedures.code");
  return rows.map(toVersion);
}

export async function countJointsUsingVersion({ versionId }: { versionId: number }, trx?: Db): Promise<number> {
  const row = await conn(trx)("joints").where({ procedure_version_id: versionId }).count({ n: "*" }).first();
  return Number(row?.n ?? 0);
}

export async function insertProcedure(input: { code: string; name: string; standard: FusionStandard }, trx?: Db): Promise<number> {
  const [id] = await conn(trx)("procedures").insert({ code: input.code, name: input.name, standard: input.standard });
  return Number(id);
}

export async function isProcedureCodeTaken({ code }: { code: string }, trx?: Db): Promise<boolean> {
  return Boolean(await conn(trx)("procedures").where({ code }).first("id"));
}

/** Appends a version; the unique (procedure, version_no) key makes a concurrent publish fail. */
export async function insertProcedureVersion(
  input: { procedureId: number; versionNo: number; definition: ProcedureDefinition; notes: string | null; publishedBy: number },
  trx?: Db,
): Promise<number> {
  const [id] = await conn(trx)("procedure_versions").insert({
    procedure_id: input.procedureId,
    version_no: input.versionNo,
    definition: JSON.stringify(input.definition),
    notes: input.notes,
    published_by: input.publishedBy,
  });
  return Number(id);
}

/** Marks a version superseded (only its superseded_at changes; its definition never does). */
export async function markVersionSuperseded({ versionId }: { versionId: number }, trx?: Db): Promise<boolean> {
  const k = conn(trx);
  const changed = await k("procedure_versions").where({ id: versionId }).whereNull("superseded_at").update({ superseded_at: k.fn.now(3) });
  return changed === 1;
}

/** Corrects the notes of a version no joint uses yet (the caller checks that in the same transaction). */
export async function updateVersionNotes({ versionId, notes }: { versionId: number; notes: string }, trx?: Db): Promise<void> {
  await conn(trx)("procedure_versions").where({ id: versionId }).update({ notes });
}
