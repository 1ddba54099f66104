// Office query modules against the real MariaDB: qualification status on Crew for the
// seeded demo cases and at the exact 15-month limit, the heater and machine lists the
// Trench screen reads, and the Today counts.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { findHeaterWithLastCheck, findMachineById, listHeatersNeedingCheck, listMachinesWithoutPistonArea } from "@/database/queries/equipment";
import { currentProcedureVersionForJob, findProcedureVersionById } from "@/database/queries/procedures";
import { listQualificationFailuresForUser, listQualificationsForUser, qualificationStatusOverview } from "@/database/queries/qualifications";
import { listCoilsAwaitingLabel, listRunningExports, reviewQueueSummary } from "@/database/queries/today";
import { qualificationStatus } from "@/domain/qualifications/status";
import { ownerDb, resetDatabase, seedDemo } from "../support/db";
import { makeUser } from "../support/users";
import { insertJoint, makeJob, makeProcedure } from "../actions/office-fixtures";

// A fixed "today" for the demo scenario, so every date below is known.
const TODAY = new Date("2026-12-02T09:00:00Z");

describe("qualification status on Crew for the seeded demo cases", () => {
  beforeAll(async () => {
    await resetDatabase();
    await seedDemo(TODAY);
  });

  it("matches the domain rule and the dates worked out by hand", async () => {
    const rows = await qualificationStatusOverview({ now: TODAY });
    const byKey = new Map(rows.map((r) => [`${r.userName}|${r.procedureCode}`, r.status]));
    // Each expectation: source 49 CFR 192.285(c) (current text, effective 2019-01-22) —
    // requalify "once each calendar year at intervals not exceeding 15 months": qualified
    // through the earlier of (last date + 15 months) and 31 December of the next year.
    const expected: [string, string, string, string][] = [
      // Robin, LVG-BF-01, qualified 60 days before 2026-12-02 = 2026-10-03: +15 months 2028-01-03, calendar rule 2027-12-31.
      ["Robin Ashdown", "LVG-BF-01", "current", "2027-12-31"],
      // Robin, LVG-BF-02, 200 days before = 2026-05-16: +15 months 2027-08-16 (earlier than 2027-12-31).
      ["Robin Ashdown", "LVG-BF-02", "current", "2027-08-16"],
      // Kit, 440 days before = 2025-09-18: +15 months 2026-12-18, 16 days after 2026-12-02: within 30 days.
      ["Kit Marlowe-Fenn", "LVG-BF-01", "due-soon", "2026-12-18"],
      // Sam, 520 days before = 2025-06-30: +15 months 2026-09-30, already past.
      ["Sam Quarrie", "LVG-BF-01", "lapsed", "2026-09-30"],
    ];
    for (const [name, code, state, until] of expected) {
      expect(byKey.get(`${name}|${code}`), `${name} ${code}`).toMatchObject({ state, until });
    }
    // And the screen's rows are exactly the domain's answer for each person's dates.
    for (const r of rows) {
      const dates = (await listQualificationsForUser({ userId: r.userId, procedureId: r.procedureId })).map((q) => q.qualifiedOn);
      const failures = (await listQualificationFailuresForUser({ userId: r.userId, procedureId: r.procedureId })).map((f) => f.failedOn);
      expect(r.status).toEqual(qualificationStatus({ qualifiedOn: dates, failedTestsOn: failures, on: "2026-12-02" }));
    }
  });

  it("lists the seeded machine without piston area and the heater whose check is overdue", async () => {
    const machines = (await listMachinesWithoutPistonArea()).map((m) => m.assetTag);
    expect(machines).toContain("FM-330");
    expect(machines).not.toContain("FM-201");
    // HP-31 was checked on 2026-12-02 (due 2026-12-03); HP-12 on 2026-11-29 with a 1-day interval (due 2026-11-30).
    const heaters = (await listHeatersNeedingCheck({ now: TODAY })).map((h) => h.assetTag);
    expect(heaters).toContain("HP-12");
    expect(heaters).not.toContain("HP-31");
    const unlabelled = (await listCoilsAwaitingLabel()).coils.map((c) => c.coilCode);
    expect(unlabelled).toContain("LV-C0011");
    expect(unlabelled).not.toContain("LV-C0001");
  });
});

