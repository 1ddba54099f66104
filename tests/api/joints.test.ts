// Recording joints through POST /api/v1/joints and recordJointAction against the real
// database and object store: what one joint writes (joint, revision 1, state, coil pull,
// audit, alert), what is refused and why, idempotency by client id, gap-free numbers under
// concurrency, and the photo upload/download route.
//
// Reference values (outside Beadline's code):
// - Heater surface window 400–450 °F = 204.4–232.2 °C for ASTM F2620 butt fusion
//   // source: ASTM F2620 via the PPI "Melt Procedure" page (CONFIRMED)
// - Gauge pressure = interfacial pressure × fusion area ÷ total effective piston area + drag;
//   fusion area = π·(OD − t)·t with t the published minimum wall (ASTM F2897-23a Table 6: 2" IPS DR 11 0.216 in)
//   // source: PPI generic butt-fusion procedure as reproduced in a pipe maker's manual §6.2.5 (PPI TR-33)
// - A fuser's qualification runs at most 15 months and to 31 Dec of the next year
//   // source: 49 CFR 192.285(c) (CONFIRMED)
import { PNG } from "pngjs";
import { randomUUID } from "node:crypto";
import { beforeEach, describe, expect, it } from "vitest";
import { grantOverrideAction, recordJointAction } from "@/app/(signed-in)/trench/actions";
import { POST as uploadPost } from "@/app/api/v1/attachments/route";
import { GET as attachmentGet } from "@/app/api/v1/attachments/[id]/route";
import { GET as jointsGet, POST as jointsPost } from "@/app/api/v1/joints/route";
import { GET as jointGet } from "@/app/api/v1/joints/[id]/route";
import { GET as planGet } from "@/app/api/v1/fusion-plan/route";
import { builtInProcedure } from "@/domain/procedures";
import { actAs, requestAs } from "../support/session";
import { ownerDb, resetDatabase } from "../support/db";
import { makeUser } from "../support/users";

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- JSON answers are checked field by field below
type ApiBody = Record<string, any>;

const DAY = 86_400_000;
const isoDay = (offsetDays: number) => new Date(Date.now() + offsetDays * DAY).toISOString().slice(0, 10);
const noParams = { params: Promise.resolve({}) };
const idParams = (id: number) => ({ params: Promise.resolve({ id: String(id) }) });

type Base = { jobId: number; procedureId: number; machineId: number; heaterId: number; overdueHeaterId: number; coils: Record<string, number> };

const PISTON_AREA_MM2 = 1006.5;
const DRAG_MPA = 0.07;

/** 2" IPS SDR 11 (OD 60.33 mm, ASTM D2513 / ASME B36.10 IPS size): the demo's pipe. */
const OD_MM = 60.33;
const SDR = 11;

async function makeBase(): Promise<Base> {
  const k = ownerDb();
  const [procedureId] = await k("procedures").insert({ code: "T-F2620", name: "Test butt fusion per ASTM F2620", standard: "astm-f2620" });
  await k("procedure_versions").insert({ procedure_id: procedureId, version_no: 1, definition: JSON.stringify(builtInProcedure("astm-f2620")) });
  const [jobId] = await k("jobs").insert({ code: "WO-T1", name: "Test main", procedure_id: procedureId, status: "open" });
  await k("job_counters").insert({ job_id: jobId, last_joint_no: 0 });
  const [machineId] = await k("fusion_machines").insert({ asset_tag: "FM-T1", min_od_mm: 20, max_od_mm: 300, piston_area_mm2: PISTON_AREA_MM2 });
  const [heaterId] = await k("heater_plates").insert({ asset_tag: "HP-T1", check_interval_days: 1 });
  const [overdueHeaterId] = await k("heater_plates").insert({ asset_tag: "HP-T2", check_interval_days: 1 });
  const check = (heater: number, checkedOn: string, due: string) => ({ heater_id: heater, checked_at: new Date(`${checkedOn}T06:00:00Z`), instrument: "Pyrometer", readings: JSON.stringify({ faceA: [218, 219, 220], faceB: [219, 220, 221] }), window_min_c: 204.4, window_max_c: 232.2, passed: true, next_due_on: due });
  await k("heater_checks").insert(check(Number(heaterId), isoDay(0), isoDay(1)));
  await k("heater_checks").insert(check(Number(overdueHeaterId), isoDay(-3), isoDay(-2)));
  const coil = async (code: string, od: number, status = "in-use", remaining = 152.4) => {
    const [id] = await k("coils").insert({ coil_code: code, manufacturer: "Quillfield Polymers", lot: "4410021", material: "PE4710", series: "ips", nominal_size: od > 100 ? "4" : "2", outside_diameter_mm: od, sdr: SDR, length_m: 152.4, remaining_m: remaining, status, job_id: jobId });
    return Number(id);
  };
  const coils = { A: await coil("T-C0001", OD_MM), B: await coil("T-C0002", OD_MM), big: await coil("T-C0004", 114.3), quarantined: await coil("T-C0009", OD_MM, "quarantined") };
  return { jobId: Number(jobId), procedureId: Number(procedureId), machineId: Number(machineId), heaterId: Number(heaterId), overdueHeaterId: Number(overdueHeaterId), coils };
}

async function qualify(userId: number, procedureId: number, daysAgo: number) {
  await ownerDb()("qualifications").insert({ user_id: userId, procedure_id: procedureId, qualified_on: isoDay(-daysAgo), method: "visual-bend", specimen_result: "acceptable", evaluator: "Test evaluator" });
}

/** Expected fusion gauge window, computed here from the PPI formula (not by Beadline's code). */
function expectedFusionGaugeMpa(ifpPsi: number): number {
  const t = 0.216 * 25.4; // 2" IPS DR 11 minimum wall 0.216 in (ASTM F2897-23a Table 6)
  const area = Math.PI * (OD_MM - t) * t;
  const ifpMpa = (ifpPsi * 4.4482216152605) / (25.4 * 25.4);
  return (ifpMpa * area) / PISTON_AREA_MM2 + DRAG_MPA;
}

