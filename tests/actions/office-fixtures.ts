// Builders for the office tests: a procedure with its first version (the published
// standard's windows), a crew, a job, a machine, a heater plate and a joint row inserted
// directly with the owner connection (as the Trench screen would record one).
import { builtInProcedure, type FusionStandard } from "@/domain/procedures";
import { ownerDb } from "../support/db";

let n = 0;
const next = () => `${++n}-${process.pid}`;

export async function makeProcedure({ standard = "astm-f2620" as FusionStandard, code }: { standard?: FusionStandard; code?: string } = {}) {
  const k = ownerDb();
  const [id] = await k("procedures").insert({ code: code ?? `TP-${next()}`, name: "Test butt-fusion procedure", standard });
  const [versionId] = await k("procedure_versions").insert({ procedure_id: id, version_no: 1, definition: JSON.stringify(builtInProcedure(standard)), notes: "First version" });
  return { id: Number(id), versionId: Number(versionId) };
}

export async function makeCrew() {
  const [id] = await ownerDb()("crews").insert({ name: `Crew ${next()}` });
  return Number(id);
}

export async function makeJob({ procedureId, crewId = null, status = "open" }: { procedureId: number; crewId?: number | null; status?: "open" | "closed" }) {
  const k = ownerDb();
  const [id] = await k("jobs").insert({ code: `JOB-${next()}`, name: "Test job", procedure_id: procedureId, crew_id: crewId, status });
  await k("job_counters").insert({ job_id: id, last_joint_no: 0 });
  return Number(id);
}

export async function makeMachine({ pistonAreaMm2 = 1006.5 as number | null } = {}) {
  const [id] = await ownerDb()("fusion_machines").insert({ asset_tag: `FM-${next()}`, piston_area_mm2: pistonAreaMm2 });
  return Number(id);
}

export async function makeHeater({ checkIntervalDays = 1 } = {}) {
  const [id] = await ownerDb()("heater_plates").insert({ asset_tag: `HP-${next()}`, check_interval_days: checkIntervalDays });
  return Number(id);
}

export async function makeCoil({ jobId = null, status = "in-yard" }: { jobId?: number | null; status?: string } = {}) {
  const [id] = await ownerDb()("coils").insert({
    coil_code: `TC-${next()}`,
    manufacturer: "Quillfield Polymers",
    lot: "4410021",
    material: "PE4710",
    series: "ips",
    nominal_size: "2",
    outside_diameter_mm: 60.33,
    sdr: 11,
    length_m: 152.4,
    remaining_m: 152.4,
    status,
    job_id: jobId,
  });
  return Number(id);
}

/** A joint row checked against `procedureVersionId`, inserted directly (append-only table). */
export async function insertJoint({ jobId, procedureVersionId, fuserId }: { jobId: number; procedureVersionId: number; fuserId: number }) {
  const k = ownerDb();
  const machineId = await makeMachine();
  const heaterId = await makeHeater();
  const counter = await k("job_counters").where({ job_id: jobId }).first();
  const jointNo = Number(counter?.last_joint_no ?? 0) + 1;
  await k("job_counters").where({ job_id: jobId }).update({ last_joint_no: jointNo });
  const madeAt = new Date("2026-11-30T10:00:00Z");
  const [id] = await k("joints").insert({
    client_id: `test-${next()}`,
    job_id: jobId,
    joint_no: jointNo,
    kind: "coil-to-coil",
    outside_diameter_mm: 60.33,
    sdr: 11,
    procedure_version_id: procedureVersionId,
    machine_id: machineId,
    heater_id: heaterId,
    fuser_id: fuserId,
    made_at: madeAt,
    plan: JSON.stringify({}),
    outcome: "within-limits",
    findings: JSON.stringify([]),
  });
  await k("joint_revisions").insert({ joint_id: id, revision_no: 1, kind: "recorded", by_user_id: fuserId, review_state: "pending-review" });
  await k("joint_states").insert({ joint_id: id, review_state: "pending-review", revision_no: 1, outcome: "within-limits", made_at: madeAt });
  return Number(id);
}

export async function countRows(table: string): Promise<number> {
  const row = await ownerDb()(table).count({ n: "*" }).first();
  return Number(row?.n ?? 0);
}
