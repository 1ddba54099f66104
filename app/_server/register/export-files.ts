// Writes Register rows as a spreadsheet (.xlsx, exceljs's streaming WorkbookWriter) or as
// CSV into a Node stream, batch by batch, waiting for the reader between batches so the
// file never sits whole in memory. The columns, headers (with units) and cell values are
// the grid's (domain/register/columns.ts).
import "server-only";
import type { Writable } from "node:stream";
import ExcelJS from "exceljs";
import type { ProcedureDefinition } from "@/domain/procedures";
import { describeProcedureWindows } from "@/domain/procedures";
import { REGISTER_COLUMNS, columnHeader, columnNumberFormat, type FilterLine, type RegisterColumn, type RegisterRow } from "@/domain/register";
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

/**
 * exceljs merges row and column styles into a new object for every cell, so its own
 * style-id cache (keyed by object identity) never hits and each cell re-renders its style
 * XML — about two thirds of the writing time at 35 columns. Our cells carry at most a
 * number format, so the id is cached by format and cell type. Falls back to exceljs's own
 * lookup for any other style (bold header, fonts) and if the internals ever change shape.
 */
function cacheNumberFormatStyles(workbook: ExcelJS.stream.xlsx.WorkbookWriter): void {
  const styles = (workbook as unknown as { styles?: { addStyleModel?: (model: unknown, cellType?: unknown) => number } }).styles;
  if (!styles || typeof styles.addStyleModel !== "function") return;
  const original = styles.addStyleModel.bind(styles);
  const cache = new Map<string, number>();
  styles.addStyleModel = (model: unknown, cellType?: unknown) => {
    if (!model || typeof model !== "object") return original(model, cellType);
    const keys = Object.keys(model);
    if (keys.length > 1 || (keys.length === 1 && keys[0] !== "numFmt")) return original(model, cellType);
    const key = `${(model as { numFmt?: string }).numFmt ?? ""}|${String(cellType)}`;
    let id = cache.get(key);
    if (id === undefined) {
      id = original(model, cellType);
      cache.set(key, id);
    }
    return id;
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
export async function writeRegisterXlsx({ out, batches, meta, maxRows = XLSX_MAX_ROWS, progress }: { out: Writable; batches: AsyncIterable<RegisterRow[]>; meta: ExportMeta; maxRows?: number; progress?: { rows: number } }): Promise<{ rowCount: number; isTruncated: boolean }> {
  const columns: readonly RegisterColumn[] = REGISTER_COLUMNS;
  const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: out, useStyles: true, useSharedStrings: false });
  cacheNumberFormatStyles(workbook);
  workbook.creator = "Beadline";
  workbook.created = meta.exportedAt;

  const sheet = workbook.addWorksheet("Joints", { views: [{ state: "frozen", ySplit: 1 }] });
  sheet.columns = columns.map((c) => {
    const numFmt = columnNumberFormat(c, meta.system);
    const header = columnHeader(c, meta.system, meta.timeZone, "export");
    return { header, key: c.key, width: Math.max(c.width, header.length * 0.6) + 2, ...(numFmt ? { style: { numFmt } } : {}) };
  });
  sheet.getRow(1).font = { bold: true };
  sheet.getRow(1).commit();

  const versions = new Set<number>();
  let rowCount = 0;
  let isTruncated = false;
  for await (const batch of batches) {
    if (out.destroyed) throw new ExportCancelledError();
    for (const row of batch) {
      if (rowCount >= maxRows) {
        isTruncated = true;
        break;
      }
      sheet.addRow(columns.map((c) => c.value(row, meta.system, meta.timeZone))).commit();
      versions.add(row.procedureVersionId);
      rowCount += 1;
    }
    if (progress) progress.rows = rowCount;
    if (isTruncated) break;
    await readerCaughtUp(out);
  }
  sheet.autoFilter = { from: { row: 1, column: 1 }, to: { row: rowCount + 1, column: columns.length } };
  sheet.commit();

  const about = workbook.addWorksheet("About this export");
  about.columns = [
    { key: "a", width: 34 },
    { key: "b", width: 48 },
    { key: "c", width: 70 },
    { key: "d", width: 28 },
  ];
  const add = (values: (string | number | Date | null)[], bold = false) => {
    const r = about.addRow(values);
    if (bold) r.font = { bold: true };
    r.commit();
  };
  add(["Beadline joint register export"], true);
  add(["Exported by", `${meta.exportedBy.name} <${meta.exportedBy.email}>`]);
  const when = about.addRow(["Exported at (UTC)", meta.exportedAt]);
  when.getCell(2).numFmt = "yyyy-mm-dd hh:mm:ss";
  when.commit();
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
  about.commit();
  await workbook.commit();
  return { rowCount, isTruncated };
}

/** RFC 4180 field: quoted when it holds a comma, quote, line break or edge spaces. */
function csvField(value: string): string {
  return /[",\r\n]|^\s|\s$/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/**
 * A text cell that a spreadsheet would read as a formula (=, +, -, @, tab, CR) gets a
 * leading apostrophe (OWASP "CSV injection" advice); numbers stay numbers.
 */
function safeText(value: string): string {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

export function csvCell(value: string | number | Date | null): string {
  if (value === null || value === undefined) return "";
  if (value instanceof Date) return value.toISOString();
  if (typeof value === "number") return Number.isFinite(value) ? String(value) : "";
  return csvField(safeText(value));
}

/**
 * Streams CSV (UTF-8 with a byte-order mark so spreadsheets read °C right, CRLF line ends
 * per RFC 4180): a header row with units, then one line per joint; the local time with its
 * offset in the organisation's zone, and the UTC instant as ISO 8601 ("…Z").
 */
export async function writeRegisterCsv({ out, batches, system, timeZone, progress }: { out: Writable; batches: AsyncIterable<RegisterRow[]>; system: UnitSystem; timeZone: string; progress?: { rows: number } }): Promise<{ rowCount: number }> {
  const columns = REGISTER_COLUMNS;
  out.write("\uFEFF" + columns.map((c) => csvField(columnHeader(c, system, timeZone, "export"))).join(",") + "\r\n");
  let rowCount = 0;
  for await (const batch of batches) {
    if (out.destroyed) throw new ExportCancelledError();
    let chunk = "";
    for (const row of batch) {
      chunk += columns.map((c) => csvCell(c.value(row, system, timeZone))).join(",") + "\r\n";
      rowCount += 1;
    }
    out.write(chunk);
    if (progress) progress.rows = rowCount;
    await readerCaughtUp(out);
  }
  await new Promise<void>((resolve, reject) => {
    out.end((error?: Error | null) => (error ? reject(error) : resolve()));
  });
  return { rowCount };
}
