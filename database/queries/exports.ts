// Register exports: one row per export (who, format, the filter as JSON, status, how many
// rows were written), each start and finish audited in the same transaction.
import { conn, db, type Db } from "../client";
import { insertAuditEntry } from "./audit-log";
import { num, parseJson } from "./rows";
import type { ExportRow } from "../tables";

export type ExportFormat = "xlsx" | "csv";
export type ExportStatus = "running" | "done" | "failed";

export type ExportRecord = {
  id: number;
  userId: number;
  format: ExportFormat;
  filter: Record<string, unknown>;
  status: ExportStatus;
  rowCount: number | null;
  startedAt: Date;
  finishedAt: Date | null;
};

function toExport(r: ExportRow): ExportRecord {
  return {
    id: Number(r.id),
    userId: Number(r.user_id),
    format: r.format,
    filter: parseJson<ExportRecord["filter"]>(r.filter, {}),
    status: r.status,
    rowCount: num(r.row_count),
    startedAt: r.started_at,
    finishedAt: r.finished_at ?? null,
  };
}

/** Records the start of an export and audits it (who, what filter, the expected rows). */
export async function startExport(
  { userId, format, filter, expectedRows, requestId }: { userId: number; format: ExportFormat; filter: Record<string, unknown>; expectedRows: { value: number; isEstimate: boolean }; requestId?: string },
  trx?: Db,
): Promise<number> {
  const work = async (t: Db) => {
    const [id] = await t("exports").insert({ user_id: userId, format, filter: JSON.stringify(filter), status: "running" });
    await insertAuditEntry({ actorUserId: userId, action: "register-export-started", entityType: "export", entityId: Number(id), details: { format, filter, expectedRows }, requestId }, t);
    return Number(id);
  };
  return trx ? work(trx) : db().transaction(work);
}

/** Marks an export done (or failed, e.g. the download was cancelled) with the rows written, audited. */
export async function finishExport(
  { id, userId, status, rowCount, filter, format, error, requestId }: { id: number; userId: number; status: "done" | "failed"; rowCount: number; filter: Record<string, unknown>; format: ExportFormat; error?: string; requestId?: string },
  trx?: Db,
): Promise<void> {
  const work = async (t: Db) => {
    await t("exports").where({ id }).update({ status, row_count: rowCount, finished_at: t.fn.now(3) });
    await insertAuditEntry(
      { actorUserId: userId, action: status === "done" ? "register-exported" : "register-export-failed", entityType: "export", entityId: id, details: { format, filter, rowCount, ...(error ? { error } : {}) }, requestId },
      t,
    );
  };
  await (trx ? work(trx) : db().transaction(work));
}

export async function findExportById({ id }: { id: number }, trx?: Db): Promise<ExportRecord | null> {
  const row = await conn(trx)("exports").where({ id }).first();
  return row ? toExport(row) : null;
}

/** A person's latest exports, newest first. */
export async function listExportsForUser({ userId, limit = 20 }: { userId: number; limit?: number }, trx?: Db): Promise<ExportRecord[]> {
  const rows = await conn(trx)("exports").where({ user_id: userId }).orderBy("started_at", "desc").orderBy("id", "desc").limit(limit);
  return rows.map(toExport);
}
