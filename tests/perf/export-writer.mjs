// The Register export's writer thread (app/_server/register/sheet-writer.worker.mjs) against
// exceljs's streaming writer alone, on the same synthetic 35-column rows (not part of
// npm test): `node tests/perf/export-writer.mjs [rows]` from the repository root.
import { Worker } from "node:worker_threads";
import { Writable } from "node:stream";
import path from "node:path";
import ExcelJS from "exceljs";
const N = Number(process.argv[2] ?? 20000), COLS = 35;
const columns = Array.from({ length: COLS }, (_, i) => ({ header: `Column ${i}`, key: `c${i}`, width: 12, ...(i % 5 === 1 ? { numFmt: "0.0" } : i % 5 === 2 ? { numFmt: "yyyy-mm-dd hh:mm" } : {}) }));
const row = (r) => columns.map((c, i) => (i % 5 === 1 ? r * 0.1 + i : i % 5 === 2 ? new Date(1.7e12 + r * 60000) : i % 5 === 3 ? r + i : `text ${r}-${i}`));
const batches = []; for (let s = 0; s < N; s += 1000) batches.push(Array.from({ length: Math.min(1000, N - s) }, (_, k) => row(s + k)));
const nul = () => { let n = 0; const w = new Writable({ write(c, e, cb) { n += c.length; cb(); } }); w.bytes = () => n; return w; };
async function alone() {
  const out = nul(); const t = performance.now();
  const wb = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: out, useStyles: true, useSharedStrings: false });
  const sh = wb.addWorksheet("Joints"); sh.columns = columns.map((c) => ({ header: c.header, key: c.key, width: c.width, ...(c.numFmt ? { style: { numFmt: c.numFmt } } : {}) }));
  for (const b of batches) for (const v of b) sh.addRow(v).commit();
  sh.commit(); await wb.commit(); return [performance.now() - t, out.bytes()];
}
async function worker() {
  const t = performance.now(); let bytes = 0;
  const w = new Worker(path.join(process.cwd(), "app/_server/register/sheet-writer.worker.mjs"), { workerData: { format: "xlsx", columns, creator: "x", created: new Date() } });
  let wait; w.on("message", (m) => { if (m.type === "chunk") bytes += m.data.byteLength; else if (m.type === "error") throw new Error(m.message); else wait?.(); });
  const ask = (msg) => new Promise((r) => { wait = r; w.postMessage(msg); });
  for (const b of batches) await ask({ type: "rows", rows: b });
  await ask({ type: "finish", autoFilterRows: N, about: [] }); await w.terminate(); return [performance.now() - t, bytes];
}
const a1 = await alone(); const w1 = await worker(); const a2 = await alone(); const w2 = await worker();
console.log({ N, aloneMs: [a1[0], a2[0]].map(Math.round), workerMs: [w1[0], w2[0]].map(Math.round), bytes: [a1[1], w1[1]], ratio: (Math.min(w1[0], w2[0]) / Math.min(a1[0], a2[0])).toFixed(2) });
