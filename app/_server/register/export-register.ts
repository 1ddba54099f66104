// The Register export use case: record and audit the export, then stream the file of
// exactly the rows of the view's filter (in the view's order) to the HTTP response as it
// is written, and record how it ended (rows written, done or failed) when the stream ends.
import "server-only";
import { PassThrough, Readable } from "node:stream";
import type { UserRecord } from "@/database/queries/users";
import { findExportById, finishExport, startExport } from "@/database/queries/exports";
import { findProcedureVersionById } from "@/database/queries/procedures";
import { countRegister, findRegisterFilterNames, iterateRegisterRows } from "@/database/queries/register";
import { describeFilter, describeSort, pickFilter, type RegisterExportQuery } from "@/domain/register";
import { logger } from "@/app/_lib/log";
import { ExportCancelledError, writeRegisterCsv, writeRegisterXlsx, type ExportProcedure } from "./export-files";
import { formatInstant } from "@/components/ui/display-format";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";

/** Rows per keyset batch read from the database while writing. */
const BATCH_SIZE = 1000;
/** Counted exactly up to this many rows before an export starts (see below). */
const EXPORT_EXACT_COUNT_CAP = 1_100_000;

const CONTENT_TYPES = {
  xlsx: "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet",
  csv: "text/csv; charset=utf-8",
} as const;

/** Rows written so far by the exports running in this server process, by export id. */
const running = new Map<number, { userId: number; progress: { rows: number }; expected: number }>();

export type ExportProgress = { exportId: number; status: "running" | "done" | "failed"; rowsWritten: number; expectedRows: number | null };

/**
 * How far one of the person's own exports has got: rows written of the total while it
 * runs (from this process), the rows written once it has ended (from the exports table).
 * Another person's export, or an unknown id, is null (answered as not found).
 */
export async function exportProgress({ exportId, user }: { exportId: number; user: UserRecord }): Promise<ExportProgress | null> {
  const live = running.get(exportId);
  if (live) return live.userId === user.id ? { exportId, status: "running", rowsWritten: live.progress.rows, expectedRows: live.expected } : null;
  const record = await findExportById({ id: exportId });
  if (!record || record.userId !== user.id) return null;
  return { exportId, status: record.status, rowsWritten: record.rowCount ?? 0, expectedRows: null };
}

/**
 * Starts reading the next batch from the database while the writer is busy with this
 * one, so database time and spreadsheet time overlap instead of adding up.
 */
export async function* readAhead<T>(source: AsyncIterable<T>): AsyncGenerator<T> {
  const iterator = source[Symbol.asyncIterator]();
  let pending = iterator.next();
  try {
    for (;;) {
      const result = await pending;
      if (result.done) return;
      pending = iterator.next();
      pending.catch(() => undefined); // a failure surfaces at the next await, not as an unhandled rejection
      yield result.value;
    }
  } finally {
    await iterator.return?.();
  }
}

async function loadProcedures(ids: number[]): Promise<ExportProcedure[]> {
  const out: ExportProcedure[] = [];
  for (const id of ids) {
    const v = await findProcedureVersionById({ id });
    if (v) out.push({ id: v.id, code: v.procedureCode, name: v.procedureName, versionNo: v.versionNo, definition: v.definition });
  }
  return out;
}

export async function exportRegister({ query, user, requestId, now = new Date() }: { query: RegisterExportQuery; user: UserRecord; requestId: string; now?: Date }): Promise<Response> {
  const filter = pickFilter(query);
  const view = { ...filter, sort: query.sort, dir: query.dir };
  // The export counts exactly well past Excel's row limit: an index-only count of a
  // million rows costs a fraction of a second, against a minute or more of writing, and
  // gives the browser's progress bar a true total.
  const timeZone = await organisationTimeZone();
  const [expected, names] = await Promise.all([countRegister({ filter, timeZone, cap: EXPORT_EXACT_COUNT_CAP }), findRegisterFilterNames({ filter })]);
  const exportId = await startExport({ userId: user.id, format: query.format, filter: view, expectedRows: expected, requestId });

  const out = new PassThrough({ highWaterMark: 256 * 1024 });
  const progress = { rows: 0 };
  running.set(exportId, { userId: user.id, progress, expected: expected.value });
  const batches = readAhead(iterateRegisterRows({ filter, timeZone, sort: query.sort, dir: query.dir, batchSize: BATCH_SIZE }));
  const write =
    query.format === "xlsx"
      ? writeRegisterXlsx({
          out,
          batches,
          meta: { exportedBy: { name: user.name, email: user.email }, exportedAt: now, system: user.unitSystem, timeZone, filterLines: describeFilter(filter, names, timeZone), sortText: describeSort(query.sort, query.dir), loadProcedures },
          progress,
        })
      : writeRegisterCsv({ out, batches, system: user.unitSystem, timeZone, progress });

  // Runs on after the response has started; the outcome is recorded, never thrown at the client.
  void write.then(
    async ({ rowCount }) => {
      running.delete(exportId);
      await finishExport({ id: exportId, userId: user.id, status: "done", rowCount, filter: view, format: query.format, requestId });
    },
    async (error: unknown) => {
      running.delete(exportId);
      const cancelled = error instanceof ExportCancelledError;
      if (!cancelled) logger.error({ requestId, exportId, err: error instanceof Error ? error.message : String(error) }, "register export failed");
      out.destroy(cancelled ? undefined : (error as Error));
      await finishExport({ id: exportId, userId: user.id, status: "failed", rowCount: progress.rows, filter: view, format: query.format, error: cancelled ? "cancelled" : "server error", requestId }).catch((e: unknown) =>
        logger.error({ requestId, exportId, err: String(e) }, "could not record the failed export"),
      );
    },
  );

  const day = formatInstant(now, "date", timeZone);
  return new Response(Readable.toWeb(out) as unknown as ReadableStream<Uint8Array>, {
    status: 200,
    headers: {
      "content-type": CONTENT_TYPES[query.format],
      "content-disposition": `attachment; filename="beadline-register-${day}.${query.format}"`,
      "cache-control": "no-store",
      "x-beadline-export-id": String(exportId),
      "x-beadline-row-estimate": String(expected.value),
      "x-beadline-row-estimate-kind": expected.isEstimate ? "estimate" : "exact",
    },
  });
}
