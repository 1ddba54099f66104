// Every recorded value of domain/joints/values, walked from the table: submitted through
// POST /api/v1/joints, read back from the stored row, the joint's JSON, the Register's row
// and the spreadsheet export's cell (exceljs). A value lost or swapped on any of these
// roads fails here, whichever value is added next.
//
// Expected export cells are converted by an independent route — mathjs's unit library
// (general-purpose reference) — not by Beadline's conversion tables.
import { randomUUID } from "node:crypto";
import ExcelJS from "exceljs";
import { unit } from "mathjs";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as exportGet } from "@/app/api/v1/exports/register/route";
import { GET as registerGet } from "@/app/api/v1/register/route";
import { GET as jointGet } from "@/app/api/v1/joints/[id]/route";
import { POST as jointsPost } from "@/app/api/v1/joints/route";
import { closeDb } from "@/database/client";
import { builtInProcedure } from "@/domain/procedures";
import { RECORDED_VALUE_DEFINITIONS, type RecordedValueDefinition } from "@/domain/joints/values";
import { exportDecimals } from "@/domain/register";
import type { QuantityKind } from "@/domain/units/format";
import { ownerDb, resetDatabase } from "../support/db";
import { requestAs } from "../support/session";
import { makeUser } from "../support/users";

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- JSON answers are read field by field below
type Body = Record<string, any>;

const noParams = { params: Promise.resolve({}) };
const OD_MM = 60.33; // 2" IPS (ASME B36.10)
const SDR = 11;

/** mathjs unit names of each kind: canonical SI → US customary. */
const MATHJS_UNITS: Partial<Record<QuantityKind, { si: string; us: string }>> = {
  temperature: { si: "degC", us: "degF" },
  pressure: { si: "MPa", us: "psi" },
  "length-mm": { si: "mm", us: "inch" },
  duration: { si: "s", us: "s" },
};

/**
 * An input inside each value's schema bounds, different for every value so a swap of two
 * columns shows (one decimal: every value column keeps at least 0.1). Checks alternate
 * yes and no, so a check stored as "always yes" shows too.
 */
function inputFor(d: RecordedValueDefinition, index: number): number | boolean {
  if (d.type === "check") return index % 2 === 0;
  const fraction = 0.05 + 0.04 * index;
  return Math.round((d.bounds.min + (d.bounds.max - d.bounds.min) * fraction) * 10) / 10;
}

const inputs = RECORDED_VALUE_DEFINITIONS.map((d, i) => ({ d, value: inputFor(d, i) }));

