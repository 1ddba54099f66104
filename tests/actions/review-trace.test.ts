// Pressure-trace CSV upload on the review screen's route: generated traces with known
// phases give those durations back within a second; broken files give line-numbered
// errors and write nothing; the derived values are checked against the joint's plan like
// typed values; who may attach.
import { beforeEach, describe, expect, it } from "vitest";
import { POST as tracePost } from "@/app/api/v1/traces/route";
import { GET as traceGet } from "@/app/api/v1/review/joints/[id]/trace/route";
import { GET as queueGet } from "@/app/api/v1/review/queue/route";
import { getObject } from "@/app/_server/storage/object-store";
import { pressureTraceToCsv } from "@/domain/pressure-trace/parse";
import { synthesizePressureTrace, type SyntheticTraceInput } from "@/domain/pressure-trace/synthesize";
import { makeReviewBase, makeReviewJoint, type MadeJoint, type ReviewBase } from "@/fixtures/review-joints";
import { requestAs } from "../support/session";
import { ownerDb, resetDatabase } from "../support/db";
import { makeUser } from "../support/users";

const MADE = new Date("2026-11-25T08:00:00Z");

async function upload(user: { id: number } | null, jointId: number | string, csv: string, name = "trace.csv") {
  const form = new FormData();
  form.set("jointId", String(jointId));
  form.set("file", new File([csv], name, { type: "text/csv" }));
  const request = await requestAs(user, "/api/v1/traces", { method: "POST", body: form });
  const response = await tracePost(request, { params: Promise.resolve({}) });
  return { status: response.status, body: (await response.json()) as Record<string, unknown> & { error?: { code: string; message: string; fields?: Record<string, string[]> } } };
}

/** A trace whose phases fit the joint's plan (2" IPS SDR 11, ASTM F2620, see fixtures). */
function traceFor(joint: MadeJoint, over: Partial<SyntheticTraceInput> = {}) {
  const v = joint.values;
  return synthesizePressureTrace({
    sampleIntervalS: 0.5,
    beadUpS: 20,
    heatSoakS: 60,
    changeoverS: 6,
    pressureBuildUpS: 3,
    coolingS: 200,
    beadUpGaugePressureMpa: v.beadUpGaugePressureMpa!,
    dragPressureMpa: v.dragPressureMpa!,
    fusionGaugePressureMpa: v.fusionGaugePressureMpa!,
    heaterTemperatureC: 218,
    noiseMpa: 0.004,
    seed: 7,
    ...over,
  });
}

