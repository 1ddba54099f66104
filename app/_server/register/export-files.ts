// Writes Register rows as a spreadsheet (.xlsx, exceljs's streaming WorkbookWriter) or as
// CSV into a Node stream, batch by batch, waiting for the reader between batches so the
// file never sits whole in memory. The writing itself runs in a worker thread
// (sheet-writer.worker.mjs): this side turns rows into cell values and relays bytes. The columns, headers (with units) and cell values are
// the grid's (domain/register/columns.ts).
import "server-only";
import type { Writable } from "node:stream";
import path from "node:path";
import { Worker } from "node:worker_threads";
import type { ProcedureDefinition } from "@/domain/procedures";
import { describeProcedureWindows } from "@/domain/procedures";
import { REGISTER_COLUMNS, columnHeader, columnNumberFormat, type FilterLine, type RegisterRow } from "@/domain/register";
import type { UnitSystem } from "@/domain/units";
import { formatCount, formatInstant } from "@/components/ui/display-format";

/** Excel's rows per sheet (1,048,576) less the header row. */
export const XLSX_MAX_ROWS = 1_048_575;

export class ExportCancelledError extends Error {
  constructor() {
    super("The download was cancelled before the export finished.");
    this.name = "ExportCancelledError";
  }
}

export type ExportProcedure = { id: number; code: string; name: string; versionNo: number; definition: ProcedureDefinition };

export type ExportMeta = {
  exportedBy: { name: string; email: string };
  exportedAt: Date;
  system: UnitSystem;
  /** The organisation's IANA zone: the local-time column and the about sheet's times. */
  timeZone: string;
  filterLines: FilterLine[];
  sortText: string;
  /** Loads the procedure versions the exported joints were checked against (second sheet). */
  loadProcedures: (versionIds: number[]) => Promise<ExportProcedure[]>;
};

/** Resolves once the stream's reader has caught up (or at once); rejects if the reader went away. */
function readerCaughtUp(out: Writable): Promise<void> {
  if (out.destroyed) return Promise.reject(new ExportCancelledError());
  if (!out.writableNeedDrain) return Promise.resolve();
  return new Promise((resolve, reject) => {
    const cleanup = () => {
      out.off("drain", onDrain);
      out.off("close", onGone);
      out.off("error", onGone);
    };
    const onDrain = () => {
      cleanup();
      resolve();
    };
    const onGone = () => {
      cleanup();
      reject(new ExportCancelledError());
    };
    out.on("drain", onDrain);
    out.on("close", onGone);
    out.on("error", onGone);
  });
}

export type Cell = string | number | Date | null;

/**
 * Rows turned into cells on the request thread between two looks at other work: a batch of
 * 1,000 is made in slices of this many, with a turn of the event loop between slices, so
 * other people's requests wait for a slice (a few ms), not for a whole batch.
 */
const CELLS_SLICE = 250;
const otherRequestsFirst = () => new Promise<void>((resolve) => setImmediate(resolve));
export type WriterColumn = { header: string; key: string; width: number; numFmt?: string };
type AboutLine = { values: Cell[]; bold?: boolean; numFmt?: { column: number; format: string } };
type FromWorker = { type: "chunk"; data: Uint8Array } | { type: "written"; rows: number } | { type: "done" } | { type: "error"; message: string };

/**
 * The worker file, found at run time from the app's directory rather than through the
 * bundler, so `next start`, `next dev` and vitest all load the same plain module.
 */
function workerFile(): string {
  return path.join(process.cwd(), "app", "_server", "register", "sheet-writer.worker.mjs");
}

/** Worker threads writing an export now (the tests check none is left behind). */
export const runningWriterThreads = new Set<Worker>();

/**
 * Runs the file writer (sheet-writer.worker.mjs) in a worker thread: posts one batch of
 * cell values at a time, writes the bytes it sends back into `out`, and waits for both the
 * worker and the HTTP reader before the next batch. If the reader goes away, the worker
 * is stopped at once and the call rejects with ExportCancelledError.
 */
/**
 * Heap limits of the writer thread: it holds one batch of cells and exceljs's small state,
 * so a small heap is collected often and the server's memory stays flat during a long
 * export (without them V8 let the thread's heap grow by a few hundred MB over 100,000 rows).
 */
const WRITER_HEAP = { maxOldGenerationSizeMb: 64, maxYoungGenerationSizeMb: 8 };