describe("each recorded value round-trips: submission → row → joint JSON → Register → xlsx", () => {
  let jointId: number;
  let jobId: number;
  let inspectorUs: { id: number };
  let workbook: ExcelJS.Workbook;
  let jointJson: Body;
  let registerRow: Body;
  let stored: Body;

  beforeAll(async () => {
    await resetDatabase();
    const k = ownerDb();
    const [procedureId] = await k("procedures").insert({ code: "RT-F2620", name: "Round trip per ASTM F2620", standard: "astm-f2620" });
    await k("procedure_versions").insert({ procedure_id: procedureId, version_no: 1, definition: JSON.stringify(builtInProcedure("astm-f2620")) });
    const [job] = await k("jobs").insert({ code: "WO-RT1", name: "Round trip main", procedure_id: procedureId, status: "open" });
    jobId = Number(job);
    await k("job_counters").insert({ job_id: jobId, last_joint_no: 0 });
    const [machineId] = await k("fusion_machines").insert({ asset_tag: "FM-RT1", min_od_mm: 20, max_od_mm: 300, piston_area_mm2: 1006.5 });
    const [heaterId] = await k("heater_plates").insert({ asset_tag: "HP-RT1", check_interval_days: 1 });
    const today = new Date().toISOString().slice(0, 10);
    const tomorrow = new Date(Date.now() + 86_400_000).toISOString().slice(0, 10);
    await k("heater_checks").insert({ heater_id: heaterId, checked_at: new Date(`${today}T00:00:00Z`), instrument: "Pyrometer", readings: JSON.stringify({ faceA: [219], faceB: [220] }), window_min_c: 204.4, window_max_c: 232.2, passed: true, next_due_on: tomorrow });
    for (const code of ["RT-C0001", "RT-C0002"]) {
      await k("coils").insert({ coil_code: code, manufacturer: "Quillfield Polymers", lot: "4410021", material: "PE4710", series: "ips", nominal_size: "2", outside_diameter_mm: OD_MM, sdr: SDR, length_m: 152.4, remaining_m: 152.4, status: "in-use", job_id: jobId });
    }
    const fuser = await makeUser({ roles: ["fuser"], name: "Round Trip Fuser" });
    await k("qualifications").insert({ user_id: fuser.id, procedure_id: procedureId, qualified_on: new Date(Date.now() - 30 * 86_400_000).toISOString().slice(0, 10), method: "visual-bend", specimen_result: "acceptable", evaluator: "Test evaluator" });
    inspectorUs = await makeUser({ roles: ["inspector"], unitSystem: "us" });

    const body = {
      clientId: randomUUID(),
      jobId,
      kind: "coil-to-coil",
      coilA: "RT-C0001",
      coilB: "RT-C0002",
      machineId: Number(machineId),
      heaterId: Number(heaterId),
      ...Object.fromEntries(inputs.map(({ d, value }) => [d.key, value])),
      timedFields: [],
      madeAt: new Date(Date.now() - 60_000).toISOString(),
      station: "1+00",
      ambientC: 12,
      shelter: "none",
    };
    const posted = await jointsPost(await requestAs(fuser, "/api/v1/joints", { method: "POST", json: body }), noParams);
    const answer = (await posted.json()) as Body;
    expect(posted.status, JSON.stringify(answer)).toBe(201);
    jointId = Number(answer.joint.id);

    stored = (await k("joints").where({ id: jointId }).first()) as Body;
    const one = await jointGet(await requestAs(inspectorUs, `/api/v1/joints/${jointId}`), { params: Promise.resolve({ id: String(jointId) }) });
    jointJson = ((await one.json()) as Body).joint;
    const page = await registerGet(await requestAs(inspectorUs, `/api/v1/register?job=${jobId}&limit=5`), noParams);
    registerRow = ((await page.json()) as Body).rows.find((r: Body) => r.id === jointId);
    const file = await exportGet(await requestAs(inspectorUs, `/api/v1/exports/register?format=xlsx&job=${jobId}`), noParams);
    expect(file.status).toBe(200);
    workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load(Buffer.from(await file.arrayBuffer()) as unknown as ArrayBuffer);
  });

  afterAll(async () => {
    await closeDb();
  });

  it.each(inputs.map(({ d, value }) => [d.key, d, value] as const))("%s", (_key, d, value) => {
    // The stored row (DECIMAL arrives as text, TINYINT as 0/1).
    const cell = stored[d.column];
    if (d.type === "check") expect(Boolean(cell)).toBe(value);
    else expect(Number(cell)).toBe(value);

    // The joint's JSON and the Register's row carry the value under its key, in SI.
    expect(jointJson.values[d.key]).toBe(value);
    expect(registerRow).toBeTruthy();
    expect(registerRow[d.key]).toBe(value);

    // The export's cell of the value's column, in the US reader's units.
    const sheet = workbook.getWorksheet("Joints")!;
    const header = (sheet.getRow(1).values as unknown[]).slice(1) as string[];
    const column = header.findIndex((h) => h === d.label || h.startsWith(`${d.label} (`)) + 1;
    expect(column, `a column headed "${d.label}"`).toBeGreaterThan(0);
    const exported = sheet.getRow(2).getCell(column).value;
    if (d.type === "check") {
      expect(exported).toBe(value ? "yes" : "no");
      return;
    }
    const units = MATHJS_UNITS[d.quantity];
    expect(units, `a mathjs unit for ${d.quantity}`).toBeTruthy();
    // source: mathjs unit conversion (general-purpose reference library)
    const expected = unit(value as number, units!.si).toNumber(units!.us);
    expect(typeof exported).toBe("number");
    // The export keeps a fixed number of decimals per unit: agreement to half its last place.
    expect(Math.abs((exported as number) - expected)).toBeLessThanOrEqual(0.5 * 10 ** -exportDecimals(d.quantity, "us") + 1e-9);
  });
});