describe("the 15-month limit, exactly", () => {
  let userId: number;
  let procedureId: number;
  beforeEach(async () => {
    await resetDatabase();
    userId = (await makeUser({ roles: ["fuser"], name: "Limit Tester" })).id;
    procedureId = (await makeProcedure()).id;
    // 2025-08-20 + 15 months = 2026-11-20, earlier than 31 Dec 2026 (the calendar-year rule).
    await ownerDb()("qualifications").insert({ user_id: userId, procedure_id: procedureId, qualified_on: "2025-08-20", method: "visual-bend", specimen_result: "acceptable", evaluator: "E. Valuator" });
  });

  it("is still qualified on the last day of the 15 months and lapsed the next day", async () => {
    // source: 49 CFR 192.285(c) — "at intervals not exceeding 15 months".
    const onLimit = await qualificationStatusOverview({ on: "2026-11-20" });
    expect(onLimit[0]?.status).toMatchObject({ qualified: true, state: "due-soon", until: "2026-11-20" });
    const dayAfter = await qualificationStatusOverview({ on: "2026-11-21" });
    expect(dayAfter[0]?.status).toMatchObject({ qualified: false, state: "lapsed", until: "2026-11-20" });
    expect(dayAfter[0]).toMatchObject({ userName: "Limit Tester", userIsActive: true });
  });
});

describe("queries the Trench and Today screens read", () => {
  beforeEach(async () => {
    await resetDatabase();
  });

  it("gives the current version of a job's procedure with its parsed definition", async () => {
    const p = await makeProcedure({ standard: "iso-21307-slp" });
    const jobId = await makeJob({ procedureId: p.id });
    const v = await currentProcedureVersionForJob({ jobId });
    expect(v?.id).toBe(p.versionId);
    // ISO 21307 single low-pressure fusion pressure 0.17 ± 0.02 MPa — from memory, unconfirmed (ISO 21307:2017).
    expect(v?.definition.windows.fusionInterfacialPressureMpa).toMatchObject({ min: 0.15, max: 0.19, status: "from-memory" });
    expect(await currentProcedureVersionForJob({ jobId: 999_999 })).toBeNull();
    expect(await findProcedureVersionById({ id: 999_999 })).toBeNull();
  });

  it("reports a machine's piston area and a heater's last check for the Trench screen", async () => {
    const [machineId] = await ownerDb()("fusion_machines").insert({ asset_tag: "FM-T1", piston_area_mm2: 1006.5 });
    expect(await findMachineById({ id: Number(machineId) })).toMatchObject({ pistonAreaMm2: 1006.5, isUsable: true });
    const [heaterId] = await ownerDb()("heater_plates").insert({ asset_tag: "HP-T1", check_interval_days: 1 });
    expect(await findHeaterWithLastCheck({ id: Number(heaterId), now: TODAY })).toMatchObject({ lastCheck: null, isCheckOverdue: true, isFlagged: false });
    await ownerDb()("heater_checks").insert({ heater_id: heaterId, checked_at: new Date("2026-12-02T06:00:00Z"), instrument: "PY", readings: JSON.stringify({ faceA: [240, 241, 242], faceB: [239, 240, 241] }), window_min_c: 204.44, window_max_c: 232.22, passed: false, next_due_on: "2026-12-03" });
    const flagged = await findHeaterWithLastCheck({ id: Number(heaterId), now: TODAY });
    expect(flagged).toMatchObject({ isCheckOverdue: false, isFlagged: true, nextDueOn: "2026-12-03" });
    expect(flagged?.lastCheck?.readings.faceA).toEqual([240, 241, 242]);
  });

  it("counts the review queue with its oldest item, and running exports", async () => {
    const p = await makeProcedure();
    const fuser = await makeUser({ roles: ["fuser"] });
    const jobId = await makeJob({ procedureId: p.id });
    expect(await reviewQueueSummary()).toEqual({ count: 0, oldest: null });
    const first = await insertJoint({ jobId, procedureVersionId: p.versionId, fuserId: fuser.id });
    await insertJoint({ jobId, procedureVersionId: p.versionId, fuserId: fuser.id });
    await ownerDb()("joint_states").where({ joint_id: first }).update({ made_at: new Date("2026-11-01T08:00:00Z") });
    const queue = await reviewQueueSummary();
    expect(queue.count).toBe(2);
    expect(queue.oldest).toMatchObject({ jointId: first, jointNo: 1 });
    await ownerDb()("exports").insert([
      { user_id: fuser.id, format: "xlsx", filter: "{}", status: "running" },
      { user_id: fuser.id, format: "csv", filter: "{}", status: "done" },
    ]);
    expect((await listRunningExports({ userId: fuser.id })).count).toBe(1);
  });
});

afterAll(async () => {
  await resetDatabase();
});
