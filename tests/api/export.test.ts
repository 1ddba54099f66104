// Register export and the Register API through their route handlers, with real sealed
// sessions: role checks, bad input, and the files themselves read back with general
// libraries (exceljs for the workbook, fast-csv for the CSV) against the filtered rows.
import ExcelJS from "exceljs";
import { parseString } from "@fast-csv/parse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as exportGet } from "@/app/api/v1/exports/register/route";
import { GET as registerGet } from "@/app/api/v1/register/route";
import { closeDb } from "@/database/client";
import { iterateRegisterRows } from "@/database/queries/register";
import { REGISTER_COLUMNS, columnHeader, type RegisterFilter, type RegisterRow } from "@/domain/register";
import { buildRegisterJoints, type RegisterFixture } from "@/fixtures/register-joints";
import { moveJointMadeAt, ownerDb, resetDatabase, setOrganisationZoneRow } from "../support/db";
import { requestAs } from "../support/session";
import { makeUser } from "../support/users";

type Person = { id: number };
let fixture: RegisterFixture;
let clerk: Person;
let inspectorUs: Person;
let admin: Person;
let fuser: Person;
const noParams = { params: Promise.resolve({}) };
const TRICKY_STATION = 'Sta. 12+50, "north" verge';
/** The organisation's zone in these tests (set in beforeAll, as an admin would). */
const ZONE = "America/Chicago";

async function rowsOf(filter: RegisterFilter): Promise<RegisterRow[]> {
  const out: RegisterRow[] = [];
  for await (const batch of iterateRegisterRows({ filter, timeZone: ZONE, sort: "madeAt", dir: "desc" })) out.push(...batch);
  return out;
}