function goodJoint(base: Base, extra: Record<string, unknown> = {}) {
  return {
    clientId: randomUUID(),
    jobId: base.jobId,
    kind: "coil-to-coil",
    coilA: "T-C0001",
    coilB: "T-C0002",
    lengthAM: 12.5,
    machineId: base.machineId,
    heaterId: base.heaterId,
    dragPressureMpa: DRAG_MPA,
    heaterTemperatureC: 218, // inside 204.4–232.2 °C (ASTM F2620 400–450 °F)
    fusionGaugeMpa: Math.round(expectedFusionGaugeMpa(75) * 1000) / 1000, // 75 psi interfacial: mid of 60–90 psi
    beadMm: 3.2, // F2620 minimum for 2.375–3.5 in OD is 1/16 in (1.6 mm) // from memory, unconfirmed
    changeoverS: 5, // F2620 maximum for walls 0.17–0.36 in is 8 s // from memory, unconfirmed
    coolingS: 600, // F2620 11 min per inch of wall → 143 s for 0.216 in // from memory, unconfirmed
    timedFields: ["changeover", "cooling"],
    madeAt: new Date(Date.now() - 60_000).toISOString(),
    station: "3+40",
    ambientC: 12,
    shelter: "windbreak",
    facingOk: true,
    alignmentOk: true,
    beadRollbackOk: true,
    vGrooveOk: true,
    ...extra,
  };
}

async function post(user: { id: number } | null, body: unknown) {
  const response = await jointsPost(await requestAs(user, "/api/v1/joints", { method: "POST", json: body }), noParams);
  return { status: response.status, body: (await response.json()) as ApiBody };
}

async function counts() {
  const k = ownerDb();
  const n = async (t: string) => Number(((await k(t).count({ n: "*" }).first()) as { n: number }).n);
  return { joints: await n("joints"), revisions: await n("joint_revisions"), states: await n("joint_states"), audit: Number(((await k("audit_log").where({ action: "joint-recorded" }).count({ n: "*" }).first()) as { n: number }).n), attachments: await n("attachments"), coilEvents: Number(((await k("coil_events").whereNotNull("joint_id").count({ n: "*" }).first()) as { n: number }).n) };
}

async function numbersOnJob(jobId: number): Promise<number[]> {
  return ((await ownerDb()("joints").where({ job_id: jobId }).orderBy("joint_no").select("joint_no")) as { joint_no: number }[]).map((r) => r.joint_no);
}

const NOTHING = { joints: 0, revisions: 0, states: 0, audit: 0, attachments: 0, coilEvents: 0 };