describe("pressure-trace upload", () => {
  let base: ReviewBase;
  let fuser: { id: number };
  let inspector: { id: number };
  let joint: MadeJoint;

  beforeEach(async () => {
    await resetDatabase();
    base = await makeReviewBase(ownerDb());
    fuser = await makeUser({ roles: ["fuser"] });
    inspector = await makeUser({ roles: ["inspector"] });
    joint = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE });
  });

  // Known by construction: each trace is generated from these durations (domain generator,
  // common practice — no published source for the trace shape). Tolerance 1 s as required.
  it.each([
    { name: "MPa, 2 Hz, light noise", over: {}, unit: "mpa" as const },
    { name: "psi, 1 Hz", over: { sampleIntervalS: 1, heatSoakS: 75, changeoverS: 7, coolingS: 180 }, unit: "psi" as const },
    { name: "MPa, 5 Hz, heavier noise and a dropped sample", over: { sampleIntervalS: 0.2, noiseMpa: 0.01, heatSoakS: 48, changeoverS: 5, coolingS: 240, dropSamplesAtS: [100] }, unit: "mpa" as const },
  ])("gives back the generated phase durations within a second ($name)", async ({ over, unit }) => {
    const trace = traceFor(joint, over);
    const csv = pressureTraceToCsv(trace.samples, unit);
    const r = await upload(inspector, joint.jointId, csv);
    expect(r.status).toBe(201);
    const stored = await ownerDb()("joint_traces").where({ joint_id: joint.jointId }).first();
    const reading = JSON.parse(stored.reading) as { heatSoakS: number; changeoverS: number; coolingS: number };
    expect(Math.abs(reading.heatSoakS - trace.phases.heatSoak.durationS)).toBeLessThanOrEqual(1);
    expect(Math.abs(reading.changeoverS - trace.phases.changeover.durationS)).toBeLessThanOrEqual(1);
    expect(Math.abs(reading.coolingS - (over.coolingS ?? 200))).toBeLessThanOrEqual(1);
    expect(stored.pressure_unit).toBe(unit);
    // The file itself is kept in the object store, byte for byte, as a pressure-trace attachment.
    const attachment = await ownerDb()("attachments").where({ id: stored.attachment_id }).first();
    expect(attachment).toMatchObject({ kind: "pressure-trace", joint_id: joint.jointId, size_bytes: Buffer.byteLength(csv) });
    const object = await getObject({ key: attachment.object_key });
    expect(Buffer.from(object!.body).toString("utf8")).toBe(csv);
  });

  it("checks the trace's values against the plan: a long changeover turns the joint out of limits, with a revision, an audit entry and an alert", async () => {
    // Plan: ASTM F2620 maximum changeover for this wall is 8 s (fixtures/review-joints, checkJoint).
    const r = await upload(inspector, joint.jointId, pressureTraceToCsv(traceFor(joint, { changeoverS: 14 }).samples));
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ outcome: "out-of-limits", revisionNo: 2 });
    expect((r.body.findings as string[]).join(" ")).toMatch(/Changeover 1[3-5] s is longer than the 8 s maximum/);
    expect(await ownerDb()("joint_states").where({ joint_id: joint.jointId }).first()).toMatchObject({ outcome: "out-of-limits", revision_no: 2, review_state: "pending-review" });
    expect(await ownerDb()("joint_revisions").where({ joint_id: joint.jointId, revision_no: 2 }).first()).toMatchObject({ kind: "trace-attached", by_user_id: inspector.id });
    expect(await ownerDb()("audit_log").where({ action: "joint-trace-attached", entity_id: String(joint.jointId) })).toHaveLength(1);
    expect(await ownerDb()("notifications").where({ kind: "joint-out-of-limits" })).toHaveLength(1);

    // The queue now lists it as out of limits with the trace, and the chart has the plan's windows.
    const queue = await queueGet(await requestAs(inspector, "/api/v1/review/queue"), { params: Promise.resolve({}) });
    const json = (await queue.json()) as { outOfLimits: number; items: { jointId: number; trace: { outcome: string } | null }[] };
    expect(json.outOfLimits).toBe(1);
    expect(json.items[0]).toMatchObject({ jointId: joint.jointId, trace: { outcome: "out-of-limits" } });
    const chart = await traceGet(await requestAs(inspector, `/api/v1/review/joints/${joint.jointId}/trace`), { params: Promise.resolve({ id: String(joint.jointId) }) });
    const data = (await chart.json()) as { points: unknown[]; windows: { bands: { key: string; y1: number; y2: number }[]; markers: { key: string }[] } };
    expect(data.points.length).toBeGreaterThan(100);
    expect(data.windows.bands.find((b) => b.key === "fusion")).toMatchObject({ y1: joint.plan.fusionGaugePressureMpa.min, y2: joint.plan.fusionGaugePressureMpa.max });
    expect(data.windows.markers.map((m) => m.key).sort()).toEqual(["changeoverMax", "coolingMin"]);
  });

  it.each([
    { name: "a value that is not a number", csv: "seconds,gauge_pressure_mpa\n0,0\n0.5,0.1\n1.0,abc\n1.5,0.2\n", line: 4 },
    { name: "a wrong header", csv: "time,pressure\n0,0\n", line: 1 },
    { name: "time going backwards", csv: "# logged at the trench\nseconds,gauge_pressure_mpa\n0,0\n1,0.2\n0.5,0.2\n", line: 5 },
    { name: "a missing column", csv: "seconds,gauge_pressure_mpa,heater_temperature_c\n0,0,218\n1,0.2\n", line: 3 },
  ])("refuses $name with the failing line named, writing nothing", async ({ csv, line }) => {
    const r = await upload(inspector, joint.jointId, csv);
    expect(r.status).toBe(422);
    expect(r.body.error!.message).toContain(`line ${line}:`);
    expect(r.body.error!.fields!.file![0]).toMatch(new RegExp(`^Line ${line}: `));
    expect(await ownerDb()("attachments")).toHaveLength(0);
    expect(await ownerDb()("joint_revisions").where({ joint_id: joint.jointId })).toHaveLength(1);
    expect(await ownerDb()("joint_traces")).toHaveLength(0);
  });

  it("refuses a file that is not text, and one without phases, in words", async () => {
    const binary = await upload(inspector, joint.jointId, String.fromCharCode(0xff, 0xfe, 0x00) + "\u0000");
    expect(binary.status).toBe(422);
    const flat = await upload(inspector, joint.jointId, "seconds,gauge_pressure_mpa\n" + Array.from({ length: 30 }, (_, i) => `${i},0.3`).join("\n"));
    expect(flat.status).toBe(422);
    expect(flat.body.error!.message).toMatch(/phases could not be found/);
    expect(await ownerDb()("joint_traces")).toHaveLength(0);
  });

  it("lets the fuser attach to their own joint only; a clerk and a signed-out caller are refused", async () => {
    const csv = pressureTraceToCsv(traceFor(joint).samples);
    const other = await makeUser({ roles: ["fuser"] });
    const clerk = await makeUser({ roles: ["clerk"] });
    expect((await upload(other, joint.jointId, csv)).status).toBe(403);
    expect((await upload(clerk, joint.jointId, csv)).status).toBe(403);
    expect((await upload(null, joint.jointId, csv)).status).toBe(401);
    expect((await upload(inspector, "not-a-joint", csv)).status).toBe(422);
    expect((await upload(fuser, joint.jointId, csv)).status).toBe(201);
  });

  it("refuses a trace file already attached to another joint, naming that joint, before anything is written", async () => {
    const csv = pressureTraceToCsv(traceFor(joint).samples);
    expect((await upload(inspector, joint.jointId, csv, "first.csv")).status).toBe(201);
    const other = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE });
    const counts = async () => ({
      attachments: (await ownerDb()("attachments")).length,
      traces: (await ownerDb()("joint_traces")).length,
      revisions: (await ownerDb()("joint_revisions").where({ joint_id: other.jointId })).length,
      audit: (await ownerDb()("audit_log").where({ action: "joint-trace-attached" })).length,
    });
    const before = await counts();
    const again = await upload(inspector, other.jointId, csv, "renamed-copy.csv");
    expect(again.status).toBe(409);
    expect(again.body.error!.code).toBe("conflict");
    expect(again.body.error!.message).toContain(`already attached to ${base.jobCode} joint ${joint.jointNo} (/joints/${joint.jointId})`);
    expect(again.body.error!.fields!.file![0]).toContain(`${base.jobCode} joint ${joint.jointNo}`);
    expect(await counts()).toEqual(before);
    expect(await ownerDb()("joint_states").where({ joint_id: other.jointId }).first()).toMatchObject({ revision_no: 1 });

    // The same file on its own joint again: refused too (a second copy is not new evidence).
    const same = await upload(inspector, joint.jointId, csv);
    expect(same.status).toBe(409);
    expect(same.body.error!.message).toContain("already attached to this joint");
    // A different file (one sample changed) is another trace and is accepted.
    expect((await upload(inspector, other.jointId, csv.replace(/\n0,/, "\n0.0,"))).status).toBe(201);
  });

  it("looks the file up by its SHA-256 through an index", async () => {
    const [rows] = (await ownerDb().raw("SHOW INDEX FROM attachments WHERE Column_name = 'sha256'")) as [{ Seq_in_index: number }[]];
    expect(rows.some((r) => Number(r.Seq_in_index) === 1)).toBe(true);
  });

  it("a typed heater temperature that disagrees with the trace's beyond the probe's limits is a trace finding, in the viewer's units", async () => {
    // Typed 457 °F at the trench; the trace's heater column logged 426 °F (°C = (°F − 32) / 1.8).
    const typed = await makeReviewJoint(ownerDb(), base, { fuserId: fuser.id, madeAt: MADE, values: { heaterTemperatureC: Math.round(((457 - 32) / 1.8) * 10) / 10 } });
    const trace = traceFor(typed, { heaterTemperatureC: (426 - 32) / 1.8, heatSoakS: typed.values.heatSoakS ?? 60, changeoverS: typed.values.changeoverS!, coolingS: typed.values.coolingS! });
    const r = await upload(inspector, typed.jointId, pressureTraceToCsv(trace.samples));
    expect(r.status).toBe(201);
    expect(r.body.outcome).toBe("out-of-limits");
    const usInspector = await makeUser({ roles: ["inspector"], unitSystem: "us" });
    const queue = await queueGet(await requestAs(usInspector, "/api/v1/review/queue"), { params: Promise.resolve({}) });
    const json = (await queue.json()) as { items: { jointId: number; procedureCode: string; procedureVersionNo: number; trace: { outcome: string; findings: { message: string }[]; rows: { key: string; disagrees: boolean }[] } | null }[] };
    const item = json.items.find((i) => i.jointId === typed.jointId)!;
    expect(item.trace!.outcome).toBe("out-of-limits");
    expect(item.trace!.findings.map((f) => f.message)).toContainEqual(expect.stringContaining("Heater temperature: typed 457 °F; trace 426 °F"));
    expect(item.trace!.rows.find((row) => row.key === "heaterTemperature")).toMatchObject({ disagrees: true });
    // The procedure the joint references, by its own code and version (fixtures/review-joints).
    expect(item).toMatchObject({ procedureCode: `P-${base.jobCode.slice(3)}`, procedureVersionNo: 1 });
  });
});
