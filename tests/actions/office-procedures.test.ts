// Procedures actions against the real database: add a procedure from a published
// standard, publish a tightened version (loosening refused), versions used by joints are
// never changed — only superseded — and old joints keep the version they were checked against.
import { beforeEach, describe, expect, it } from "vitest";
import { createProcedureAction, editVersionNotesAction, publishProcedureVersionAction } from "@/app/(signed-in)/procedures/actions";
import { currentProcedureVersion, currentProcedureVersionForJob, findProcedureVersionById, listProcedureVersions } from "@/database/queries/procedures";
import { builtInProcedure } from "@/domain/procedures";
import { ownerDb, resetDatabase } from "../support/db";
import { actAs } from "../support/session";
import { makeUser } from "../support/users";
import { countRows, insertJoint, makeJob, makeProcedure } from "./office-fixtures";
import type { UnitSystem } from "@/domain/units/format";

describe("Procedures actions", () => {
  let admin: { id: number };
  beforeEach(async () => {
    await resetDatabase();
    admin = await makeUser({ roles: ["admin"] });
  });

  const tighten = (procedureId: number, basedOnVersionId: number, extra: Record<string, unknown> = {}) => ({ units: "si" as UnitSystem, procedureId, basedOnVersionId, note: "Operator tightening after the 2026 trial joints", ...extra });

  it("adds a procedure whose version 1 is the published standard's windows", async () => {
    await actAs(admin);
    const result = await createProcedureAction({ code: "LVG-BF-09", name: "Test procedure based on F2620", standard: "astm-f2620", notes: "" });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const v1 = await findProcedureVersionById({ id: result.data.versionId });
    expect(v1?.versionNo).toBe(1);
    expect(v1?.definition).toEqual(builtInProcedure("astm-f2620"));
    // source: ASTM F2620 heater surface 400–450 °F = 204.4–232.2 °C (PPI "Melt Procedure" page, CONFIRMED).
    expect(v1?.definition.windows.heaterTemperatureC.min).toBeCloseTo(204.444, 3);
    expect(v1?.definition.windows.heaterTemperatureC.max).toBeCloseTo(232.222, 3);
    expect(await ownerDb()("audit_log").where({ action: "procedure-added" })).toHaveLength(1);
  });

  it("publishes a tightened version (typed in °F and psi) and supersedes the old one", async () => {
    const p = await makeProcedure({ standard: "astm-f2620" });
    await actAs(admin);
    const result = await publishProcedureVersionAction(tighten(p.id, p.versionId, { units: "us", heaterMin: "410", heaterMax: "440", fusionPressureMin: "65", fusionPressureMax: "85" }));
    expect(result).toMatchObject({ ok: true, data: { versionNo: 2 } });
    if (!result.ok) return;
    const v2 = await findProcedureVersionById({ id: result.data.versionId });
    // source: NIST SP 811 — °C = (°F − 32) × 5/9: 410 °F = 210 °C, 440 °F = 226.67 °C;
    // 1 psi = 0.006894757 MPa: 65 psi = 0.4482 MPa, 85 psi = 0.5861 MPa.
    expect(v2?.definition.windows.heaterTemperatureC.min).toBeCloseTo(210, 6);
    expect(v2?.definition.windows.heaterTemperatureC.max).toBeCloseTo(226.667, 3);
    expect(v2?.definition.windows.fusionInterfacialPressureMpa.min).toBeCloseTo(0.44816, 4);
    expect(v2?.definition.windows.fusionInterfacialPressureMpa.max).toBeCloseTo(0.58605, 4);
    // Windows not touched keep the standard's values and status (F2620 IFP is from memory, unconfirmed).
    expect(v2?.definition.windows.beadUpInterfacialPressureMpa).toEqual(builtInProcedure("astm-f2620").windows.beadUpInterfacialPressureMpa);
    expect(v2?.definition.windows.heaterTemperatureC.status).toBe("confirmed");
    expect(v2?.definition.windows.heaterTemperatureC.source).toMatch(/version 2; within ASTM F2620/);
    expect(v2?.definition.notes).toContain("Operator tightening after the 2026 trial joints");
    const v1 = await findProcedureVersionById({ id: p.versionId });
    expect(v1?.isCurrent).toBe(false);
    expect(v1?.definition).toEqual(builtInProcedure("astm-f2620"));
    expect((await currentProcedureVersion({ procedureId: p.id }))?.id).toBe(result.data.versionId);
    expect(await ownerDb()("audit_log").where({ action: "procedure-version-published" })).toHaveLength(1);
  });

  it("refuses a change that loosens a window, naming the field, and writes nothing", async () => {
    const p = await makeProcedure({ standard: "astm-f2620" });
    await actAs(admin);
    // source: ASTM F2620 heater 400–450 °F (204–232 °C, CONFIRMED): 200 °C is below, 240 °C above; a derived procedure may only narrow.
    const result = await publishProcedureVersionAction(tighten(p.id, p.versionId, { heaterMin: "200", heaterMax: "240", maxChangeoverAtMost: "-1" }));
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.status).toBe(422);
    expect(result.fields?.maxChangeoverAtMost?.[0]).toBe("Maximum changeover cap must be more than 0.");
    const loosen = await publishProcedureVersionAction(tighten(p.id, p.versionId, { heaterMin: "200", heaterMax: "240" }));
    expect(loosen).toMatchObject({ ok: false, status: 422 });
    if (!loosen.ok) {
      expect(loosen.fields?.heaterMin?.[0]).toMatch(/below the 204 °C of ASTM F2620.*may only raise it/);
      expect(loosen.fields?.heaterMax?.[0]).toMatch(/above the 232 °C of ASTM F2620.*may only lower it/);
    }
    const nothing = await publishProcedureVersionAction(tighten(p.id, p.versionId));
    expect(nothing).toMatchObject({ ok: false, status: 422, fields: { _form: [expect.stringMatching(/Change at least one window/)] } });
    const noNote = await publishProcedureVersionAction(tighten(p.id, p.versionId, { heaterMin: "210", note: "" }));
    expect(noNote).toMatchObject({ ok: false, status: 422 });
    if (!noNote.ok) expect(Object.keys(noNote.fields ?? {})).toEqual(["note"]);
    expect(await countRows("procedure_versions")).toBe(1);
    expect((await findProcedureVersionById({ id: p.versionId }))?.isCurrent).toBe(true);
  });

  it("refuses other roles with 403", async () => {
    const p = await makeProcedure();
    for (const roles of [["fuser"], ["inspector"], ["clerk"]] as const) {
      await actAs(await makeUser({ roles: [...roles] }));
      expect(await publishProcedureVersionAction(tighten(p.id, p.versionId, { heaterMin: "210" }))).toMatchObject({ ok: false, status: 403 });
      expect(await createProcedureAction({ code: "X-1", name: "Not allowed", standard: "astm-f2620" })).toMatchObject({ ok: false, status: 403 });
      expect(await editVersionNotesAction({ versionId: p.versionId, notes: "Not allowed" })).toMatchObject({ ok: false, status: 403 });
    }
    expect(await countRows("procedure_versions")).toBe(1);
    expect(await countRows("procedures")).toBe(1);
  });

  it("gives 409 to a publish based on a version someone else has already superseded", async () => {
    const p = await makeProcedure();
    await actAs(admin);
    expect(await publishProcedureVersionAction(tighten(p.id, p.versionId, { heaterMin: "210" }))).toMatchObject({ ok: true, data: { versionNo: 2 } });
    const stale = await publishProcedureVersionAction(tighten(p.id, p.versionId, { heaterMax: "225" }));
    expect(stale).toMatchObject({ ok: false, status: 409 });
    if (!stale.ok) expect(stale.message).toMatch(/now has version 2.*reload/);
    expect(await countRows("procedure_versions")).toBe(2);
  });

  it("never changes a version used by a joint; a new version is published and the old joint keeps its version", async () => {
    const p = await makeProcedure({ standard: "astm-f2620" });
    const fuser = await makeUser({ roles: ["fuser"] });
    const jobId = await makeJob({ procedureId: p.id });
    await actAs(admin);

    // Before any joint uses it, version 1's notes may be corrected.
    expect(await editVersionNotesAction({ versionId: p.versionId, notes: "First version, corrected before use" })).toMatchObject({ ok: true });

    const jointId = await insertJoint({ jobId, procedureVersionId: p.versionId, fuserId: fuser.id });
    const before = await ownerDb()("procedure_versions").where({ id: p.versionId }).first();

    const refused = await editVersionNotesAction({ versionId: p.versionId, notes: "Trying to change a used version" });
    expect(refused).toMatchObject({ ok: false, status: 409 });
    if (!refused.ok) expect(refused.message).toMatch(/used for 1 joint, so it cannot be changed; publish a new version/);

    const published = await publishProcedureVersionAction(tighten(p.id, p.versionId, { heaterMin: "210", heaterMax: "225" }));
    expect(published).toMatchObject({ ok: true, data: { versionNo: 2 } });
    if (!published.ok) return;

    const after = await ownerDb()("procedure_versions").where({ id: p.versionId }).first();
    expect(after.definition).toBe(before.definition);
    expect(after.notes).toBe(before.notes);
    expect(after.superseded_at).not.toBeNull();
    const joint = await ownerDb()("joints").where({ id: jointId }).first();
    expect(Number(joint.procedure_version_id)).toBe(p.versionId);

    const versions = await listProcedureVersions({ procedureId: p.id });
    expect(versions.map((v) => [v.versionNo, v.jointCount, v.isCurrent])).toEqual([
      [2, 0, true],
      [1, 1, false],
    ]);
    // New joints on the job are checked against version 2; the old joint still shows version 1's windows.
    expect((await currentProcedureVersionForJob({ jobId }))?.id).toBe(published.data.versionId);
    const oldVersion = await findProcedureVersionById({ id: Number(joint.procedure_version_id) });
    expect(oldVersion?.versionNo).toBe(1);
    expect(oldVersion?.definition.windows.heaterTemperatureC.min).toBeCloseTo(204.444, 3);
  });
});