describe("recording a joint", () => {
  let base: Base;
  let fuser: { id: number };
  let inspector: { id: number; roles: string[] };

  beforeEach(async () => {
    await resetDatabase();
    base = await makeBase();
    fuser = await makeUser({ roles: ["fuser"], name: "Test Fuser" });
    inspector = await makeUser({ roles: ["inspector"], name: "Ivy Inspector" });
    await makeUser({ roles: ["admin"], name: "Ada Admin" });
    await qualify(fuser.id, base.procedureId, 60);
  });

  it("happy path: 201, joint 1 within limits, revision 1 pending review, state, coil pull and audit in one go", async () => {
    // The domain's plan agrees with the PPI formula worked out here.
    const plan = await planGet(await requestAs(fuser, `/api/v1/fusion-plan?jobId=${base.jobId}&machineId=${base.machineId}&coil=T-C0001&dragPressureMpa=${DRAG_MPA}`), noParams);
    expect(plan.status).toBe(200);
    const planBody = (await plan.json()) as { plan: { fusionGaugePressureMpa: { min: number; max: number }; heaterTemperatureC: { min: number; max: number } } };
    expect(planBody.plan.fusionGaugePressureMpa.min).toBeCloseTo(expectedFusionGaugeMpa(60), 6);
    expect(planBody.plan.fusionGaugePressureMpa.max).toBeCloseTo(expectedFusionGaugeMpa(90), 6);
    expect(planBody.plan.heaterTemperatureC.min).toBeCloseTo(((400 - 32) * 5) / 9, 6);
    expect(planBody.plan.heaterTemperatureC.max).toBeCloseTo(((450 - 32) * 5) / 9, 6);

    const body = goodJoint(base);
    const r = await post(fuser, body);
    expect(r.status).toBe(201);
    expect(r.body.joint).toMatchObject({ jointNo: 1, outcome: "within-limits", findings: [], reviewState: "pending-review", jobCode: "WO-T1" });
    const k = ownerDb();
    const joint = await k("joints").where({ client_id: body.clientId }).first();
    expect(joint).toMatchObject({ joint_no: 1, fuser_id: fuser.id, outcome: "within-limits", heater_temperature_c: 218, timed_fields: "changeover,cooling", coil_a_id: base.coils.A, coil_b_id: base.coils.B });
    expect(JSON.parse(joint.plan).procedureLabel).toBe("ASTM F2620 butt fusion");
    expect(await k("joint_revisions").where({ joint_id: joint.id })).toMatchObject([{ revision_no: 1, kind: "recorded", review_state: "pending-review", by_user_id: fuser.id }]);
    expect(await k("joint_states").where({ joint_id: joint.id }).first()).toMatchObject({ review_state: "pending-review", outcome: "within-limits", revision_no: 1 });
    expect(Number((await k("coils").where({ id: base.coils.A }).first()).remaining_m)).toBeCloseTo(152.4 - 12.5, 2);
    expect(await k("coil_events").where({ joint_id: joint.id })).toHaveLength(1);
    const audit = await k("audit_log").where({ action: "joint-recorded", entity_id: String(joint.id) });
    expect(audit).toHaveLength(1);
    expect(audit[0].request_id).toBeTruthy();
    expect(Number((await k("job_counters").where({ job_id: base.jobId }).first()).last_joint_no)).toBe(1);
    expect(await k("notifications")).toHaveLength(0); // no alert for a joint within limits

    // The joint reads back through GET /api/v1/joints/:id with its revision.
    const one = await jointGet(await requestAs(inspector, `/api/v1/joints/${joint.id}`), idParams(joint.id));
    expect(one.status).toBe(200);
    const oneBody = (await one.json()) as { joint: { revisions: unknown[]; values: { heaterTemperatureC: number } } };
    expect(oneBody.joint.values.heaterTemperatureC).toBe(218);
    expect(oneBody.joint.revisions).toHaveLength(1);
  });

  it("the server action records the same way (and checks on the server, whatever the device said)", async () => {
    await actAs(fuser);
    const r = await recordJointAction({ ...goodJoint(base), outcome: "within-limits", heaterTemperatureC: 190 } as never);
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.data.created).toBe(true);
      expect(r.data.joint.outcome).toBe("out-of-limits"); // the device's "outcome" field is ignored
    }
  });

  it("an out-of-limits joint goes to review with the right findings and an alert for inspectors", async () => {
    // 190 °C is below the 204.4 °C floor of 400–450 °F; a V-groove below the surface fails the visual bead check.
    const r = await post(fuser, goodJoint(base, { heaterTemperatureC: 190, vGrooveOk: false }));
    expect(r.status).toBe(201);
    expect(r.body.joint.outcome).toBe("out-of-limits");
    const findings = r.body.joint.findings as { parameter: string; kind: string; message: string }[];
    expect(findings.map((f) => [f.parameter, f.kind])).toEqual([
      ["heaterTemperature", "below-minimum"],
      ["visualBead", "check-failed"],
    ]);
    expect(findings[0].message).toContain("190 °C");
    expect(r.body.joint.advice).toMatch(/Cut it out and remake it/);
    const joint = await ownerDb()("joints").where({ id: r.body.joint.id }).first();
    expect(joint.finding_parameters).toBe("heaterTemperature,visualBead");
    expect(await ownerDb()("joint_states").where({ joint_id: joint.id }).first()).toMatchObject({ review_state: "pending-review", outcome: "out-of-limits" });
    const mail = await ownerDb()("notifications");
    expect(mail.length).toBeGreaterThanOrEqual(1);
  });

  it("a remake links to the joint it replaces, once", async () => {
    const bad = await post(fuser, goodJoint(base, { coolingS: 30 }));
    expect(bad.body.joint.outcome).toBe("out-of-limits");
    const remake = await post(fuser, goodJoint(base, { replacesJointId: bad.body.joint.id }));
    expect(remake.status).toBe(201);
    expect(remake.body.joint).toMatchObject({ jointNo: 2, replacesJointId: bad.body.joint.id, replacesJointNo: 1 });
    expect(await ownerDb()("joint_states").where({ joint_id: bad.body.joint.id }).first()).toMatchObject({ replaced_by_joint_id: remake.body.joint.id });
    const again = await post(fuser, goodJoint(base, { replacesJointId: bad.body.joint.id }));
    expect(again.status).toBe(409);
    expect(again.body.error.fields.replacesJointId[0]).toMatch(/already been remade/);
    const good = remake.body.joint.id;
    const notBad = await post(fuser, goodJoint(base, { replacesJointId: good }));
    expect(notBad.status).toBe(422);
    expect(Number((await ownerDb()("job_counters").where({ job_id: base.jobId }).first()).last_joint_no)).toBe(2); // refused ones left no gap
  });

  it("refuses a fuser whose qualification lapsed (49 CFR 192.285(c)), says who to ask, writes nothing", async () => {
    const lapsed = await makeUser({ roles: ["fuser"] });
    await qualify(lapsed.id, base.procedureId, 520); // 17 months ago: past the 15-month limit
    const r = await post(lapsed, goodJoint(base));
    expect(r.status).toBe(403);
    expect(r.body.error.code).toBe("forbidden");
    expect(r.body.error.message).toMatch(/ran out on/);
    expect(r.body.error.message).toContain("Ada Admin");
    const never = await makeUser({ roles: ["fuser"] });
    expect((await post(never, goodJoint(base))).status).toBe(403);
    expect(await counts()).toEqual(NOTHING);
    expect(Number((await ownerDb()("job_counters").where({ job_id: base.jobId }).first()).last_joint_no)).toBe(0);
  });

  it("signed out gets 401, an inspector posting a joint 403", async () => {
    expect((await post(null, goodJoint(base))).status).toBe(401);
    expect((await post(inspector, goodJoint(base))).status).toBe(403);
    expect(await counts()).toEqual(NOTHING);
  });

  it("a duplicate client id gives one joint: 201 then 200 with the same joint, also when copies race", async () => {
    const body = goodJoint(base);
    const first = await post(fuser, body);
    const second = await post(fuser, body);
    expect([first.status, second.status]).toEqual([201, 200]);
    expect(second.body.joint.id).toBe(first.body.joint.id);

    const raced = goodJoint(base);
    const results = await Promise.all(Array.from({ length: 6 }, () => post(fuser, raced)));
    expect(results.filter((r) => r.status === 201)).toHaveLength(1);
    expect(results.filter((r) => r.status === 200)).toHaveLength(5);
    expect(new Set(results.map((r) => r.body.joint.id)).size).toBe(1);
    const c = await counts();
    expect(c.joints).toBe(2);
    expect(c.revisions).toBe(2);
    expect(c.audit).toBe(2);
    expect(Number((await ownerDb()("job_counters").where({ job_id: base.jobId }).first()).last_joint_no)).toBe(2);
    // Someone else re-using the id is a conflict, not their joint.
    const other = await makeUser({ roles: ["fuser"] });
    await qualify(other.id, base.procedureId, 10);
    expect((await post(other, body)).status).toBe(409);
  });

  // Same key, other payload → refused, never the first answer again (IETF
  // draft-ietf-httpapi-idempotency-key-header-07, "Error Handling"; we answer 409).
  it("a used client id with the same submission answers 200 with its joint; with other values 409 naming the field, writing nothing", async () => {
    const body = goodJoint(base);
    const first = await post(fuser, body);
    expect(first.status).toBe(201);
    const stored = await ownerDb()("joints").where({ id: first.body.joint.id }).first();
    expect(stored.submission_sha256).toMatch(/^[0-9a-f]{64}$/); // SHA-256: 256 bits, 64 hex digits (FIPS 180-4)

    // The same submission written differently: the instant at another offset (RFC 3339 §4.2),
    // the current name of the fusion gauge pressure, the phases in another order, coil A by the label's path.
    const { fusionGaugeMpa, ...rest } = body as ReturnType<typeof goodJoint> & { fusionGaugeMpa: number };
    const madeAt = new Date(body.madeAt as string);
    const plusOne = new Date(madeAt.getTime() + 3_600_000).toISOString().replace("Z", "+01:00");
    const again = await post(fuser, { ...rest, fusionGaugePressureMpa: fusionGaugeMpa, madeAt: plusOne, timedFields: ["cooling", "changeover"], coilA: "/coils/T-C0001" });
    expect(again.status).toBe(200);
    expect(again.body.created).toBe(false);
    expect(again.body.joint.id).toBe(first.body.joint.id);

    const before = await counts();
    const other = await post(fuser, { ...body, heaterTemperatureC: 190, beadMm: 4.5 });
    expect(other.status).toBe(409);
    expect(other.body.error.code).toBe("conflict");
    expect(other.body.error.message).toContain("already used for joint 1 on WO-T1");
    expect(other.body.error.message).toContain("heater temperature, bead size");
    expect(Object.keys(other.body.error.fields).sort()).toEqual(["beadMm", "clientId", "heaterTemperatureC"]);
    expect(other.body.error.fields.heaterTemperatureC[0]).toBe("Heater temperature: 218 °C recorded as joint 1 on WO-T1, 190 °C in this submission.");
    expect(await counts()).toEqual(before);

    // The server action refuses the same way.
    await actAs(fuser);
    const viaAction = await recordJointAction({ ...body, station: "4+00" } as never);
    expect(viaAction.ok).toBe(false);
    if (!viaAction.ok) {
      expect(viaAction.status).toBe(409);
      expect(viaAction.fields?.station?.[0]).toBe("Station: 3+40 recorded as joint 1 on WO-T1, 4+00 in this submission.");
    }
    const sameViaAction = await recordJointAction(body as never);
    expect(sameViaAction.ok && sameViaAction.data.created === false && sameViaAction.data.joint.id === first.body.joint.id).toBe(true);

    // Sent as a new joint (a fresh client id), the other values are recorded as joint 2.
    const asNew = await post(fuser, { ...body, clientId: randomUUID(), heaterTemperatureC: 190, beadMm: 4.5 });
    expect(asNew.status).toBe(201);
    expect(asNew.body.joint.jointNo).toBe(2);
  });

  it("two different submissions racing under one client id: one 201, the other 409; the joint holds the winner's values", async () => {
    for (let round = 0; round < 3; round += 1) {
      const clientId = randomUUID();
      const a = goodJoint(base, { clientId, lengthAM: 1, heaterTemperatureC: 218 });
      const b = goodJoint(base, { clientId, lengthAM: 1, heaterTemperatureC: 222 });
      const [ra, rb] = await Promise.all([post(fuser, a), post(fuser, b)]);
      expect([ra.status, rb.status].sort()).toEqual([201, 409]);
      const [won, lost] = ra.status === 201 ? [ra, rb] : [rb, ra];
      const wonTemperature = ra.status === 201 ? 218 : 222;
      expect(Object.keys(lost.body.error.fields)).toContain("heaterTemperatureC");
      expect(lost.body.error.message).toContain(`joint ${won.body.joint.jointNo} on WO-T1`);
      const rows = await ownerDb()("joints").where({ client_id: clientId });
      expect(rows).toHaveLength(1);
      expect(Number(rows[0].heater_temperature_c)).toBe(wonTemperature);
    }
    const c = await counts();
    expect([c.joints, c.revisions, c.audit, c.coilEvents]).toEqual([3, 3, 3, 3]);
  });

  it("a joint recorded before fingerprints were kept is compared value by value, at the resolution it is stored at", async () => {
    const body = goodJoint(base);
    const first = await post(fuser, body);
    expect(first.status).toBe(201);
    await ownerDb()("joints").where({ id: first.body.joint.id }).update({ submission_sha256: null });
    // heater_temperature_c is DECIMAL(6,1): 218.04 is kept as 218.0 (MariaDB rounds to the scale).
    const same = await post(fuser, { ...body, heaterTemperatureC: 218.04 });
    expect(same.status).toBe(200);
    expect(same.body.joint.id).toBe(first.body.joint.id);
    const other = await post(fuser, { ...body, coolingS: 700 });
    expect(other.status).toBe(409);
    expect(Object.keys(other.body.error.fields).sort()).toEqual(["clientId", "coolingS"]);
  });

  it("20 concurrent submissions on one job get 20 distinct, gap-free numbers", async () => {
    const results = await Promise.all(Array.from({ length: 20 }, () => post(fuser, goodJoint(base, { lengthAM: 1 }))));
    expect(results.map((r) => r.status)).toEqual(Array(20).fill(201));
    const numbers = results.map((r) => r.body.joint.jointNo as number).sort((a, b) => a - b);
    expect(numbers).toEqual(Array.from({ length: 20 }, (_, i) => i + 1));
    const rows = await ownerDb()("joints").where({ job_id: base.jobId }).orderBy("joint_no").select("joint_no");
    expect(rows.map((r) => r.joint_no)).toEqual(numbers);
    expect(Number((await ownerDb()("coils").where({ id: base.coils.A }).first()).remaining_m)).toBeCloseTo(152.4 - 20, 2);
  });

  // design rule: joint numbers are unique and gap-free per job whatever the interleaving. The
  // coils are locked (in id order) before the job's counter, so submissions that share coils
  // across jobs neither wait on each other in a circle nor lose a pull.
  it("30 concurrent submissions on one job beside 10 on another job using the same coils: numbers 1..30 and 1..10, every pull drawn once", async () => {
    const k = ownerDb();
    const [secondJobId] = await k("jobs").insert({ code: "WO-T2", name: "Second main", procedure_id: base.procedureId, status: "open" });
    await k("job_counters").insert({ job_id: secondJobId, last_joint_no: 0 });
    // Job 1: a third pull 1 m from coil A, a third only name the coils, a third pull 0.5 m from coil B (as side A).
    const onFirst = Array.from({ length: 30 }, (_, i) =>
      i % 3 === 0 ? goodJoint(base, { lengthAM: 1 }) : i % 3 === 1 ? goodJoint(base, { lengthAM: undefined }) : goodJoint(base, { coilA: "T-C0002", coilB: "T-C0001", lengthAM: 0.5 }),
    );
    // Job 2: each pulls 1 m from coil A.
    const onSecond = Array.from({ length: 10 }, () => goodJoint(base, { jobId: Number(secondJobId), lengthAM: 1 }));
    const results = await Promise.all([...onFirst, ...onSecond].map((b) => post(fuser, b)));
    expect(results.map((r) => r.status)).toEqual(Array(40).fill(201));
    expect(await numbersOnJob(base.jobId)).toEqual(Array.from({ length: 30 }, (_, i) => i + 1));
    expect(await numbersOnJob(Number(secondJobId))).toEqual(Array.from({ length: 10 }, (_, i) => i + 1));
    // Each answer names the number its joint was stored under.
    for (const r of results) expect((await k("joints").where({ id: r.body.joint.id }).first("joint_no")).joint_no).toBe(r.body.joint.jointNo);
    // common practice (no published source): 152.40 − 10 × 1 − 10 × 1 = 132.40 m on A; 152.40 − 10 × 0.5 = 147.40 m on B.
    expect(Number((await k("coils").where({ id: base.coils.A }).first()).remaining_m)).toBeCloseTo(132.4, 2);
    expect(Number((await k("coils").where({ id: base.coils.B }).first()).remaining_m)).toBeCloseTo(147.4, 2);
    const c = await counts();
    expect([c.joints, c.revisions, c.states, c.audit, c.coilEvents]).toEqual([40, 40, 40, 40, 30]);
    expect(Number((await k("job_counters").where({ job_id: base.jobId }).first()).last_joint_no)).toBe(30);
    expect(Number((await k("job_counters").where({ job_id: secondJobId }).first()).last_joint_no)).toBe(10);
  });

  // design rule: a failure halfway writes nothing, and a refused joint takes no number.
  it("a submission refused inside the transaction, also after its number was taken, leaves no joint, revision, state, coil pull or audit row, and the next joint gets the next number", async () => {
    const k = ownerDb();
    const first = await post(fuser, goodJoint(base));
    expect(first.body.joint.jointNo).toBe(1);
    const before = await counts();
    const coilALeft = Number((await k("coils").where({ id: base.coils.A }).first()).remaining_m);
    // A photo that is not on file is found out only when the joint takes it: after the number and the joint row.
    const missingPhoto = await post(fuser, goodJoint(base, { photoIds: [987654] }));
    expect(missingPhoto.status).toBe(422);
    expect(Object.keys(missingPhoto.body.error.fields)).toEqual(["photoIds"]);
    // A pull longer than the coil has left is refused under the coil's lock, before the number.
    const tooLong = await post(fuser, goodJoint(base, { lengthAM: 500 }));
    expect(tooLong.status).toBe(422);
    expect(tooLong.body.error.fields.lengthAM[0]).toMatch(/has only .* left/);
    expect(await counts()).toEqual(before);
    expect(await k("notifications")).toHaveLength(0);
    expect(Number((await k("coils").where({ id: base.coils.A }).first()).remaining_m)).toBe(coilALeft);
    expect(Number((await k("job_counters").where({ job_id: base.jobId }).first()).last_joint_no)).toBe(1);
    const next = await post(fuser, goodJoint(base));
    expect(next.status).toBe(201);
    expect(next.body.joint.jointNo).toBe(2);
    expect(await numbersOnJob(base.jobId)).toEqual([1, 2]);
  });

  // The answer to a new joint is built from what was written; it must be what the database
  // gives back. Reference: MariaDB itself — DECIMAL columns keep a value rounded to their scale
  // (half away from zero); the resubmission's answer is read from the stored row.
  it("the answer that records a joint is the one its stored row gives (values rounded as their columns keep them, in the reader's units)", async () => {
    const usFuser = await makeUser({ roles: ["fuser"], name: "Uma Us", unitSystem: "us" });
    await qualify(usFuser.id, base.procedureId, 30);
    const bodies = [
      // More digits than the columns keep, halves on both sides of zero, out of limits so the
      // findings carry the measured values: 1.005 and 12.35 lie just below their halves in binary,
      // but MariaDB rounds the decimal text it is sent (1.01 mm, 12.4 s).
      goodJoint(base, { heaterTemperatureC: 190.05, ambientC: -3.25, beadMm: 1.005, coolingS: 30.05, changeoverS: 12.35, fusionGaugeMpa: 0.51710745 }),
      goodJoint(base, { ambientC: 0.04, beadMm: 3.2049, fusionGaugeMpa: Math.round(expectedFusionGaugeMpa(75) * 1e7) / 1e7, lengthAM: undefined }),
    ];
    for (const user of [fuser, usFuser]) {
      for (const body of bodies) {
        const made = await post(user, { ...body, clientId: randomUUID() });
        expect(made.status).toBe(201);
        const again = await post(user, { ...body, clientId: made.body.joint.clientId });
        expect(again.status).toBe(200);
        const { warnings: _w, ...recorded } = made.body.joint;
        const { warnings: _again, ...stored } = again.body.joint;
        expect(recorded).toEqual(stored);
      }
    }
  });

  it("bad input gives 422 naming every field and writes nothing", async () => {
    const missing = await post(fuser, { clientId: randomUUID(), jobId: base.jobId, kind: "coil-to-coil" });
    expect(missing.status).toBe(422);
    expect(Object.keys(missing.body.error.fields)).toEqual(expect.arrayContaining(["coilA", "machineId", "heaterId", "heaterTemperatureC", "fusionGaugeMpa", "beadMm", "changeoverS", "coolingS", "madeAt", "ambientC", "shelter", "facingOk", "coilB"]));
    expect(missing.body.error.fields.heaterTemperatureC[0]).toBe("Enter the heater temperature.");

    const strings = await post(fuser, goodJoint(base, { heaterTemperatureC: "218", coolingS: "600" }));
    expect(strings.status).toBe(422);
    expect(strings.body.error.fields.heaterTemperatureC[0]).toBe("Heater temperature must be a number.");
    expect(strings.body.error.fields.coolingS[0]).toBe("Cooling time must be a number.");

    const negative = await post(fuser, goodJoint(base, { coolingS: -5, changeoverS: -1 }));
    expect(negative.status).toBe(422);
    expect(negative.body.error.fields.coolingS[0]).toBe("Cooling time cannot be negative.");
    expect(negative.body.error.fields.changeoverS[0]).toBe("Changeover time cannot be negative.");

    const notJson = await jointsPost(await requestAs(fuser, "/api/v1/joints", { method: "POST", body: "{not json", headers: { "content-type": "application/json" } }), noParams);
    expect(notJson.status).toBe(400);

    const future = await post(fuser, goodJoint(base, { madeAt: new Date(Date.now() + 3 * 3_600_000).toISOString() }));
    expect(future.status).toBe(422);
    expect(future.body.error.fields.madeAt[0]).toMatch(/future/);

    const unknownCoil = await post(fuser, goodJoint(base, { coilB: "NO-SUCH-COIL" }));
    expect(unknownCoil.status).toBe(422);
    expect(unknownCoil.body.error.fields.coilB[0]).toMatch(/No coil "NO-SUCH-COIL"/);

    // Different OD on the two sides cannot be butt fused (ASTM F2620 scope: same-size ends).
    const mismatch = await post(fuser, goodJoint(base, { coilB: "T-C0004" }));
    expect(mismatch.status).toBe(422);
    expect(mismatch.body.error.fields.coilB[0]).toMatch(/same size/);

    const tooLong = await post(fuser, goodJoint(base, { lengthAM: 500 }));
    expect(tooLong.status).toBe(422);
    expect(tooLong.body.error.fields.lengthAM[0]).toMatch(/only/);

    expect(await counts()).toEqual(NOTHING);
  });

  it("an overdue heater check or a quarantined coil blocks until an inspector clears it; the override is recorded", async () => {
    const blocked = await post(fuser, goodJoint(base, { heaterId: base.overdueHeaterId }));
    expect(blocked.status).toBe(409);
    expect(blocked.body.error.fields.override[0]).toMatch(/HP-T2: surface-temperature check overdue since \d{1,2} [A-Z][a-z]{2,3} \(due \d{4}-\d{2}-\d{2}\)/);
    expect(blocked.body.error.fields.override[0]).toContain("Ivy Inspector");
    const quarantined = await post(fuser, goodJoint(base, { coilB: "T-C0009" }));
    expect(quarantined.status).toBe(409);
    expect(quarantined.body.error.fields.override[0]).toMatch(/T-C0009 is quarantined/);
    expect(await counts()).toEqual(NOTHING);

    await actAs(fuser);
    expect((await grantOverrideAction({ jobId: base.jobId, subject: "heater", subjectId: base.overdueHeaterId, reason: "Checked by phone: pyrometer reading 220 °C" })).ok).toBe(false);
    await actAs(inspector);
    const grant = await grantOverrideAction({ jobId: base.jobId, subject: "heater", subjectId: base.overdueHeaterId, reason: "Plate checked on site at 220 °C, log to follow", hours: 4 });
    expect(grant.ok).toBe(true);
    const again = await post(fuser, goodJoint(base, { heaterId: base.overdueHeaterId }));
    expect(again.status).toBe(201);
    const uses = await ownerDb()("joint_override_uses").where({ joint_id: again.body.joint.id });
    expect(uses).toHaveLength(1);
    expect(uses[0].block_kind).toBe("heater-check-overdue");
    expect(await ownerDb()("audit_log").where({ action: "block-override-granted", actor_user_id: inspector.id })).toHaveLength(1);
  });

  it("a coil assigned to another crew's job blocks until an inspector clears it; cleared, it is drawn down and the override named", async () => {
    const k = ownerDb();
    const [northId] = await k("crews").insert({ name: "North crew", trailer: "Trailer T-7" });
    const [riverId] = await k("crews").insert({ name: "River crew", trailer: "Trailer T-9" });
    await k("jobs").where({ id: base.jobId }).update({ crew_id: northId });
    const [riverJob] = await k("jobs").insert({ code: "WO-T2", name: "Orchard Rise service extension", procedure_id: base.procedureId, status: "open", crew_id: riverId });
    const [northJob] = await k("jobs").insert({ code: "WO-T3", name: "Fenwick Lane main renewal", procedure_id: base.procedureId, status: "open", crew_id: northId });
    const coil = async (code: string, jobId: number) => Number((await k("coils").insert({ coil_code: code, manufacturer: "Quillfield Polymers", lot: "4410021", material: "PE4710", series: "ips", nominal_size: "2", outside_diameter_mm: OD_MM, sdr: SDR, length_m: 152.4, remaining_m: 152.4, status: "in-use", job_id: jobId }))[0]);
    const riverCoil = await coil("T-C0020", Number(riverJob));
    await coil("T-C0021", Number(northJob));
    const north = await makeUser({ roles: ["fuser"], name: "Nell North", crewId: Number(northId) });
    await qualify(north.id, base.procedureId, 30);

    const blocked = await post(north, goodJoint(base, { coilB: "T-C0020", lengthBM: 4 }));
    expect(blocked.status).toBe(409);
    expect(blocked.body.error.fields.override[0]).toBe(
      "Coil T-C0020 is assigned to job WO-T2 (Orchard Rise service extension) of the River crew, not to this job. Use one of your crew's coils, or ask Ivy Inspector to clear it for this job before drawing it down.",
    );
    expect(await counts()).toEqual(NOTHING);
    expect(Number((await k("coils").where({ id: riverCoil }).first()).remaining_m)).toBe(152.4);

    // A coil on another job of one's own crew is free to use.
    expect((await post(north, goodJoint(base, { coilB: "T-C0021" }))).status).toBe(201);

    // The fuser cannot clear it; an inspector does, with a reason, for this job.
    await actAs(north);
    expect((await grantOverrideAction({ jobId: base.jobId, subject: "coil", subjectId: riverCoil, reason: "River crew lent us this coil today" })).ok).toBe(false);
    await actAs(inspector);
    const grant = await grantOverrideAction({ jobId: base.jobId, subject: "coil", subjectId: riverCoil, reason: "River crew lent this coil for the Fenwick tie-in, agreed by phone", hours: 4 });
    expect(grant.ok).toBe(true);
    const cleared = await post(north, goodJoint(base, { coilB: "T-C0020", lengthBM: 4 }));
    expect(cleared.status).toBe(201);
    const uses = await k("joint_override_uses as u").join("joint_overrides as o", "o.id", "u.override_id").where({ "u.joint_id": cleared.body.joint.id }).select("u.block_kind", "u.message", "o.granted_by", "o.reason");
    expect(uses).toEqual([{ block_kind: "coil-other-crew", message: expect.stringContaining("WO-T2"), granted_by: inspector.id, reason: "River crew lent this coil for the Fenwick tie-in, agreed by phone" }]);
    // Cleared, the pull is drawn down from the coil like any other (152.4 − 4 m).
    expect(Number((await k("coils").where({ id: riverCoil }).first()).remaining_m)).toBeCloseTo(148.4, 2);
    expect(await k("coil_events").where({ coil_id: riverCoil, joint_id: cleared.body.joint.id })).toHaveLength(1);
  });

  it("the plan and one-joint routes name bad input: 422 for a missing pipe, 404 for an unknown machine or joint, 400 for a bad id", async () => {
    const noPipe = await planGet(await requestAs(fuser, `/api/v1/fusion-plan?jobId=${base.jobId}&machineId=${base.machineId}`), noParams);
    expect(noPipe.status).toBe(422);
    expect(((await noPipe.json()) as ApiBody).error.fields.coil[0]).toMatch(/Give a coil/);
    const badDrag = await planGet(await requestAs(fuser, `/api/v1/fusion-plan?jobId=${base.jobId}&machineId=${base.machineId}&coil=T-C0001&dragPressureMpa=-1`), noParams);
    expect(badDrag.status).toBe(422);
    expect((await planGet(await requestAs(fuser, `/api/v1/fusion-plan?jobId=${base.jobId}&machineId=999999&coil=T-C0001`), noParams)).status).toBe(404);
    expect((await planGet(await requestAs(null, `/api/v1/fusion-plan?jobId=${base.jobId}&machineId=${base.machineId}&coil=T-C0001`), noParams)).status).toBe(401);
    // By size instead of a coil: 4" IPS SDR 11 under the same procedure.
    const bySize = await planGet(await requestAs(fuser, `/api/v1/fusion-plan?jobId=${base.jobId}&machineId=${base.machineId}&outsideDiameterMm=114.3&sdr=11`), noParams);
    expect(bySize.status).toBe(200);
    expect(((await bySize.json()) as ApiBody).plan.wallMm).toBeCloseTo(0.409 * 25.4, 6); // 4" IPS DR 11 minimum wall 0.409 in (ASTM F2897-23a Table 6)
    expect((await jointGet(await requestAs(fuser, "/api/v1/joints/999999"), idParams(999999))).status).toBe(404);
    expect((await jointGet(await requestAs(fuser, "/api/v1/joints/abc"), { params: Promise.resolve({ id: "abc" }) })).status).toBe(400);
  });

  it("lists joints: a fuser sees their own, by client id too", async () => {
    const body = goodJoint(base);
    await post(fuser, body);
    const other = await makeUser({ roles: ["fuser"] });
    await qualify(other.id, base.procedureId, 5);
    await post(other, goodJoint(base));
    const mine = await jointsGet(await requestAs(fuser, "/api/v1/joints"), noParams);
    const list = (await mine.json()) as { joints: { clientId: string }[] };
    expect(list.joints.map((j) => j.clientId)).toEqual([body.clientId]);
    const all = (await (await jointsGet(await requestAs(inspector, "/api/v1/joints"), noParams)).json()) as { joints: unknown[] };
    expect(all.joints).toHaveLength(2);
    const byId = (await (await jointsGet(await requestAs(inspector, `/api/v1/joints?clientId=${body.clientId}`), noParams)).json()) as { joints: unknown[] };
    expect(byId.joints).toHaveLength(1);
  });

  it("pulling pipe from a coil within 30 minutes of a joint on it warns, names that joint and is audited; later, or with no pull, it does not", async () => {
    // PPI generic butt-fusion procedure (as reproduced in a pipe maker's manual): no pulling,
    // installation or rough handling for 30 minutes after cooling in the machine.
    const minutesAgo = (m: number) => new Date(Date.now() - m * 60_000).toISOString();
    const first = await post(fuser, goodJoint(base, { madeAt: minutesAgo(20) }));
    expect(first.status).toBe(201);
    expect(first.body.joint.warnings).toEqual([]);

    const soon = await post(fuser, goodJoint(base, { madeAt: minutesAgo(1), lengthAM: 5 }));
    expect(soon.status).toBe(201);
    expect(soon.body.joint.outcome).toBe("within-limits"); // a caution, not a finding
    expect(soon.body.joint.warnings).toHaveLength(1);
    expect(soon.body.joint.warnings[0]).toContain("T-C0001");
    expect(soon.body.joint.warnings[0]).toContain("WO-T1 joint 1");
    expect(soon.body.joint.warnings[0]).toContain("19 minutes"); // 20 − 1 minutes apart
    const audit = await ownerDb()("audit_log").where({ action: "joint-recorded", entity_id: soon.body.joint.id }).first("details");
    expect(JSON.parse(audit.details).warnings).toEqual(soon.body.joint.warnings);

    const noPull = await post(fuser, goodJoint(base, { madeAt: minutesAgo(0.5), lengthAM: undefined }));
    expect(noPull.body.joint.warnings).toEqual([]);
  });

  it("a pull 45 minutes after the last joint on the coil gives no handling warning", async () => {
    const minutesAgo = (m: number) => new Date(Date.now() - m * 60_000).toISOString();
    expect((await post(fuser, goodJoint(base, { madeAt: minutesAgo(46) }))).status).toBe(201);
    const later = await post(fuser, goodJoint(base, { madeAt: minutesAgo(1), lengthAM: 5 }));
    expect(later.status).toBe(201);
    expect(later.body.joint.warnings).toEqual([]);
  });
});

