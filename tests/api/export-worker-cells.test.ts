// The export written in the worker thread holds the same rows and cells as the export
// written on the request thread before it: the reference here is exceljs's streaming
// WorkbookWriter called directly in the test (as the pre-worker export did), fed the rows
// the register API pages out for the same filter and sort, cell by cell from the column
// definitions (domain/register/columns.ts). Both files are read back with exceljs's own
// reader (the external reference) and compared cell by cell: value, type (dates stay date
// cells, numbers stay numbers) and number format. The CSV of the same view parses back,
// with fast-csv's RFC 4180 parser, to the same cells as text, a line break inside a
// quoted field included (RFC 4180 §2.6).
import { PassThrough } from "node:stream";
import ExcelJS from "exceljs";
import { parseString } from "@fast-csv/parse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as exportGet } from "@/app/api/v1/exports/register/route";
import { GET as registerGet } from "@/app/api/v1/register/route";
import { closeDb } from "@/database/client";
import { REGISTER_COLUMNS, columnHeader, columnNumberFormat, registerRowFromJson, type RegisterRow, type RegisterRowJson } from "@/domain/register";
import type { UnitSystem } from "@/domain/units";
import { buildRegisterJoints } from "@/fixtures/register-joints";
import { ownerDb, resetDatabase } from "../support/db";
import { requestAs } from "../support/session";
import { makeUser } from "../support/users";

const noParams = { params: Promise.resolve({}) };
/** More than one of the export's 1,000-row batches, so batch boundaries are crossed. */
const JOINTS = 2_300;
const MULTI_LINE_STATION = 'Sta. 4+10,\n"east" verge';
const people: Partial<Record<UnitSystem, { id: number }>> = {};

/** Every row of a view through the register API's JSON pages (cursor by cursor), as the grid gets them. */
async function apiRows(person: { id: number }, query: string): Promise<{ rows: RegisterRow[]; timeZone: string }> {
  const rows: RegisterRow[] = [];
  let after: string | null = null;
  let timeZone = "";
  do {
    const url: string = `/api/v1/register?${query}&limit=500${after ? `&after=${after}` : ""}`;
    const res = await registerGet(await requestAs(person, url), noParams);
    if (res.status !== 200) throw new Error(`${url} answered ${res.status}: ${await res.text()}`);
    const body = (await res.json()) as { rows: RegisterRowJson[]; next: string | null; timeZone: string };
    rows.push(...body.rows.map(registerRowFromJson));
    after = body.next;
    timeZone = body.timeZone;
  } while (after);
  return { rows, timeZone };
}

/** The reference file: exceljs's streaming writer in this thread, one row per joint, cells from the column definitions. */
async function referenceXlsx(rows: RegisterRow[], system: UnitSystem, timeZone: string): Promise<Buffer> {
  const sink = new PassThrough();
  const chunks: Buffer[] = [];
  sink.on("data", (c: Buffer) => chunks.push(c));
  const book = new ExcelJS.stream.xlsx.WorkbookWriter({ stream: sink, useStyles: true, useSharedStrings: false });
  const sheet = book.addWorksheet("Joints");
  sheet.columns = REGISTER_COLUMNS.map((c) => {
    const numFmt = columnNumberFormat(c, system);
    return { header: columnHeader(c, system, timeZone, "export"), key: c.key, width: c.width, ...(numFmt ? { style: { numFmt } } : {}) };
  });
  for (const row of rows) sheet.addRow(REGISTER_COLUMNS.map((c) => c.value(row, system, timeZone))).commit();
  sheet.commit();
  await book.commit();
  return Buffer.concat(chunks);
}

async function jointsSheet(buffer: Buffer): Promise<ExcelJS.Worksheet> {
  const book = new ExcelJS.Workbook();
  await book.xlsx.load(buffer as unknown as ArrayBuffer);
  const sheet = book.getWorksheet("Joints");
  if (!sheet) throw new Error("no Joints sheet");
  return sheet;
}

/** A cell as exceljs reads it: its value with its kind, and its number format. */
function cellOf(sheet: ExcelJS.Worksheet, r: number, c: number): { value: unknown; kind: string; numFmt: string | undefined } {
  const cell = sheet.getRow(r).getCell(c);
  const value = cell.value instanceof Date ? cell.value.toISOString() : cell.value;
  return { value, kind: cell.value instanceof Date ? "date" : cell.value === null ? "empty" : typeof cell.value, numFmt: cell.numFmt || undefined };
}