function startWriterThread(out: Writable, data: { format: "xlsx" | "csv"; columns: WriterColumn[]; creator?: string; created?: Date }, progress?: { rows: number }) {
  const worker = new Worker(workerFile(), { workerData: data, resourceLimits: WRITER_HEAP });
  runningWriterThreads.add(worker);
  let waiting: { resolve: () => void; reject: (e: Error) => void; until: "written" | "done" } | null = null;
  let failure: Error | null = null;
  let finished = false;
  const fail = (error: Error) => {
    if (failure) return;
    failure = error;
    void worker.terminate();
    waiting?.reject(error);
    waiting = null;
  };
  const onGone = () => {
    if (!finished) fail(new ExportCancelledError());
  };
  out.on("close", onGone);
  worker.on("message", (message: FromWorker) => {
    if (message.type === "chunk") {
      if (!out.destroyed) out.write(Buffer.from(message.data.buffer, message.data.byteOffset, message.data.byteLength));
    } else if (message.type === "error") {
      fail(new Error(`export writer: ${message.message}`));
    } else {
      // Rows the worker has written into the file (not merely handed to it): the clerk's progress.
      if (message.type === "written" && progress) progress.rows += message.rows;
      if (waiting && waiting.until === message.type) {
        const w = waiting;
        waiting = null;
        w.resolve();
      }
    }
  });
  worker.on("error", (error) => fail(error));
  worker.on("exit", () => {
    runningWriterThreads.delete(worker);
    if (!finished) fail(failure ?? new Error("export writer stopped"));
  });
  const ask = (message: unknown, until: "written" | "done") =>
    new Promise<void>((resolve, reject) => {
      if (failure) return reject(failure);
      if (out.destroyed) return reject(new ExportCancelledError());
      waiting = { resolve, reject, until };
      worker.postMessage(message);
    });
  // One batch in flight: the worker writes it while this side reads and maps the next.
  let inFlight: Promise<void> = Promise.resolve();
  return {
    async rows(rows: Cell[][]) {
      await inFlight;
      await readerCaughtUp(out);
      inFlight = ask({ type: "rows", rows }, "written");
      inFlight.catch(() => undefined); // surfaces at the next await
    },
    async finish(message: Record<string, unknown>) {
      await inFlight;
      await ask({ type: "finish", ...message }, "done");
      finished = true;
      out.off("close", onGone);
      await worker.terminate();
    },
    /** Stops the worker after a failure on this side (reading the database). */
    async stop() {
      finished = true;
      out.off("close", onGone);
      await worker.terminate();
    },
  };
}

const UNITS_TEXT: Record<UnitSystem, string> = {
  si: "SI: mm, MPa, °C, s (gauge pressures as read on the machine)",
  us: "US customary: in, psi, °F, s (gauge pressures as read on the machine)",
};

/**
 * Streams an .xlsx of the rows: sheet "Joints" (header row with units, typed cells, frozen
 * header, autofilter over the written rows) and sheet "About this export" (who, when,
 * filter, sort, units, row count, and the windows of every procedure version the rows
 * were checked against). Returns the number of joints written.
 */
/**
 * The Joints sheet's columns as the writer gets them: header with units (the export's
 * words), width in characters, and the number format of dates and decimals.
 */
export function xlsxColumns(system: UnitSystem, timeZone: string): WriterColumn[] {
  return REGISTER_COLUMNS.map((c) => {
    const numFmt = columnNumberFormat(c, system);
    const header = columnHeader(c, system, timeZone, "export");
    return { header, key: c.key, width: Math.max(c.width, header.length * 0.6) + 2, ...(numFmt ? { numFmt } : {}) };
  });
}

/** One joint's cells, column by column (domain/register/columns.ts), as both files write them. */
export function exportCells(row: RegisterRow, system: UnitSystem, timeZone: string): Cell[] {
  return REGISTER_COLUMNS.map((c) => c.value(row, system, timeZone));
}

