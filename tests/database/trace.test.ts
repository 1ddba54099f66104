// Trace queries against the real MariaDB. Lot → ground finds exactly the joints seeded for
// a lot — the lot on side A, on side B, on both — and no others, however the lot is named
// (manufacturer + lot, coil id, F2897 code); the lookup uses the per-column indexes.
// Joint → origins returns the components, machine, heater check before the joint, the
// fuser's qualification on that day and the procedure version. Joints are inserted
// directly with the owner connection (the trench's own tests cover recording them).
import ExcelJS from "exceljs";
import { parseString } from "@fast-csv/parse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { traceJointOrigins } from "@/app/_server/trace/origins";
import { closeDb } from "@/database/client";
import { findLotCoils, listJointsForCoils, traceLot } from "@/database/queries/trace";
import { findJointForTrace } from "@/app/_server/trace/find-joint";
import { traceCsv, traceWorkbook } from "@/app/_server/trace/lot-export";
import { seed as seedScenario } from "@/database/seeds/01-demo";
import { closeOwnerDb, ownerDb, resetDatabase, userIdByEmail } from "../support/db";

const TODAY = new Date("2026-12-01T12:00:00Z");
const LOT = { manufacturer: "Quillfield Polymers", lot: "4410021" };
// Hand-built from ASTM F2897-23a (worked in tests/domain/coil-life.test.ts).
const CODE_LOT_4410021 = "QFivfn5SWH123Kj0";

const ids: Record<string, number> = {};
const joints: Record<string, number> = {};
let counter = 0;

async function idOf(table: string, column: string, value: string): Promise<number> {
  const row = await ownerDb()(table).where(column, value).first("id");
  return Number(row.id);
}

async function insertJoint(name: string, { job, a, b, text, fuser = "fuser", madeAt, station, lat, lng, outcome = "within-limits" }: { job: string; a: string | null; b: string | null; text?: string; fuser?: string; madeAt: string; station?: string; lat?: number; lng?: number; outcome?: "within-limits" | "out-of-limits" }) {
  counter += 1;
  const jobId = ids[job]!;
  const [id] = await ownerDb()("joints").insert({
    client_id: `trace-test-${counter}`,
    job_id: jobId,
    joint_no: counter,
    kind: b ? "coil-to-coil" : text?.startsWith("tie-in") ? "tie-in" : "fitting",
    coil_a_id: a ? ids[a] : null,
    coil_b_id: b ? ids[b] : null,
    component_b_text: text ?? null,
    length_a_m: a ? 12.5 : null,
    length_b_m: b ? 7.25 : null,
    outside_diameter_mm: 60.33,
    sdr: 11,
    procedure_version_id: ids.version,
    machine_id: ids.machine,
    heater_id: ids.heater,
    fuser_id: ids[fuser],
    made_at: new Date(madeAt),
    station: station ?? null,
    latitude: lat ?? null,
    longitude: lng ?? null,
    plan: "{}",
    outcome,
    findings: "[]",
  });
  await ownerDb()("joint_states").insert({ joint_id: id, review_state: "pending-review", revision_no: 1, outcome, made_at: new Date(madeAt) });
  joints[name] = Number(id);
}

