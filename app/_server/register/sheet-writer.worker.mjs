// The Register export's file writer, run in a worker thread (node:worker_threads) so the
// XML and CSV text of a large export is made off the server's request thread. The main
// thread reads rows from the database in keyset batches, turns each row into plain cell
// values (domain/register/columns.ts) and posts one batch at a time; this thread writes
// them and posts the file's bytes back as they come. It holds one batch at a time, so
// memory stays flat however many rows the export has.
//
// Plain JavaScript loaded as a file at run time (export-files.ts), not through the
// bundler: the same file runs under `next start`, `next dev` and vitest.
//
// workerData: { format: "xlsx" | "csv", columns: [{ header, key, width, numFmt? }], creator, created }
// in:  { type: "rows", rows: (string|number|Date|null)[][] }   → out: { type: "written", rows }
//      { type: "finish", autoFilterRows, about: [{ values, bold?, numFmt? }] } (xlsx) | { type: "finish" } (csv)
//                                                                → out: { type: "done" }
// out: { type: "chunk", data: Uint8Array } as the file is written; { type: "error", message } on failure.
import { parentPort, workerData } from "node:worker_threads";
import { readlinkSync } from "node:fs";
import os from "node:os";
import { Writable } from "node:stream";
import ExcelJS from "exceljs";
import { csvCell, csvField } from "./csv-cells.mjs";

const { format, columns } = workerData;

/**
 * This thread runs at a lower scheduling priority (nice 10) than the server's request
 * thread: when both cores are busy, other people's requests go first and the export takes
 * the time left over. Linux applies setpriority(2) to one thread when given its thread id
 * (/proc/thread-self names it); elsewhere, or without the right, the thread keeps the
 * process's priority.
 */
function lowerPriority() {
  try {
    const tid = Number(readlinkSync("/proc/thread-self").split("/").pop());
    if (Number.isInteger(tid) && tid > 0 && tid !== process.pid) os.setPriority(tid, Math.max(os.getPriority(tid), 10));
  } catch {
    /* not Linux, or not allowed: same priority as the request thread */
  }
}
lowerPriority();

/** Bytes gathered before a chunk is posted (fewer, larger messages). */
const CHUNK_BYTES = 256 * 1024;
let pending = [];
let pendingBytes = 0;
function flush() {
  if (pendingBytes === 0) return;
  const data = pending.length === 1 ? pending[0] : Buffer.concat(pending, pendingBytes);
  pending = [];
  pendingBytes = 0;
  const copy = new Uint8Array(data.byteLength);
  copy.set(data);
  parentPort.postMessage({ type: "chunk", data: copy }, [copy.buffer]);
}
function push(buffer) {
  pending.push(buffer);
  pendingBytes += buffer.byteLength;
  if (pendingBytes >= CHUNK_BYTES) flush();
}

const sink = new Writable({
  highWaterMark: CHUNK_BYTES,
  write(chunk, _encoding, callback) {
    push(Buffer.isBuffer(chunk) ? chunk : Buffer.from(chunk));
    callback();
  },
  final(callback) {
    flush();
    callback();
  },
});

/**
 * exceljs merges row and column styles into a new object for every cell, so its own
 * style-id cache (keyed by object identity) never hits and each cell re-renders its style
 * XML. Our cells carry at most a number format, so the id is cached by format and cell
 * type. Falls back to exceljs's own lookup for any other style and if the internals change.
 */
function cacheNumberFormatStyles(workbook) {
  const styles = workbook.styles;
  if (!styles || typeof styles.addStyleModel !== "function") return;
  const original = styles.addStyleModel.bind(styles);
  const cache = new Map();
  styles.addStyleModel = (model, cellType) => {
    if (!model || typeof model !== "object") return original(model, cellType);
    const keys = Object.keys(model);
    if (keys.length > 1 || (keys.length === 1 && keys[0] !== "numFmt")) return original(model, cellType);
    const key = `${model.numFmt ?? ""}|${String(cellType)}`;
    let id = cache.get(key);
    if (id === undefined) {
      id = original(model, cellType);
      cache.set(key, id);
    }
    return id;
  };
}