async function waitForExportEnd(id: number): Promise<Record<string, unknown>> {
  for (let i = 0; i < 100; i += 1) {
    const row = await ownerDb()("exports").where({ id }).first();
    if (row && row.status !== "running") return row;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error("export did not finish");
}

describe("register API and export", () => {
  beforeAll(async () => {
    await resetDatabase();
    fixture = await buildRegisterJoints(ownerDb(), { count: 600, seed: 23 });
    // A place text that CSV must quote (comma and quotes), on a joint of fuser 0.
    const target = await ownerDb()("joints").where({ fuser_id: fixture.fuserIds[0] }).orderBy("id").first("id");
    await ownerDb()("joints").where({ id: target.id }).update({ station: TRICKY_STATION });
    await setOrganisationZoneRow(ZONE);
    clerk = await makeUser({ roles: ["clerk"], unitSystem: "si", name: "Clerk Ottilie Brand" });
    inspectorUs = await makeUser({ roles: ["inspector"], unitSystem: "us", name: "Inspector Wen Harrow" });
    admin = await makeUser({ roles: ["admin"] });
    fuser = await makeUser({ roles: ["fuser"] });
  }, 120_000);

  afterAll(async () => {
    await closeDb();
  });

  it("refuses the signed-out (401) and fusers (403) on the register and the export", async () => {
    for (const [handler, url] of [
      [registerGet, "/api/v1/register"],
      [exportGet, "/api/v1/exports/register?format=csv"],
    ] as const) {
      const out = await handler(await requestAs(null, url), noParams);
      expect(out.status).toBe(401);
      const forbidden = await handler(await requestAs(fuser, url), noParams);
      expect(forbidden.status).toBe(403);
      expect(await forbidden.json()).toMatchObject({ error: { code: "forbidden" } });
    }
    expect(await ownerDb()("exports").count({ n: "*" }).first()).toMatchObject({ n: 0 }); // nothing recorded for refused calls
  });

  it("serves clerks, inspectors and admins", async () => {
    for (const person of [clerk, inspectorUs, admin]) {
      const res = await registerGet(await requestAs(person, "/api/v1/register?limit=5&count=1"), noParams);
      expect(res.status).toBe(200);
      const body = (await res.json()) as { rows: unknown[]; next: string | null; count: { value: number; isExact: boolean; isEstimate: boolean } };
      expect(body.rows).toHaveLength(5);
      expect(typeof body.next).toBe("string");
      expect(body.count).toEqual({ value: 600, isExact: true, isEstimate: false, counting: false });
    }
  });

  it("answers bad filters with 422 and a message naming each field", async () => {
    const res = await registerGet(await requestAs(clerk, "/api/v1/register?outcome=maybe&from=2026-13-01&limit=0"), noParams);
    expect(res.status).toBe(422);
    const body = (await res.json()) as { error: { code: string; message: string; fields: Record<string, string[]> } };
    expect(body.error.code).toBe("invalid");
    expect(Object.keys(body.error.fields).sort()).toEqual(["from", "limit", "outcome"]);
    expect(body.error.message).toMatch(/outcome/);
    const cursor = await registerGet(await requestAs(clerk, "/api/v1/register?after=bogus"), noParams);
    expect(cursor.status).toBe(422);
    expect(((await cursor.json()) as { error: { fields: Record<string, string[]> } }).error.fields.after[0]).toMatch(/cursor/);
    const badExport = await exportGet(await requestAs(clerk, "/api/v1/exports/register?format=pdf"), noParams);
    expect(badExport.status).toBe(422);
  });

  it("pages through the API by cursor to exactly the rows of the filter", async () => {
    const filter = { fuser: fixture.fuserIds[1] };
    const expected = (await rowsOf(filter)).map((r) => r.id);
    const ids: number[] = [];
    let after: string | null = null;
    do {
      const q = new URLSearchParams({ fuser: String(filter.fuser), limit: "23", ...(after ? { after } : {}) });
      const res = await registerGet(await requestAs(clerk, `/api/v1/register?${q}`), noParams);
      const body = (await res.json()) as { rows: { id: number; madeAt: string }[]; next: string | null };
      ids.push(...body.rows.map((r) => r.id));
      expect(typeof body.rows[0]?.madeAt).toBe("string");
      after = body.next;
    } while (after);
    expect(ids).toEqual(expected);
  });

  it("exports an .xlsx of exactly the filtered rows: units in the header, typed cells, frozen header, autofilter, the about sheet, audited", async () => {
    const filter: RegisterFilter = { outcome: "out-of-limits" };
    const expected = await rowsOf(filter);
    expect(expected.length).toBeGreaterThan(50);
    const res = await exportGet(await requestAs(inspectorUs, "/api/v1/exports/register?format=xlsx&outcome=out-of-limits"), noParams);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/spreadsheetml/);
    expect(res.headers.get("content-disposition")).toMatch(/attachment; filename="beadline-register-\d{4}-\d{2}-\d{2}\.xlsx"/);
    expect(res.headers.get("x-beadline-row-estimate")).toBe(String(expected.length));
    const exportId = Number(res.headers.get("x-beadline-export-id"));
    const buffer = Buffer.from(await res.arrayBuffer());

    const book = new ExcelJS.Workbook();
    await book.xlsx.load(buffer as unknown as ArrayBuffer);
    const sheet = book.getWorksheet("Joints")!;
    expect(sheet.rowCount).toBe(expected.length + 1);
    const header = (sheet.getRow(1).values as unknown[]).slice(1);
    expect(header).toEqual(REGISTER_COLUMNS.map((c) => columnHeader(c, "us", ZONE)));
    expect(header).toContain("Heater temperature (°F)");
    expect(header).toContain("Fusion gauge pressure (psi)");
    expect(header).toContain("Bead size (in)");
    expect(sheet.views[0]).toMatchObject({ state: "frozen", ySplit: 1 });
    expect(sheet.autoFilter).toBeTruthy();

    const col = (key: string) => REGISTER_COLUMNS.findIndex((c) => c.key === key) + 1;
    for (let i = 0; i < expected.length; i += 1) {
      const row = sheet.getRow(i + 2);
      const want = expected[i];
      expect(row.getCell(col("jointNo")).value).toBe(want.jointNo);
      expect(row.getCell(col("job")).value).toBe(want.jobCode);
      const made = row.getCell(col("madeAt")).value;
      expect(made).toBeInstanceOf(Date); // a date cell, not text
      expect(Math.abs((made as Date).getTime() - want.madeAt.getTime())).toBeLessThan(2);
      expect(row.getCell(col("outcome")).value).toBe("Out of limits");
      const temperature = row.getCell(col("heaterTemperature")).value;
      if (want.heaterTemperatureC === null) expect(temperature).toBeNull();
      else {
        expect(typeof temperature).toBe("number");
        // source: NIST SP 811 (2008) — °F = °C × 9/5 + 32
        expect(temperature as number).toBeCloseTo((want.heaterTemperatureC * 9) / 5 + 32, 1);
      }
      const gauge = row.getCell(col("fusionGauge")).value as number;
      // source: NIST SP 811 (2008) Appendix B.8 — 1 psi = 6.894757 kPa
      expect(gauge).toBeCloseTo((want.fusionGaugePressureMpa as number) / 0.006894757, 0);
      const bead = row.getCell(col("bead")).value as number;
      // source: NIST SP 811 (2008) — 1 in = 25.4 mm exactly
      expect(bead).toBeCloseTo((want.beadMm as number) / 25.4, 3);
    }

    const about = book.getWorksheet("About this export")!;
    const lines = new Map<string, unknown>();
    about.eachRow((r) => lines.set(String(r.getCell(1).value), r.getCell(2).value));
    expect(String(lines.get("Exported by"))).toMatch(/Inspector Wen Harrow <.+@test\.example>/);
    expect(lines.get("Exported at (UTC)")).toBeInstanceOf(Date);
    expect(lines.get("Joints in this file")).toBe(expected.length);
    expect(lines.get("Outcome")).toBe("Out of limits");
    expect(String(lines.get("Units"))).toMatch(/US customary/);
    const versionCodes = [...new Set(expected.map((r) => `${r.procedureCode} version ${r.procedureVersionNo}`))].sort();
    for (const code of versionCodes) expect(lines.has(code), code).toBe(true);
    expect(lines.has("Heater surface temperature")).toBe(true); // the procedures' windows are listed

    const finished = await waitForExportEnd(exportId);
    expect(finished).toMatchObject({ status: "done", row_count: expected.length, format: "xlsx", user_id: inspectorUs.id });
    const audit = await ownerDb()("audit_log").where({ action: "register-exported", entity_id: String(exportId) }).first();
    expect(audit.actor_user_id).toBe(inspectorUs.id);
    expect(JSON.parse(audit.details)).toMatchObject({ format: "xlsx", rowCount: expected.length, filter: { outcome: "out-of-limits", sort: "madeAt", dir: "desc" } });
  });

  it("exports CSV that parses back to the same rows and values (quotes and commas survive)", async () => {
    const filter: RegisterFilter = { fuser: fixture.fuserIds[0] };
    const expected = await rowsOf(filter);
    const res = await exportGet(await requestAs(clerk, `/api/v1/exports/register?format=csv&fuser=${fixture.fuserIds[0]}`), noParams);
    expect(res.status).toBe(200);
    expect(res.headers.get("content-type")).toMatch(/text\/csv/);
    const text = await res.text();
    const records: string[][] = await new Promise((resolve, reject) => {
      const out: string[][] = [];
      parseString(text.replace(/^\uFEFF/, ""), { headers: false })
        .on("data", (r: string[]) => out.push(r))
        .on("error", reject)
        .on("end", () => resolve(out));
    });
    expect(records[0]).toEqual(REGISTER_COLUMNS.map((c) => columnHeader(c, "si", ZONE)));
    expect(records).toHaveLength(expected.length + 1);
    const stationCol = REGISTER_COLUMNS.findIndex((c) => c.key === "station");
    expect(records.slice(1).some((r) => r[stationCol] === TRICKY_STATION)).toBe(true);
    records.slice(1).forEach((record, i) => {
      REGISTER_COLUMNS.forEach((c, n) => {
        const want = c.value(expected[i], "si", ZONE);
        if (want === null) expect(record[n], c.key).toBe("");
        else if (want instanceof Date) expect(new Date(record[n]).getTime(), c.key).toBe(want.getTime());
        else if (typeof want === "number") expect(Number(record[n]), c.key).toBe(want);
        else expect(record[n], c.key).toBe(want);
      });
    });
    const exportId = Number(res.headers.get("x-beadline-export-id"));
    expect(await waitForExportEnd(exportId)).toMatchObject({ status: "done", row_count: expected.length, format: "csv" });
  });

  // America/Chicago, 2026-11-01 (IANA tz database; US DST ends the first Sunday of
  // November at 02:00 local, 15 U.S.C. 260a): the local day runs from 00:00 CDT (−05:00) =
  // 05:00Z to 2026-11-02 00:00 CST (−06:00) = 06:00Z; clocks go back at 07:00Z.
  it("takes the register's day filter as a local day of the organisation's zone, in the API and the export", async () => {
    const start = Date.parse("2026-11-01T05:00:00Z");
    const next = Date.parse("2026-11-02T06:00:00Z");
    const change = Date.parse("2026-11-01T07:00:00Z");
    // Four joints put at chosen instants: 23:59 CDT on 31 October (out), 00:00 CDT (in),
    // 01:30 CST after the change (in), 23:59 CST (in; its UTC day is 2 November).
    const moved = (await ownerDb()("joints").orderBy("id").limit(4).select("id")) as { id: number }[];
    const placed = ["2026-11-01T04:59:00Z", "2026-11-01T05:00:00Z", "2026-11-01T07:30:00Z", "2026-11-02T05:59:00Z"];
    for (const [i, at] of placed.entries()) await moveJointMadeAt(moved[i].id, at);
    const all = await rowsOf({});
    const expected = all.filter((r) => r.madeAt.getTime() >= start && r.madeAt.getTime() < next).map((r) => r.id);
    expect(expected.length).toBeGreaterThan(0);
    const res = await registerGet(await requestAs(clerk, "/api/v1/register?from=2026-11-01&to=2026-11-01&limit=500"), noParams);
    expect(res.status).toBe(200);
    const body = (await res.json()) as { rows: { id: number; madeAt: string }[]; timeZone: string };
    expect(body.timeZone).toBe(ZONE);
    expect(body.rows.map((r) => r.id)).toEqual(expected);
    expect(expected).not.toContain(moved[0].id);
    for (const m of moved.slice(1)) expect(expected).toContain(m.id);
    // A UTC-day filter would take other joints: the fixture has some in the hours that differ.
    const utcDay = all.filter((r) => r.madeAt.getTime() >= Date.parse("2026-11-01T00:00:00Z") && r.madeAt.getTime() < Date.parse("2026-11-02T00:00:00Z")).map((r) => r.id);
    expect(utcDay).not.toEqual(expected);

    const csv = await exportGet(await requestAs(clerk, "/api/v1/exports/register?format=csv&from=2026-11-01&to=2026-11-01"), noParams);
    const text = (await csv.text()).replace(/^\uFEFF/, "");
    const records: string[][] = await new Promise((resolve, reject) => {
      const out: string[][] = [];
      parseString(text, { headers: false })
        .on("data", (r: string[]) => out.push(r))
        .on("error", reject)
        .on("end", () => resolve(out));
    });
    const local = records[0].indexOf("Made at (America/Chicago)");
    const utc = records[0].indexOf("Made at (UTC)");
    expect(local).toBeGreaterThanOrEqual(0);
    expect(utc).toBeGreaterThanOrEqual(0);
    expect(records).toHaveLength(expected.length + 1);
    for (const record of records.slice(1)) {
      const instant = Date.parse(record[utc]);
      // Before 07:00Z the offset is CDT −05:00, from then on CST −06:00; the local wall time is UTC plus the offset.
      const offsetH = instant < change ? -5 : -6;
      const wall = new Date(instant + offsetH * 3_600_000).toISOString();
      expect(record[local]).toBe(`${wall.slice(0, 10)} ${wall.slice(11, 19)} \u2212${offsetH === -5 ? "05" : "06"}:00`);
    }
  });

  it("an export of a filter that matches nothing is a header-only file", async () => {
    const res = await exportGet(await requestAs(admin, "/api/v1/exports/register?format=csv&lot=NO-SUCH-LOT"), noParams);
    const text = (await res.text()).replace(/^\uFEFF/, "");
    expect(text.trim().split("\r\n")).toHaveLength(1);
  });
  it("the .xlsx and CSV carry the audit trail: decision in words, inspector, decided at, note, remakes, overrides, procedure code and version", async () => {
    const k = ownerDb();
    const jobId = fixture.jobIds[0]!;
    const inJob = (state: string) => k("joints as j").join("joint_states as s", "s.joint_id", "j.id").where({ "j.job_id": jobId, "s.review_state": state }).orderBy("j.id").select("j.id", "j.joint_no");
    const [cut] = (await inJob("cut-out")) as { id: number; joint_no: number }[];
    const accepted = (await inJob("accepted")) as { id: number; joint_no: number }[];
    const [pending] = (await inJob("pending-review")) as { id: number; joint_no: number }[];
    const [remake, reopened, stillAccepted] = accepted;
    expect(cut && remake && reopened && stillAccepted && pending).toBeTruthy();
    const jobCode = String((await k("jobs").where({ id: jobId }).first("code")).code);
    const inspectorName = String((await k("users").where({ id: fixture.inspectorId }).first("name")).name);
    const cutDecision = await k("joint_revisions").where({ joint_id: cut!.id, kind: "cut-out" }).first("at", "reason");

    // The remake names the cut-out joint, and the cut-out joint's state points at the remake.
    await k("joints").where({ id: remake!.id }).update({ replaces_joint_id: cut!.id });
    await k("joint_states").where({ joint_id: cut!.id }).update({ replaced_by_joint_id: remake!.id });
    // The remake was recorded under two clearances granted by an admin.
    const [heaterClear] = await k("joint_overrides").insert({ job_id: jobId, subject_type: "heater", subject_id: fixture.heaterIds[0], reason: "Spare plate checked on site with the pyrometer", granted_by: admin.id, expires_at: new Date("2030-01-01T00:00:00Z") });
    const [coilClear] = await k("joint_overrides").insert({ job_id: jobId, subject_type: "coil", subject_id: fixture.coilIds[0], reason: "Quarantine lifted by the maker's letter", granted_by: admin.id, expires_at: new Date("2030-01-01T00:00:00Z") });
    await k("joint_override_uses").insert([
      { joint_id: remake!.id, override_id: heaterClear, block_kind: "heater-check-overdue", message: "Heater plate check is overdue" },
      { joint_id: remake!.id, override_id: coilClear, block_kind: "coil-quarantined", message: "Coil is quarantined" },
    ]);
    const adminName = String((await k("users").where({ id: admin.id }).first("name")).name);
    // An accepted joint re-opened by a pressure trace is pending again: no decision stands.
    await k("joint_revisions").insert({ joint_id: reopened!.id, revision_no: 3, kind: "trace-attached", by_user_id: fixture.inspectorId, at: new Date(), review_state: "pending-review" });
    await k("joint_states").where({ joint_id: reopened!.id }).update({ review_state: "pending-review", revision_no: 3 });
    // A trace attached after the acceptance, within limits: the acceptance still stands.
    await k("joint_revisions").insert({ joint_id: stillAccepted!.id, revision_no: 3, kind: "trace-attached", by_user_id: fixture.fuserIds[0], at: new Date(), review_state: "accepted" });
    await k("joint_states").where({ joint_id: stillAccepted!.id }).update({ revision_no: 3 });

    const res = await exportGet(await requestAs(clerk, `/api/v1/exports/register?format=xlsx&job=${jobId}`), noParams);
    expect(res.status).toBe(200);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(Buffer.from(await res.arrayBuffer()) as unknown as ArrayBuffer);
    const sheet = book.getWorksheet("Joints")!;
    const header = (sheet.getRow(1).values as unknown[]).slice(1) as string[];
    for (const title of ["Decision", "Inspector", "Decided at (UTC)", "Decision note", "Replaces", "Replaced by", "Overrides used", "Procedure code", "Procedure version"]) expect(header).toContain(title);
    const byJointNo = new Map<number, Record<string, unknown>>();
    sheet.eachRow((row, n) => {
      if (n === 1) return;
      const values = (row.values as unknown[]).slice(1);
      const record = Object.fromEntries(header.map((h, i) => [h, values[i] ?? null]));
      byJointNo.set(Number(record.Joint), record);
    });

    // Words of the product's joint states ("accepted", "cut out"); joints as Beadline prints them ("WO-24152 joint 10").
    const cutRow = byJointNo.get(Number(cut!.joint_no))!;
    expect(cutRow).toMatchObject({ Decision: "Cut out", Inspector: inspectorName, "Decision note": cutDecision.reason, "Replaced by": `${jobCode} joint ${remake!.joint_no}`, Replaces: null });
    expect(Math.abs((cutRow["Decided at (UTC)"] as Date).getTime() - new Date(cutDecision.at).getTime())).toBeLessThan(2);
    const remakeRow = byJointNo.get(Number(remake!.joint_no))!;
    expect(remakeRow).toMatchObject({ Decision: "Accepted", Inspector: inspectorName, Replaces: `${jobCode} joint ${cut!.joint_no}`, "Replaced by": null });
    expect(remakeRow["Overrides used"]).toBe(`Heater plate check is overdue — cleared by ${adminName}: Spare plate checked on site with the pyrometer; Coil is quarantined — cleared by ${adminName}: Quarantine lifted by the maker's letter`);
    expect(byJointNo.get(Number(reopened!.joint_no))).toMatchObject({ Decision: null, Inspector: null, "Decided at (UTC)": null, "Decision note": null });
    expect(byJointNo.get(Number(stillAccepted!.joint_no))).toMatchObject({ Decision: "Accepted", Inspector: inspectorName });
    expect(byJointNo.get(Number(pending!.joint_no))).toMatchObject({ Decision: null, Inspector: null });
    for (const [no, record] of byJointNo) {
      const version = await k("joints as j").join("procedure_versions as v", "v.id", "j.procedure_version_id").join("procedures as p", "p.id", "v.procedure_id").where({ "j.job_id": jobId, "j.joint_no": no }).first("p.code", "v.version_no");
      expect([record["Procedure code"], record["Procedure version"]]).toEqual([version.code, Number(version.version_no)]);
      expect(String(record.Decision ?? "")).not.toMatch(/-/); // never a stored code such as "cut-out"
    }

    const csv = await exportGet(await requestAs(clerk, `/api/v1/exports/register?format=csv&job=${jobId}`), noParams);
    const csvText = await csv.text();
    const records: Record<string, string>[] = await new Promise((resolve, reject) => {
      const out: Record<string, string>[] = [];
      parseString(csvText.replace(/^\uFEFF/, ""), { headers: true })
        .on("data", (r: Record<string, string>) => out.push(r))
        .on("error", reject)
        .on("end", () => resolve(out));
    });
    const csvCut = records.find((r) => r.Joint === String(cut!.joint_no))!;
    expect(csvCut).toMatchObject({ Decision: "Cut out", Inspector: inspectorName, "Replaced by": `${jobCode} joint ${remake!.joint_no}` });
    expect(new Date(csvCut["Decided at (UTC)"]!).getTime()).toBe(new Date(cutDecision.at).getTime());
    expect(records.find((r) => r.Joint === String(remake!.joint_no))!["Overrides used"]).toContain(`cleared by ${adminName}: Quarantine lifted by the maker's letter`);
  });
});