beforeAll(async () => {
  await resetDatabase();
  // The scenario without the demo joints: these tests insert exactly the joints they count.
  await seedScenario(ownerDb(), TODAY);
  for (const code of ["LV-C0001", "LV-C0002", "LV-C0003", "LV-C0004", "LV-C0005", "LV-C0007", "LV-C0008", "LV-C0012"]) ids[code] = await idOf("coils", "coil_code", code);
  ids["WO-24117"] = await idOf("jobs", "code", "WO-24117");
  ids["WO-24152"] = await idOf("jobs", "code", "WO-24152");
  ids.machine = await idOf("fusion_machines", "asset_tag", "FM-201");
  ids.heater = await idOf("heater_plates", "asset_tag", "HP-31");
  ids.fuser = await userIdByEmail("fuser@larkmoor-gas.example");
  ids.fuser3 = await userIdByEmail("fuser3@larkmoor-gas.example");
  const procedure = await idOf("procedures", "code", "LVG-BF-01");
  ids.version = Number((await ownerDb()("procedure_versions").where("procedure_id", procedure).first("id")).id);
  await ownerDb()("coils").where("id", ids["LV-C0001"]).update({ trace_code: CODE_LOT_4410021 });

  // Lot 4410021 = LV-C0001, -0002, -0003, -0012. Lot 4410388 = LV-C0004, -0005. Lot 4420115 = LV-C0007, -0008 (4").
  await insertJoint("bothSides", { job: "WO-24117", a: "LV-C0001", b: "LV-C0002", madeAt: "2026-11-20T09:00:00Z", station: "1+00" });
  await insertJoint("sideA", { job: "WO-24117", a: "LV-C0002", b: null, text: "tie-in to main in the ground", madeAt: "2026-11-20T11:00:00Z", station: "3+50" });
  await insertJoint("sideB", { job: "WO-24152", a: "LV-C0004", b: "LV-C0001", madeAt: "2026-11-22T10:00:00Z", lat: 41.2188, lng: -77.2107, outcome: "out-of-limits" });
  await insertJoint("fitting", { job: "WO-24117", a: "LV-C0012", b: null, text: "2 in butt-fusion tee", madeAt: "2026-11-24T14:00:00Z", station: "5+00", fuser: "fuser3" });
  await insertJoint("otherLot", { job: "WO-24152", a: "LV-C0004", b: "LV-C0005", madeAt: "2026-11-23T10:00:00Z" });
  await insertJoint("otherSize", { job: "WO-24117", a: "LV-C0007", b: "LV-C0008", madeAt: "2026-11-25T10:00:00Z" });

  // A later heater check than the joints: the origins must show the one before each joint.
  // This file's own check history for the plate (the demo seed's daily checks are replaced).
  await ownerDb()("heater_checks").where({ heater_id: ids.heater }).del();
  await ownerDb()("heater_checks").insert({ heater_id: ids.heater, checked_at: new Date("2026-11-21T06:30:00Z"), instrument: "Contact pyrometer PY-9", readings: "{}", window_min_c: 204.4, window_max_c: 232.2, passed: true, next_due_on: "2026-11-22" });
  await ownerDb()("heater_checks").insert({ heater_id: ids.heater, checked_at: new Date("2026-11-19T06:30:00Z"), instrument: "Contact pyrometer PY-4", readings: "{}", window_min_c: 204.4, window_max_c: 232.2, passed: true, next_due_on: "2026-11-20" });
});

afterAll(async () => {
  await closeDb();
  await closeOwnerDb();
});

const lotJoints = () => [joints.bothSides, joints.sideA, joints.sideB, joints.fitting].sort((x, y) => x! - y!);