export async function writeRegisterXlsx({ out, batches, meta, maxRows = XLSX_MAX_ROWS, progress }: { out: Writable; batches: AsyncIterable<RegisterRow[]>; meta: ExportMeta; maxRows?: number; progress?: { rows: number } }): Promise<{ rowCount: number; isTruncated: boolean }> {
  const writer = startWriterThread(out, { format: "xlsx", creator: "Beadline", created: meta.exportedAt, columns: xlsxColumns(meta.system, meta.timeZone) }, progress);
  try {
    const versions = new Set<number>();
    let rowCount = 0;
    let isTruncated = false;
    for await (const batch of batches) {
      if (out.destroyed) throw new ExportCancelledError();
      const values: Cell[][] = [];
      for (const row of batch) {
        if (rowCount >= maxRows) {
          isTruncated = true;
          break;
        }
        values.push(exportCells(row, meta.system, meta.timeZone));
        versions.add(row.procedureVersionId);
        rowCount += 1;
        if (values.length % CELLS_SLICE === 0) await otherRequestsFirst();
      }
      await writer.rows(values);
      if (isTruncated) break;
    }

    const about: AboutLine[] = [];
    const add = (values: Cell[], bold = false) => about.push({ values, bold });
    add(["Beadline joint register export"], true);
    add(["Exported by", `${meta.exportedBy.name} <${meta.exportedBy.email}>`]);
    about.push({ values: ["Exported at (UTC)", meta.exportedAt], numFmt: { column: 2, format: "yyyy-mm-dd hh:mm:ss" } });
    add(["Joints in this file", rowCount]);
    add(["Units", UNITS_TEXT[meta.system]]);
    add(["Exported at (local time)", formatInstant(meta.exportedAt, "second", meta.timeZone)]);
    add(["Time zone", meta.timeZone]);
    add(["Times", `"Made at (${meta.timeZone})" is the local time in the organisation's time zone with its offset from UTC; "Made at (UTC)" is the same instant in UTC. Day filters are local days in ${meta.timeZone}.`]);
    add(["Sort", meta.sortText]);
    if (isTruncated) add(["Note", `Stopped at Excel's limit of ${formatCount(maxRows)} rows: export as CSV for every row of this filter.`], true);
    add([]);
    add(["Filter used"], true);
    if (meta.filterLines.length === 0) add(["(none)", "Every joint in the register"]);
    for (const line of meta.filterLines) add([line.label, line.value]);
    add([]);
    add(["Procedure windows of the exported joints"], true);
    const procedures = await meta.loadProcedures([...versions].sort((a, b) => a - b));
    if (procedures.length === 0) add(["(no joints exported)"]);
    for (const p of procedures) {
      add([]);
      add([`${p.code} version ${p.versionNo}`, p.name, p.definition.label], true);
      add(["Parameter", "Window", "Source", "Status"], true);
      for (const w of describeProcedureWindows(p.definition, meta.system)) {
        add([w.label, w.details.length ? `${w.value} (${w.details.join("; ")})` : w.value, w.source, w.statusText]);
      }
    }
    await writer.finish({ autoFilterRows: rowCount, about });
    if (!out.writableEnded) out.end();
    return { rowCount, isTruncated };
  } catch (error) {
    await writer.stop();
    throw error;
  }
}

export { csvCell } from "./csv-cells.mjs";

/**
 * Streams CSV (UTF-8 with a byte-order mark so spreadsheets read °C right, CRLF line ends
 * per RFC 4180): a header row with units, then one line per joint; the local time with its
 * offset in the organisation's zone, and the UTC instant as ISO 8601 ("…Z").
 */
export async function writeRegisterCsv({ out, batches, system, timeZone, progress }: { out: Writable; batches: AsyncIterable<RegisterRow[]>; system: UnitSystem; timeZone: string; progress?: { rows: number } }): Promise<{ rowCount: number }> {
  const columns = REGISTER_COLUMNS;
  const writer = startWriterThread(out, { format: "csv", columns: columns.map((c) => ({ header: columnHeader(c, system, timeZone, "export"), key: c.key, width: c.width })) }, progress);
  try {
    let rowCount = 0;
    for await (const batch of batches) {
      if (out.destroyed) throw new ExportCancelledError();
      const values: Cell[][] = [];
      for (const row of batch) {
        values.push(exportCells(row, system, timeZone));
        if (values.length % CELLS_SLICE === 0) await otherRequestsFirst();
      }
      await writer.rows(values);
      rowCount += batch.length;
    }
    await writer.finish({});
    await new Promise<void>((resolve, reject) => {
      out.end((error?: Error | null) => (error ? reject(error) : resolve()));
    });
    return { rowCount };
  } catch (error) {
    await writer.stop();
    throw error;
  }
}
