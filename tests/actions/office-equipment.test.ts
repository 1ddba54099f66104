// Equipment actions against the real database: machines with their total effective piston
// area entered in either unit system, heater plates, and heater surface-temperature checks
// judged against the procedure's heater window (flagged until a passing check).
import { beforeEach, describe, expect, it } from "vitest";
import { createHeaterAction, createMachineAction, recordHeaterCheckAction, updateHeaterAction, updateMachineAction } from "@/app/(signed-in)/equipment/actions";
import { recordHeaterCheck } from "@/app/_server/equipment/record-heater-check";
import { findHeaterWithLastCheck, findMachineById, listHeatersNeedingCheck, listMachinesWithoutPistonArea } from "@/database/queries/equipment";
import { ownerDb, resetDatabase } from "../support/db";
import { actAs } from "../support/session";
import { makeUser } from "../support/users";
import { countRows, makeHeater, makeMachine, makeProcedure } from "./office-fixtures";
import type { UnitSystem } from "@/domain/units/format";

describe("Equipment actions: fusion machines", () => {
  let admin: { id: number };
  beforeEach(async () => {
    await resetDatabase();
    admin = await makeUser({ roles: ["admin"] });
  });

  it("adds a machine with its piston area typed in in² and keeps it in mm²", async () => {
    await actAs(admin);
    const result = await createMachineAction({ units: "us", assetTag: "FM-501", description: "Test machine", minOd: "2.375", maxOd: "8.625", pistonArea: "1.56", lastServiceOn: "2026-10-01", nextServiceDue: "2027-10-01" });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const machine = await findMachineById({ id: result.data.id });
    // source: NIST SP 811 Appendix B — 1 in = 25.4 mm exactly, so 1 in² = 645.16 mm²: 1.56 in² = 1006.4496 mm² (stored to 0.01).
    expect(machine?.pistonAreaMm2).toBeCloseTo(1006.45, 2);
    // source: ASME B36.10 IPS outside diameters, 2" = 2.375 in = 60.325 mm, 8" = 8.625 in = 219.075 mm.
    expect(machine?.minOdMm).toBeCloseTo(60.33, 2);
    expect(machine?.maxOdMm).toBeCloseTo(219.08, 2);
    expect(machine?.isUsable).toBe(true);
    expect(await ownerDb()("audit_log").where({ action: "machine-added", entity_id: String(result.data.id) })).toHaveLength(1);
  });

  it("keeps the gauge and thermometer resolution typed in US units in MPa and °C", async () => {
    await actAs(admin);
    const result = await createMachineAction({ units: "us", assetTag: "FM-510", pistonArea: "4.71", gaugeResolution: "5", thermometerResolution: "1" });
    if (!result.ok) throw new Error(result.message);
    const machine = await findMachineById({ id: result.data.id });
    // source: NIST SP 811 Appendix B — 1 psi = 6894.757 Pa, so 5 psi = 0.0344738 MPa (stored to 0.0001).
    expect(machine?.gaugeResolutionMpa).toBeCloseTo(0.0345, 4);
    // A step of 1 °F is 5/9 °C = 0.556 °C (stored to 0.001; no 32° offset for a step).
    expect(machine?.thermometerResolutionC).toBeCloseTo(0.556, 3);
  });

  it("leaves the resolutions blank as no tolerance", async () => {
    await actAs(admin);
    const result = await createMachineAction({ units: "si", assetTag: "FM-511", pistonArea: "3000", gaugeResolution: "", thermometerResolution: "" });
    if (!result.ok) throw new Error(result.message);
    expect(await findMachineById({ id: result.data.id })).toMatchObject({ gaugeResolutionMpa: null, thermometerResolutionC: null });
  });

  it("keeps a machine without piston area as unusable and lists it for the admin", async () => {
    await actAs(admin);
    const result = await createMachineAction({ units: "si", assetTag: "FM-502", pistonArea: "" });
    if (!result.ok) throw new Error(result.message);
    const machine = await findMachineById({ id: result.data.id });
    expect(machine).toMatchObject({ pistonAreaMm2: null, isUsable: false });
    expect(machine?.problems[0]).toMatch(/no total effective piston area/);
    expect((await listMachinesWithoutPistonArea()).map((m) => m.assetTag)).toEqual(["FM-502"]);
  });

  it("refuses other roles with 403", async () => {
    const fuser = await makeUser({ roles: ["fuser"] });
    await actAs(fuser);
    expect(await createMachineAction({ units: "si", assetTag: "FM-503", pistonArea: "1000" })).toMatchObject({ ok: false, status: 403 });
    expect(await createHeaterAction({ assetTag: "HP-9", checkIntervalDays: "1" })).toMatchObject({ ok: false, status: 403 });
    expect(await countRows("fusion_machines")).toBe(0);
    expect(await countRows("heater_plates")).toBe(0);
  });

  it("names every bad field and writes nothing", async () => {
    await actAs(admin);
    const result = await createMachineAction({ units: "si", assetTag: "", minOd: "-60", maxOd: "abc", pistonArea: "0", lastServiceOn: "2026-02-30" });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.status).toBe(422);
    expect(result.fields).toMatchObject({
      assetTag: [expect.stringMatching(/asset tag/i)],
      minOd: ["Smallest pipe OD must be more than 0."],
      maxOd: ["Largest pipe OD must be a number."],
      pistonArea: ["Total effective piston area must be more than 0."],
      lastServiceOn: [expect.stringMatching(/real date/)],
    });
    // A typed area that is surely a unit slip (1006 in² ≈ 0.65 m² of piston).
    const slip = await createMachineAction({ units: "us", assetTag: "FM-504", pistonArea: "1006" });
    expect(slip).toMatchObject({ ok: false, status: 422 });
    if (!slip.ok) expect(slip.fields?.pistonArea?.[0]).toMatch(/not plausible/);
    expect(await countRows("fusion_machines")).toBe(0);
    expect(await countRows("audit_log")).toBe(0);
  });

  it("gives 409 to a second edit from the same version; retiring keeps the machine on record", async () => {
    const id = await makeMachine({ pistonAreaMm2: null });
    await actAs(admin);
    const first = await updateMachineAction({ id, version: 1, isActive: true, units: "si", assetTag: "FM-600", pistonArea: "2100" });
    expect(first).toMatchObject({ ok: true, data: { version: 2 } });
    const second = await updateMachineAction({ id, version: 1, isActive: true, units: "si", assetTag: "FM-600", pistonArea: "9999" });
    expect(second).toMatchObject({ ok: false, status: 409 });
    expect((await findMachineById({ id }))?.pistonAreaMm2).toBe(2100);
    const retired = await updateMachineAction({ id, version: 2, isActive: false, units: "si", assetTag: "FM-600", pistonArea: "2100" });
    expect(retired.ok).toBe(true);
    expect(await findMachineById({ id })).toMatchObject({ isActive: false, isUsable: false });
    expect(await ownerDb()("audit_log").where({ action: "machine-retired" })).toHaveLength(1);
  });
});