describe("lot → ground", () => {
  it("finds every coil of the lot and exactly the joints made with them, on either side", async () => {
    const trace = await traceLot(LOT);
    expect(trace.matchedBy).toBe("lot");
    expect(trace.coils.map((c) => c.coilCode)).toEqual(["LV-C0001", "LV-C0002", "LV-C0003", "LV-C0012"]);
    expect(trace.joints.map((j) => j.id).sort((x, y) => x - y)).toEqual(lotJoints());
    const side = Object.fromEntries(trace.joints.map((j) => [j.id, j.side]));
    expect(side[joints.bothSides!]).toBe("both");
    expect(side[joints.sideA!]).toBe("a");
    expect(side[joints.sideB!]).toBe("b");
    expect(side[joints.fitting!]).toBe("a");
    expect(trace.truncated).toBe(false);
  });

  it("carries each joint's place, job, date, fuser and outcome", async () => {
    const trace = await traceLot(LOT);
    const sideB = trace.joints.find((j) => j.id === joints.sideB)!;
    expect(sideB).toMatchObject({ jobCode: "WO-24152", latitude: 41.2188, longitude: -77.2107, station: null, fuserName: "Robin Ashdown", outcome: "out-of-limits", reviewState: "pending-review", coilACode: "LV-C0004", coilALot: "4410388", coilBCode: "LV-C0001", coilBLot: "4410021" });
    expect(sideB.madeAt.toISOString()).toBe("2026-11-22T10:00:00.000Z");
    const fitting = trace.joints.find((j) => j.id === joints.fitting)!;
    expect(fitting).toMatchObject({ station: "5+00", componentBText: "2 in butt-fusion tee", fuserName: "Sam Quarrie" });
  });

  it("names the same lot through a coil id, a label URL or the F2897 code", async () => {
    for (const code of ["LV-C0012", "http://127.0.0.1:3000/coils/LV-C0003", CODE_LOT_4410021]) {
      const trace = await traceLot({ code });
      expect(trace.lots).toEqual([LOT]);
      expect(trace.joints.map((j) => j.id).sort((x, y) => x - y)).toEqual(lotJoints());
    }
  });

  it("finds nothing for a lot of another maker or an unknown code", async () => {
    expect((await findLotCoils({ manufacturer: "Other Pipe Works", lot: "4410021" })).coils).toEqual([]);
    const none = await traceLot({ code: "LV-C9999" });
    expect([none.matchedBy, none.coils.length, none.joints.length]).toEqual(["none", 0, 0]);
  });

  it("reads each side through its own index (UNION, not OR) and stays fast among many other joints", async () => {
    // 60,000 joints of other lots around the lot's four.
    await ownerDb().raw(
      `SET SESSION max_recursive_iterations = 100000;
       INSERT INTO joints (client_id, job_id, joint_no, kind, coil_a_id, coil_b_id, outside_diameter_mm, sdr, procedure_version_id, machine_id, heater_id, fuser_id, made_at, plan, outcome, findings)
       WITH RECURSIVE s(n) AS (SELECT 1 UNION ALL SELECT n + 1 FROM s WHERE n < 60000)
       SELECT CONCAT('noise-', n), ?, 1000 + n, 'coil-to-coil', IF(n % 2 = 0, ?, ?), IF(n % 3 = 0, ?, ?), 60.33, 11, ?, ?, ?, ?, TIMESTAMPADD(MINUTE, n, '2026-06-01'), '{}', 'within-limits', '[]' FROM s`,
      [ids["WO-24152"], ids["LV-C0004"], ids["LV-C0007"], ids["LV-C0005"], ids["LV-C0008"], ids.version, ids.machine, ids.heater, ids.fuser],
    );
    await ownerDb().raw("ANALYZE TABLE joints");
    const coilIds = [ids["LV-C0001"]!, ids["LV-C0002"]!];
    const [plan] = (await ownerDb().raw(`EXPLAIN SELECT id FROM joints WHERE coil_a_id IN (?, ?) UNION SELECT id FROM joints WHERE coil_b_id IN (?, ?)`, [...coilIds, ...coilIds])) as [{ table: string | null; key: string | null }[]];
    const keys = plan.filter((row) => row.table === "joints").map((row) => row.key);
    expect(keys).toHaveLength(2);
    expect(keys.every((k) => k && /coil_a_id|coil_b_id/.test(k))).toBe(true);
    const started = performance.now();
    const trace = await traceLot(LOT);
    const elapsedMs = performance.now() - started;
    expect(trace.joints.map((j) => j.id).sort((x, y) => x - y)).toEqual(lotJoints());
    expect(elapsedMs).toBeLessThan(500); // common practice (no published source): an answer "well under a second"
  });

  it("finds a coil by the lot its F2897 code carries as well as its typed lot, and says which", async () => {
    // LV-C0004 is typed as lot 4410388 but carries the code of lot 4410021 (positions 3–6
    // "ivfn" = 4410021, ASTM F2897-23a Tables 1 and 2, worked in tests/domain/coil-life.test.ts).
    await ownerDb()("coils").where("id", ids["LV-C0004"]).update({ trace_code: CODE_LOT_4410021 });
    try {
      const found = await findLotCoils(LOT);
      expect(found.matchedBy).toBe("lot");
      expect(found.lots).toEqual([LOT]);
      expect(found.coils.map((c) => [c.coilCode, c.foundBy])).toEqual([
        ["LV-C0001", "both"],
        ["LV-C0002", "typed-lot"],
        ["LV-C0003", "typed-lot"],
        ["LV-C0004", "code-lot"],
        ["LV-C0012", "typed-lot"],
      ]);
      // The code's lot is compared byte for byte: lot 4509965 is "iVfn" in base 62
      // (18·62³ + 57·62² + 15·62 + 23, ASTM F2897-23a Table 2), which differs from "ivfn" only by case.
      expect((await findLotCoils({ lot: "4509965" })).coils).toEqual([]);
    } finally {
      await ownerDb()("coils").where("id", ids["LV-C0004"]).update({ trace_code: null });
    }
  });

  it("caps a huge answer and says so", async () => {
    const { joints: capped, truncated } = await listJointsForCoils({ coilIds: [ids["LV-C0004"]!], limit: 10 });
    expect(capped).toHaveLength(10);
    expect(truncated).toBe(true);
  });
});