describe("register export in the worker thread against exceljs's writer alone", () => {
  beforeAll(async () => {
    await resetDatabase();
    await buildRegisterJoints(ownerDb(), { count: JOINTS, seed: 57 });
    const target = await ownerDb()("joints").orderBy("id").first("id");
    await ownerDb()("joints").where({ id: target.id }).update({ station: MULTI_LINE_STATION });
    people.si = await makeUser({ roles: ["clerk"], unitSystem: "si" });
    people.us = await makeUser({ roles: ["inspector"], unitSystem: "us" });
  }, 300_000);

  afterAll(async () => {
    await closeDb();
  });

  it.each(["si", "us"] as const)("writes the same rows and cells as exceljs alone (%s units), in the API's order", async (system) => {
    const person = people[system]!;
    const query = "sort=heaterTemperature&dir=desc";
    const { rows, timeZone } = await apiRows(person, query);
    expect(rows).toHaveLength(JOINTS);

    const res = await exportGet(await requestAs(person, `/api/v1/exports/register?format=xlsx&${query}`), noParams);
    expect(res.status).toBe(200);
    const worker = await jointsSheet(Buffer.from(await res.arrayBuffer()));
    const reference = await jointsSheet(await referenceXlsx(rows, system, timeZone));

    expect(worker.rowCount).toBe(JOINTS + 1);
    expect(reference.rowCount).toBe(JOINTS + 1);
    expect(worker.columnCount).toBe(REGISTER_COLUMNS.length);
    const differences: string[] = [];
    for (let r = 1; r <= JOINTS + 1; r += 1) {
      for (let c = 1; c <= REGISTER_COLUMNS.length; c += 1) {
        const got = cellOf(worker, r, c);
        const want = cellOf(reference, r, c);
        if (got.value !== want.value || got.kind !== want.kind || got.numFmt !== want.numFmt) differences.push(`row ${r} ${REGISTER_COLUMNS[c - 1].key}: ${JSON.stringify(got)} ≠ ${JSON.stringify(want)}`);
      }
    }
    expect(differences.slice(0, 10)).toEqual([]);
    // Typed cells survive the thread hop: the UTC column is a date cell with a date format, the decimals are numbers.
    const madeAt = REGISTER_COLUMNS.findIndex((c) => c.key === "madeAt") + 1;
    expect(cellOf(worker, 2, madeAt)).toMatchObject({ kind: "date", value: rows[0].madeAt.toISOString() });
    expect(cellOf(worker, 2, madeAt).numFmt).toMatch(/yy/);
    const heater = REGISTER_COLUMNS.findIndex((c) => c.key === "heaterTemperature") + 1;
    expect(rows.slice(0, 50).some((row, i) => row.heaterTemperatureC !== null && cellOf(worker, i + 2, heater).kind === "number")).toBe(true);
  }, 120_000);

  it("writes CSV that an RFC 4180 parser reads back to the same cells, a line break inside a quoted field included", async () => {
    const person = people.si!;
    const { rows, timeZone } = await apiRows(person, "sort=madeAt&dir=desc");
    const res = await exportGet(await requestAs(person, "/api/v1/exports/register?format=csv"), noParams);
    expect(res.status).toBe(200);
    const text = (await res.text()).replace(/^\uFEFF/, "");
    const records = await new Promise<string[][]>((resolve, reject) => {
      const out: string[][] = [];
      parseString(text, { headers: false })
        .on("data", (r: string[]) => out.push(r))
        .on("end", () => resolve(out))
        .on("error", reject);
    });
    expect(records).toHaveLength(JOINTS + 1);
    expect(records[0]).toEqual(REGISTER_COLUMNS.map((c) => columnHeader(c, "si", timeZone, "export")));
    const station = REGISTER_COLUMNS.findIndex((c) => c.key === "station");
    expect(records.slice(1).filter((r) => r[station] === MULTI_LINE_STATION)).toHaveLength(1);
    const differences: string[] = [];
    rows.forEach((row, i) => {
      REGISTER_COLUMNS.forEach((c, n) => {
        const want = c.value(row, "si", timeZone);
        const got = records[i + 1][n];
        // A text that a spreadsheet would take for a formula is written with a leading apostrophe (OWASP "CSV injection").
        const text = typeof want === "string" && /^[=+\-@\t\r]/.test(want) ? `'${want}` : want;
        const same = want === null ? got === "" : want instanceof Date ? got === want.toISOString() : typeof want === "number" ? Number(got) === want : got === text;
        if (!same) differences.push(`row ${i + 2} ${c.key}: ${JSON.stringify(got)} ≠ ${JSON.stringify(want)}`);
      });
    });
    expect(differences.slice(0, 10)).toEqual([]);
  }, 120_000);
});