describe("Equipment actions: heater plates and surface-temperature checks", () => {
  let admin: { id: number };
  let procedureId: number;
  beforeEach(async () => {
    await resetDatabase();
    admin = await makeUser({ roles: ["admin"] });
    procedureId = (await makeProcedure({ standard: "astm-f2620" })).id;
  });

  const check = (heaterId: number, faceA: string[], faceB: string[], units: UnitSystem = "us") => ({ units, heaterId, procedureId, instrument: "Contact pyrometer PY-9", faceA, faceB, notes: "" });

  it("passes a check whose readings all lie in the F2620 window, and sets the next due date", async () => {
    await actAs(admin);
    const created = await createHeaterAction({ assetTag: "HP-40", description: "Test plate", checkIntervalDays: "1" });
    if (!created.ok) throw new Error(created.message);
    // source: ASTM F2620 heater surface temperature 400–450 °F (PPI "Melt Procedure" page, CONFIRMED); both ends count as inside.
    const result = await recordHeaterCheckAction(check(created.data.id, ["400", "425", "450"], ["410", "430", "440"]));
    expect(result).toMatchObject({ ok: true, data: { passed: true, misses: [] } });
    const heater = await findHeaterWithLastCheck({ id: created.data.id });
    expect(heater).toMatchObject({ isFlagged: false, isCheckOverdue: false, problems: [] });
    // source: 400 °F = (400 − 32) × 5/9 = 204.44 °C and 450 °F = 232.22 °C (NIST SP 811 temperature conversion).
    expect(heater?.lastCheck?.windowMinC).toBeCloseTo(204.44, 2);
    expect(heater?.lastCheck?.windowMaxC).toBeCloseTo(232.22, 2);
    expect(heater?.lastCheck?.readings.faceA[0]).toBeCloseTo(204.444, 3);
    const today = new Date().toISOString().slice(0, 10);
    const tomorrow = new Date(Date.parse(`${today}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
    expect(heater?.nextDueOn).toBe(tomorrow);
    expect(await ownerDb()("audit_log").where({ action: "heater-check-passed" })).toHaveLength(1);
  });

  it("fails a check with one point outside the window, flags the plate, and clears it with a passing check", async () => {
    const heaterId = await makeHeater();
    await actAs(admin);
    // source: ASTM F2620 400–450 °F (PPI, CONFIRMED): 399 °F is below the window, 451 °F above it.
    const failed = await recordHeaterCheckAction(check(heaterId, ["399", "420", "421"], ["420", "451", "422"]));
    expect(failed.ok).toBe(true);
    if (!failed.ok) return;
    expect(failed.data.passed).toBe(false);
    expect(failed.data.misses).toHaveLength(2);
    expect(failed.data.misses[0]).toMatch(/Face A point 1: .* is below/);
    expect(failed.data.misses[1]).toMatch(/Face B point 2: .* is above/);
    const flagged = await findHeaterWithLastCheck({ id: heaterId });
    expect(flagged?.isFlagged).toBe(true);
    expect(flagged?.problems[0]).toMatch(/stays flagged until a check passes/);
    expect((await listHeatersNeedingCheck()).map((h) => h.id)).toEqual([heaterId]);

    const passed = await recordHeaterCheckAction(check(heaterId, ["420", "421", "422"], ["423", "424", "425"]));
    expect(passed).toMatchObject({ ok: true, data: { passed: true } });
    expect(await findHeaterWithLastCheck({ id: heaterId })).toMatchObject({ isFlagged: false, problems: [] });
    expect(await listHeatersNeedingCheck()).toEqual([]);
  });

  it("is overdue on the day the next check falls due (interval in days)", async () => {
    const heaterId = await makeHeater({ checkIntervalDays: 7 });
    const checkedAt = new Date("2026-11-02T06:30:00Z");
    const ok = await recordHeaterCheck({ units: "si", heaterId, procedureId, instrument: "PY-9", faceA: [215, 216, 217], faceB: [218, 219, 220] }, { user: admin, requestId: "t" }, checkedAt);
    // common practice (no published source): a 7-day interval from 2026-11-02 falls due on 2026-11-09.
    expect(ok.nextDueOn).toBe("2026-11-09");
    expect((await findHeaterWithLastCheck({ id: heaterId, now: new Date("2026-11-08T23:59:00Z") }))?.isCheckOverdue).toBe(false);
    expect((await findHeaterWithLastCheck({ id: heaterId, now: new Date("2026-11-09T05:00:00Z") }))?.isCheckOverdue).toBe(true);
  });

  it("refuses other roles, names bad readings and writes nothing", async () => {
    const heaterId = await makeHeater();
    const clerk = await makeUser({ roles: ["clerk"] });
    await actAs(clerk);
    expect(await recordHeaterCheckAction(check(heaterId, ["420", "421", "422"], ["420", "421", "422"]))).toMatchObject({ ok: false, status: 403 });
    await actAs(admin);
    const bad = await recordHeaterCheckAction({ ...check(heaterId, ["420", "", ""], ["420", "hot", "422"]), instrument: "" });
    expect(bad.ok).toBe(false);
    if (bad.ok) return;
    expect(bad.status).toBe(422);
    expect(bad.fields?.faceA?.[0]).toMatch(/Face A: enter at least 3 readings/);
    expect(bad.fields?.["faceB.1"]?.[0]).toBe("Face B reading must be a number.");
    expect(bad.fields?.instrument?.[0]).toMatch(/instrument/i);
    const implausible = await recordHeaterCheckAction(check(heaterId, ["4200", "421", "422"], ["420", "421", "422"]));
    expect(implausible).toMatchObject({ ok: false, status: 422 });
    expect(await countRows("heater_checks")).toBe(0);
  });

  it("gives 409 to a second edit of a heater plate from the same version", async () => {
    const heaterId = await makeHeater();
    await actAs(admin);
    expect(await updateHeaterAction({ id: heaterId, version: 1, isActive: true, assetTag: "HP-77", checkIntervalDays: "2" })).toMatchObject({ ok: true });
    expect(await updateHeaterAction({ id: heaterId, version: 1, isActive: true, assetTag: "HP-78", checkIntervalDays: "3" })).toMatchObject({ ok: false, status: 409 });
    expect(await findHeaterWithLastCheck({ id: heaterId })).toMatchObject({ assetTag: "HP-77", checkIntervalDays: 2 });
  });
});