describe("joint → origins", () => {
  it("gives both components with lots and inspections, the machine, the heater's last check before the joint, the fuser's status and the procedure", async () => {
    const origins = (await traceJointOrigins(joints.sideB!))!;
    expect(origins.coilA).toMatchObject({ coilCode: "LV-C0004", lot: "4410388" });
    expect(origins.coilB).toMatchObject({ coilCode: "LV-C0001", lot: "4410021", traceCode: CODE_LOT_4410021 });
    expect(origins.coilB!.inspection).toMatchObject({ passed: true, receivedByName: "Morgan Tull" });
    expect(origins.machine).toMatchObject({ assetTag: "FM-201", pistonAreaMm2: 1006.5 });
    // Made 2026-11-22 10:00: the check of 2026-11-21 06:30 is the last before it (this file's own check history).
    expect(origins.heater.lastCheck).toMatchObject({ instrument: "Contact pyrometer PY-9", nextDueOn: "2026-11-22" });
    expect(origins.heaterCheckInDate).toBe(true);
    expect(origins.procedure).toMatchObject({ code: "LVG-BF-01", versionNo: 1 });
    // source: 49 CFR 192.285(c) — qualified 2026-10-02 (60 days before 2026-12-01): qualified on 2026-11-22
    expect(origins.fuser.qualifiedOn).toEqual(["2026-10-02"]);
    expect(origins.qualification).toMatchObject({ qualified: true, state: "current" });
  });

  it("shows a lapsed fuser as not qualified on the day and a heater check gone stale", async () => {
    const origins = (await traceJointOrigins(joints.fitting!))!;
    // source: 49 CFR 192.285(c) — last qualified 2025-06-29 (520 days before 2026-12-01); 15 months → 2026-09-29 < 2026-11-24
    expect(origins.fuser.qualifiedOn).toEqual(["2025-06-29"]);
    expect(origins.qualification).toMatchObject({ qualified: false, state: "lapsed" });
    expect(origins.heater.lastCheck?.instrument).toBe("Contact pyrometer PY-9");
    expect(origins.heaterCheckInDate).toBe(false); // due 2026-11-22, joint made 2026-11-24
    expect(origins.coilB).toBeNull();
    expect(origins.joint.componentBText).toBe("2 in butt-fusion tee");
  });

  it("finds a joint by id, by job code and joint number in the forms people write, or by its tag's address", async () => {
    const no = Number((await ownerDb()("joints").where("id", joints.sideA).first("joint_no")).joint_no);
    for (const text of [`WO-24117 joint ${no}`, `WO-24117 #${no}`, `WO-24117/${no}`, `WO-24117-${no}`, `http://127.0.0.1:3000/joints/${joints.sideA}`]) {
      expect(await findJointForTrace(text)).toEqual({ ok: true, jointId: joints.sideA });
    }
    expect(await findJointForTrace(String(joints.sideB))).toEqual({ ok: true, jointId: joints.sideB });
    expect(await findJointForTrace("WO-00000 #1")).toEqual({ ok: false, message: 'No joint matches "WO-00000 #1" (read as WO-00000 joint 1): there is no job WO-00000. Give the job code and joint number, e.g. WO-24152 joint 10.' });
    expect(await findJointForTrace("WO-24117 joint 999999")).toEqual({ ok: false, message: 'No joint matches "WO-24117 joint 999999" (read as WO-24117 joint 999999): job WO-24117 has no joint 999999.' });
    expect(await findJointForTrace("http://127.0.0.1:3000/coils/LV-C0003")).toMatchObject({ ok: false, message: expect.stringContaining("coil label's address") });
    expect(await traceJointOrigins(99_999_999)).toBeNull();
  });
});