/**
 * Waits until the zip has taken in the sheet's XML written so far. exceljs's sheet stream
 * writes into the zip entry without waiting for it (exceljs issue #2916), so without this
 * the XML of rows the deflater has not reached piles up in memory (about 2 kB a row:
 * hundreds of MB over 100,000 rows). The entry is a stream that feeds the deflater; its
 * "drain" says it has room again. If exceljs's internals differ (no such stream), it does
 * not wait.
 */
function zipCaughtUp(sheet) {
  // archiver's entry is a readable-stream (v2) PassThrough: no public writableNeedDrain, its state says it.
  const entry = sheet?._stream?.pipes?.[0];
  const needsDrain = entry?.writableNeedDrain ?? entry?._writableState?.needDrain;
  if (!entry || typeof entry.once !== "function" || !needsDrain) return Promise.resolve();
  return new Promise((resolve) => {
    const done = () => {
      entry.off("drain", done);
      entry.off("close", done);
      entry.off("error", done);
      resolve();
    };
    entry.on("drain", done);
    entry.on("close", done);
    entry.on("error", done);
  });
}

function startXlsx() {
  // Shared strings off (each text written in place, no table held in memory); styles on
  // only for the number formats (dates, decimals), served from the cache above.
  const workbook = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: sink, useStyles: true, useSharedStrings: false });
  cacheNumberFormatStyles(workbook);
  workbook.creator = workerData.creator;
  workbook.created = workerData.created;
  const sheet = workbook.addWorksheet("Joints", { views: [{ state: "frozen", ySplit: 1 }] });
  sheet.columns = columns.map((c) => ({ header: c.header, key: c.key, width: c.width, ...(c.numFmt ? { style: { numFmt: c.numFmt } } : {}) }));
  sheet.getRow(1).font = { bold: true };
  sheet.getRow(1).commit();
  return {
    async rows(rows) {
      for (const values of rows) sheet.addRow(values).commit();
      await zipCaughtUp(sheet);
    },
    async finish({ autoFilterRows, about }) {
      sheet.autoFilter = { from: { row: 1, column: 1 }, to: { row: autoFilterRows + 1, column: columns.length } };
      sheet.commit();
      const aboutSheet = workbook.addWorksheet("About this export");
      aboutSheet.columns = [
        { key: "a", width: 34 },
        { key: "b", width: 48 },
        { key: "c", width: 70 },
        { key: "d", width: 28 },
      ];
      for (const line of about) {
        const r = aboutSheet.addRow(line.values);
        if (line.bold) r.font = { bold: true };
        if (line.numFmt) r.getCell(line.numFmt.column).numFmt = line.numFmt.format;
        r.commit();
      }
      aboutSheet.commit();
      await workbook.commit();
    },
  };
}

function startCsv() {
  push(Buffer.from("\uFEFF" + columns.map((c) => csvField(c.header)).join(",") + "\r\n"));
  return {
    rows(rows) {
      let chunk = "";
      for (const values of rows) chunk += values.map(csvCell).join(",") + "\r\n";
      push(Buffer.from(chunk));
    },
    async finish() {
      await new Promise((resolve, reject) => sink.end((error) => (error ? reject(error) : resolve())));
    },
  };
}

const writer = format === "xlsx" ? startXlsx() : startCsv();

parentPort.on("message", async (message) => {
  try {
    if (message.type === "rows") {
      await writer.rows(message.rows);
      flush();
      parentPort.postMessage({ type: "written", rows: message.rows.length });
    } else if (message.type === "finish") {
      await writer.finish(message);
      flush();
      parentPort.postMessage({ type: "done" });
    }
  } catch (error) {
    parentPort.postMessage({ type: "error", message: error instanceof Error ? error.message : String(error) });
  }
});
