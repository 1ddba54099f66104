// The Targets table of issue #18, row by row, and the bench's closing summary: each row
// with its target and the value measured in this run, pass or miss. Figures of the bench's
// table name their row in `targetRow`; a row passes when it has figures and every one of
// them with a verdict passes. A row no figure reached (a step failed or was skipped) is a
// miss, "not measured".
import type { BenchFigure } from "./context";

export const TARGET_ROWS = {
  sessionShare: { row: "signed-in API floor, share of bare route throughput", target: "≥ 60 %" },
  registerShare: { row: "register API, share of bare route throughput", target: "≥ 40 %" },
  pages: { row: "Register page and joint page (HTML), 10 connections", target: "≥ 150 req/s" },
  registerP95: { row: "register API p95 over HTTP (1 M joints, 12 views, first and deep pages)", target: "≤ 15 ms" },
  submissions: { row: "submissions, 50 clients over 20 jobs", target: "≥ 250/s, p99 < 300 ms, 0 errors, stored = acknowledged" },
  mixedLoad: { row: "mixed load, 50 clients", target: "≥ 150 req/s, p99 < 1 s" },
  xlsxRatio: { row: "XLSX vs exceljs alone", target: "≤ 1.2×" },
  registerDuringExport: { row: "register p95 for other users during a 100,000-row export", target: "< 2× its idle value" },
  wholeCount: { row: "whole-register count", target: 'exact, or "about" until exact' },
} as const;

export type TargetKey = keyof typeof TARGET_ROWS;
export type TargetLine = { row: string; target: string; measured: string; pass: boolean; figures: number };

const valueText = (f: BenchFigure) => `${f.value}${f.unit ? ` ${f.unit}` : ""}`;

/** How a row with many figures reads: the register p95 row as a range and a tally, the others figure by figure. */
function measuredText(key: TargetKey, figures: BenchFigure[]): string {
  if (key === "registerP95") {
    const values = figures.map((f) => Number(f.value)).filter(Number.isFinite);
    const within = figures.filter((f) => f.pass === true).length;
    return `p95 ${Math.min(...values)}–${Math.max(...values)} ms; ${within} of ${figures.length} pages within`;
  }
  return figures.map((f) => `${f.figure}: ${valueText(f)}${f.pass === false ? " (miss)" : ""}`).join("; ");
}

export function summariseTargets(figures: BenchFigure[]): TargetLine[] {
  return (Object.keys(TARGET_ROWS) as TargetKey[]).map((key) => {
    const { row, target } = TARGET_ROWS[key];
    const mine = figures.filter((f) => f.targetRow === row);
    if (!mine.length) return { row, target, measured: "not measured (step failed or skipped)", pass: false, figures: 0 };
    const judged = mine.filter((f) => f.pass !== null);
    return { row, target, measured: measuredText(key, mine), pass: judged.length > 0 && judged.every((f) => f.pass === true), figures: mine.length };
  });
}

/** The closing "targets" section: one line per row of the issue's table. */
export function formatTargets(lines: TargetLine[]): string {
  const width = Math.max(...lines.map((l) => l.row.length));
  const out = ["", "targets (issue #18) — one line per row of its Targets table", "-".repeat(width + 40)];
  for (const l of lines) out.push(`${l.pass ? "pass" : "MISS"}  ${l.row.padEnd(width)}  target ${l.target}  measured ${l.measured}`);
  out.push(`${lines.filter((l) => l.pass).length} of ${lines.length} targets met`);
  return out.join("\n");
}