describe("bead photos", () => {
  let base: Base;
  let fuser: { id: number };

  beforeEach(async () => {
    await resetDatabase();
    base = await makeBase();
    fuser = await makeUser({ roles: ["fuser"] });
    await qualify(fuser.id, base.procedureId, 30);
  });

  function pngBytes(): Uint8Array {
    const png = new PNG({ width: 4, height: 3 });
    png.data.fill(200);
    return new Uint8Array(PNG.sync.write(png));
  }

  async function upload(user: { id: number } | null, bytes: Uint8Array, name: string, type: string) {
    const form = new FormData();
    form.set("kind", "bead-photo");
    form.set("file", new Blob([bytes as BlobPart], { type }), name);
    const response = await uploadPost(await requestAs(user, "/api/v1/attachments", { method: "POST", body: form }), noParams);
    return { status: response.status, body: (await response.json()) as ApiBody };
  }

  it("stores a PNG privately under a generated key, serves it with its type, nosniff and a disposition, and ties it to the joint", async () => {
    const bytes = pngBytes();
    const up = await upload(fuser, bytes, "../../etc/bead.png", "application/octet-stream");
    expect(up.status).toBe(201);
    expect(up.body.attachment).toMatchObject({ contentType: "image/png", sizeBytes: bytes.byteLength });
    const row = await ownerDb()("attachments").where({ id: up.body.attachment.id }).first();
    expect(row.object_key).toMatch(/^bead-photos\/[0-9a-f-]{36}$/);
    expect(row.object_key).not.toContain("bead.png");
    expect(row.original_name).toBe("bead.png");

    const get = await attachmentGet(await requestAs(fuser, `/api/v1/attachments/${row.id}`), idParams(row.id));
    expect(get.status).toBe(200);
    expect(get.headers.get("content-type")).toBe("image/png");
    expect(get.headers.get("x-content-type-options")).toBe("nosniff");
    expect(get.headers.get("content-disposition")).toMatch(/^inline; filename="bead-photo-\d+\.png"$/);
    expect(new Uint8Array(await get.arrayBuffer())).toEqual(bytes);
    const stranger = await makeUser({ roles: ["clerk"] });
    expect((await attachmentGet(await requestAs(stranger, `/api/v1/attachments/${row.id}`), idParams(row.id))).status).toBe(403); // not yet on a joint
    expect((await attachmentGet(await requestAs(null, `/api/v1/attachments/${row.id}`), idParams(row.id))).status).toBe(401);

    const r = await post(fuser, goodJoint(base, { photoIds: [row.id] }));
    expect(r.status).toBe(201);
    expect((await ownerDb()("attachments").where({ id: row.id }).first()).joint_id).toBe(r.body.joint.id);
    expect((await attachmentGet(await requestAs(stranger, `/api/v1/attachments/${row.id}`), idParams(row.id))).status).toBe(200);
    // Another joint cannot take the same photo; nothing of that joint is written.
    const again = await post(fuser, goodJoint(base, { photoIds: [row.id] }));
    expect(again.status).toBe(422);
    expect(again.body.error.fields.photoIds).toBeTruthy();
    expect(await ownerDb()("joints")).toHaveLength(1);
  });

  it("refuses a 50 MB photo (413) and a PDF renamed .jpg (415), writing nothing", async () => {
    const big = new Uint8Array(50 * 1024 * 1024);
    big.set(pngBytes());
    const tooBig = await upload(fuser, big, "bead.png", "image/png");
    expect(tooBig.status).toBe(413);
    expect(tooBig.body.error.message).toMatch(/10 MB/);

    // A PDF starts with the bytes "%PDF-" (ISO 32000-1 §7.5.2 file header).
    const pdf = new TextEncoder().encode("%PDF-1.4\n1 0 obj\n<< /Type /Catalog >>\nendobj\ntrailer\n<< /Root 1 0 R >>\n%%EOF\n");
    const renamed = await upload(fuser, pdf, "bead.jpg", "image/jpeg");
    expect(renamed.status).toBe(415);
    expect(renamed.body.error.message).toMatch(/PDF/);

    const empty = await upload(fuser, new Uint8Array(), "bead.jpg", "image/jpeg");
    expect(empty.status).toBe(422);
    expect(await counts()).toEqual(NOTHING);
    expect(await ownerDb()("audit_log").where({ action: "attachment-uploaded" })).toHaveLength(0);
  });
});