describe("a cut-out joint and its remake", () => {
  let remake: { id: number; jointNo: number };
  let cutOutNo: number;

  beforeAll(async () => {
    const k = ownerDb();
    const inspector = await userIdByEmail("inspector@larkmoor-gas.example");
    cutOutNo = Number((await k("joints").where("id", joints.sideB).first("joint_no")).joint_no);
    await k("joint_revisions").insert([
      { joint_id: joints.sideB, revision_no: 1, kind: "recorded", by_user_id: ids.fuser, at: new Date("2026-11-22T10:00:00Z"), review_state: "pending-review" },
      { joint_id: joints.sideB, revision_no: 2, kind: "cut-out", by_user_id: inspector, at: new Date("2026-11-22T10:40:00Z"), reason: "Cut out: fusion pressure over the window", review_state: "cut-out" },
    ]);
    await k("joint_states").where("joint_id", joints.sideB).update({ review_state: "cut-out", revision_no: 2 });
    await insertJoint("remake", { job: "WO-24152", a: "LV-C0004", b: "LV-C0003", madeAt: "2026-11-22T11:30:00Z" });
    await k("joints").where("id", joints.remake).update({ replaces_joint_id: joints.sideB });
    await k("joint_states").where("joint_id", joints.sideB).update({ replaced_by_joint_id: joints.remake });
    remake = { id: joints.remake!, jointNo: Number((await k("joints").where("id", joints.remake).first("joint_no")).joint_no) };
  });

  it("lot → ground marks the cut-out joint as replaced and the remake as remaking it", async () => {
    const trace = await traceLot(LOT);
    const cut = trace.joints.find((j) => j.id === joints.sideB)!;
    expect(cut).toMatchObject({ reviewState: "cut-out", replacedBy: { id: remake.id, jobCode: "WO-24152", jointNo: remake.jointNo }, replaces: null });
    const made = trace.joints.find((j) => j.id === remake.id)!;
    expect(made).toMatchObject({ reviewState: "pending-review", replacedBy: null, replaces: { id: joints.sideB, jobCode: "WO-24152", jointNo: cutOutNo } });
  });

  it("joint → origins gives the decision and both links", async () => {
    const cut = (await traceJointOrigins(joints.sideB!))!;
    expect(cut.joint).toMatchObject({ reviewState: "cut-out", replacedBy: { id: remake.id, jointNo: remake.jointNo } });
    expect(cut.decision).toMatchObject({ state: "cut-out", byName: expect.any(String), note: "Cut out: fusion pressure over the window" });
    expect(cut.decision!.at.toISOString()).toBe("2026-11-22T10:40:00.000Z");
    const made = (await traceJointOrigins(remake.id))!;
    expect(made.joint.replaces).toEqual({ id: joints.sideB, jobCode: "WO-24152", jointNo: cutOutNo });
    expect(made.decision).toBeNull();
  });

  it("the lot's workbook and CSV say it in words, read back with exceljs and @fast-csv/parse", async () => {
    const trace = await traceLot(LOT);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load((await traceWorkbook(trace)) as unknown as ArrayBuffer);
    const sheet = book.getWorksheet("Joints")!;
    const headers = (sheet.getRow(1).values as unknown[]).slice(1);
    const rowOf = (id: number) => {
      for (let r = 2; r <= sheet.rowCount; r += 1) {
        const values = sheet.getRow(r).values as unknown[];
        if (values[headers.indexOf("Joint id") + 1] === id) return Object.fromEntries(headers.map((h, i) => [h, values[i + 1]]));
      }
      return null;
    };
    // Words of the product's joint states ("pending review", "accepted", "cut out"), never the stored codes.
    expect(rowOf(joints.sideB!)).toMatchObject({ "Review state": "Cut out", "In the ground": "No: cut out and replaced", "Replaced by": `WO-24152 joint ${remake.jointNo}`, Outcome: "Out of limits" });
    expect(rowOf(remake.id)).toMatchObject({ "Review state": "Pending review", "In the ground": "Yes", Remakes: `WO-24152 joint ${cutOutNo}` });
    const coilStatuses = ((book.getWorksheet("Coils")!.getColumn(10).values as unknown[]).slice(2) as string[]).filter(Boolean);
    for (const status of coilStatuses) expect(status).not.toMatch(/-/); // "In yard", never "in-yard"

    const rows = await new Promise<Record<string, string>[]>((resolve, reject) => {
      const out: Record<string, string>[] = [];
      parseString(traceCsv(trace).replace(/^\uFEFF/, ""), { headers: true })
        .on("data", (row: Record<string, string>) => out.push(row))
        .on("error", reject)
        .on("end", () => resolve(out));
    });
    const csvCut = rows.find((r) => r["Joint id"] === String(joints.sideB))!;
    expect(csvCut).toMatchObject({ "Review state": "Cut out", "Replaced by": `WO-24152 joint ${remake.jointNo}`, "Made at (UTC)": "2026-11-22T10:00:00.000Z" });
    const raw = traceCsv(trace);
    expect(raw).not.toMatch(/cut-out|pending-review|out-of-limits|within-limits|coil-to-coil/);
  });
});
