// Demo joints for the invented scenario: about 30 joints over the last two weeks on the
// two demo jobs (WO-24117 2" and 4" IPS on FM-201 with HP-31; WO-24152 2" IPS on FM-114
// with HP-12), made by the demo fusers who were qualified on each day. Every plan and
// verdict comes from the domain (planButtFusion, checkJoint) against the job's procedure
// version; rows go in through the same insert functions the Trench uses, with the coil
// pulls drawn down. A few joints are out of limits; one was cut out by the inspector and
// remade, and the remake links to it. Deterministic for a given `today`; skipped when the
// demo jobs already have joints.
import type { Knex } from "knex";
import { planPull } from "@/domain/coils/life";
import { checkJoint } from "@/domain/fusion/check";
import { planButtFusion, type FusionPlan } from "@/domain/fusion/plan";
import type { ProcedureDefinition } from "@/domain/procedures";
import { allChecksPassed } from "@/domain/joints/values";
import { buttFusionPlanInput } from "@/domain/joints/pre-record";
import type { Shelter, TimedPhase } from "@/domain/joints/schemas";
import { qualificationStatus } from "@/domain/qualifications/status";
import { isoDaysFrom } from "@/fixtures/demo-scenario";
import { insertAuditEntry } from "../queries/audit-log";
import { lockCoil, writeCoilPull } from "../queries/coils";
import { insertJoint, insertJointRevision, insertJointState, markJointReplaced } from "../queries/joints";

type Fault = "heater-cold" | "changeover-long" | "cooling-short" | "bead-small" | "pressure-low" | null;

type Planned = { job: "WO-24117" | "WO-24152"; day: number; hour: number; coilA: string; coilB: string; fault: Fault; typed?: boolean };

const DAY_MS = 86_400_000;

// Joints per day over 14 days; faults placed by hand so the demo shows each kind of finding.
const PLAN: Planned[] = (() => {
  const out: Planned[] = [];
  const faults: Record<number, Fault> = { 4: "heater-cold", 9: "changeover-long", 15: "cooling-short", 21: "bead-small", 26: "pressure-low" };
  let n = 0;
  for (let day = 13; day >= 0; day -= 1) {
    const perDay = day % 3 === 0 ? 3 : 2;
    for (let k = 0; k < perDay && out.length < 32; k += 1) {
      const onMain = (n + k) % 3 !== 2;
      const big = onMain && n % 5 === 3;
      out.push({
        job: onMain ? "WO-24117" : "WO-24152",
        day,
        hour: 8 + k * 2 + (n % 2),
        coilA: onMain ? (big ? "LV-C0007" : "LV-C0001") : "LV-C0004",
        coilB: onMain ? (big ? "LV-C0008" : "LV-C0002") : "LV-C0005",
        fault: faults[n] ?? null,
        typed: n % 4 === 1,
      });
      n += 1;
    }
  }
  return out;
})();

/** Values a careful fuser records for this plan: inside every window, varied deterministically. */
function values(plan: FusionPlan, i: number, fault: Fault) {
  const mid = (w: { min: number; max: number }, f: number) => w.min + (w.max - w.min) * f;
  const f = 0.35 + ((i * 7) % 5) * 0.07;
  const v = {
    heaterTemperatureC: Math.round(mid(plan.heaterTemperatureC, f)),
    fusionGaugePressureMpa: Math.round(mid(plan.fusionGaugePressureMpa, f) * 1000) / 1000,
    beadMm: Math.round(((plan.minBeadMm ?? 2) + 0.8 + (i % 3) * 0.3) * 10) / 10,
    heatSoakS: plan.heatSoakTargetS ?? 45 + (i % 4) * 5,
    changeoverS: Math.max(2, (plan.maxChangeoverS ?? 10) - 3 - (i % 3)),
    coolingS: (plan.minCoolingS ?? 300) + 60 + (i % 4) * 30,
  };
  switch (fault) {
    case "heater-cold":
      return { ...v, heaterTemperatureC: Math.round(plan.heaterTemperatureC.min - 11) };
    case "changeover-long":
      return { ...v, changeoverS: (plan.maxChangeoverS ?? 10) + 7 };
    case "cooling-short":
      return { ...v, coolingS: Math.round((plan.minCoolingS ?? 300) * 0.6) };
    case "bead-small":
      return { ...v, beadMm: Math.round((plan.minBeadMm ?? 2) * 0.5 * 10) / 10 };
    case "pressure-low":
      return { ...v, fusionGaugePressureMpa: Math.round(plan.fusionGaugePressureMpa.min * 0.85 * 1000) / 1000 };
    default:
      return v;
  }
}

export async function seed(knex: Knex, today = new Date()): Promise<void> {
  const jobs = (await knex("jobs").whereIn("code", ["WO-24117", "WO-24152"]).select("id", "code", "procedure_id")) as { id: number; code: string; procedure_id: number }[];
  if (jobs.length === 0) return;
  const existing = await knex("joints").whereIn("job_id", jobs.map((j) => j.id)).count({ n: "*" }).first();
  if (Number(existing?.n ?? 0) > 0) return;

  const byCode = new Map(jobs.map((j) => [j.code, j]));
  const versions = new Map<number, { id: number; definition: ProcedureDefinition }>();
  for (const j of jobs) {
    const v = await knex("procedure_versions").where({ procedure_id: j.procedure_id }).whereNull("superseded_at").orderBy("version_no", "desc").first("id", "definition");
    if (v) versions.set(j.id, { id: Number(v.id), definition: JSON.parse(v.definition) as ProcedureDefinition });
  }
  const machine = async (tag: string) => knex("fusion_machines").where({ asset_tag: tag }).first("id", "piston_area_mm2");
  const heater = async (tag: string) => knex("heater_plates").where({ asset_tag: tag }).first("id");
  const equipment = { "WO-24117": { machine: await machine("FM-201"), heater: await heater("HP-31") }, "WO-24152": { machine: await machine("FM-114"), heater: await heater("HP-12") } };
  const coilRows = (await knex("coils").whereIn("coil_code", ["LV-C0001", "LV-C0002", "LV-C0004", "LV-C0005", "LV-C0007", "LV-C0008"]).select("id", "coil_code", "outside_diameter_mm", "sdr")) as { id: number; coil_code: string; outside_diameter_mm: number; sdr: number }[];
  const coils = new Map(coilRows.map((c) => [c.coil_code, { id: Number(c.id), od: Number(c.outside_diameter_mm), sdr: Number(c.sdr) }]));
  const people = (await knex("users").whereIn("email", ["fuser@larkmoor-gas.example", "fuser2@larkmoor-gas.example", "inspector@larkmoor-gas.example"]).select("id", "email")) as { id: number; email: string }[];
  const person = (email: string) => people.find((p) => p.email === email)?.id;
  const inspectorId = person("inspector@larkmoor-gas.example");
  const fuserFor = { "WO-24117": person("fuser@larkmoor-gas.example"), "WO-24152": person("fuser2@larkmoor-gas.example") };

  const qualifiedOn = async (userId: number, procedureId: number) =>
    ((await knex("qualifications").where({ user_id: userId, procedure_id: procedureId }).select("qualified_on")) as { qualified_on: Date | string }[]).map((q) => (q.qualified_on instanceof Date ? q.qualified_on.toISOString().slice(0, 10) : String(q.qualified_on).slice(0, 10)));

  const midnight = Date.UTC(today.getUTCFullYear(), today.getUTCMonth(), today.getUTCDate());
  const counters = new Map<number, number>();
  let cutOutDone = false;

  const record = async (trx: Knex.Transaction, p: Planned, i: number, madeAt: Date, replaces: { jointId: number } | null) => {
    const job = byCode.get(p.job)!;
    const version = versions.get(job.id);
    const eq = equipment[p.job];
    const fuserId = fuserFor[p.job];
    const a = coils.get(p.coilA);
    const b = coils.get(p.coilB);
    if (!version || !eq.machine || !eq.heater || !fuserId || !a || !b) return null;
    // Only joints the fuser was qualified to make on that day (49 CFR 192.285(c)).
    const q = qualificationStatus({ qualifiedOn: await qualifiedOn(fuserId, job.procedure_id), on: madeAt.toISOString().slice(0, 10) });
    if (!q.qualified) return null;
    const drag = Math.round((0.06 + (i % 4) * 0.01) * 1000) / 1000;
    const plan = planButtFusion(buttFusionPlanInput({ procedure: version.definition, pipe: { outsideDiameterMm: a.od, sdr: a.sdr }, machine: { pistonAreaMm2: Number(eq.machine.piston_area_mm2) }, dragPressureMpa: drag }));
    const v = values(plan, i, replaces ? null : p.fault);
    const recorded = { ...v, dragPressureMpa: drag, beadUpGaugePressureMpa: null, heatSoakGaugePressureMpa: null, heaterSurfaceTemperatureC: null, misalignmentMm: null, ...allChecksPassed() };
    const shelters: Shelter[] = ["windbreak", "none", "tent", "windbreak"];
    const conditions = { ambientC: 4 + (i % 9), shelter: shelters[i % shelters.length]! };
    const check = checkJoint(plan, recorded, { system: "si", conditions });
    const jointNo = (counters.get(job.id) ?? 0) + 1;
    counters.set(job.id, jointNo);
    const timed: TimedPhase[] = p.typed ? [] : ["heatSoak", "changeover", "cooling"];
    const lengthAM = Math.round((4 + (i % 5) * 0.8) * 100) / 100;
    const jointId = await insertJoint(
      {
        clientId: `demo-${p.job}-${jointNo}`,
        jobId: job.id,
        jointNo,
        kind: "coil-to-coil",
        coilAId: a.id,
        coilBId: b.id,
        componentBText: null,
        lengthAM,
        lengthBM: null,
        outsideDiameterMm: a.od,
        sdr: a.sdr,
        procedureVersionId: version.id,
        machineId: Number(eq.machine.id),
        heaterId: Number(eq.heater.id),
        fuserId,
        madeAt,
        station: p.job === "WO-24117" ? `${Math.floor((i * 37) / 100)}+${String((i * 37) % 100).padStart(2, "0")}` : `Lot ${10 + (i % 9)} service`,
        latitude: null,
        longitude: null,
        ...conditions,
        ...recorded,
        timedFields: timed,
        plan,
        outcome: check.outcome,
        findings: check.findings,
        replacesJointId: replaces?.jointId ?? null,
        recordedAt: new Date(madeAt.getTime() + 5 * 60_000),
      },
      trx,
    );
    await insertJointRevision({ jointId, revisionNo: 1, kind: "recorded", byUserId: fuserId, reviewState: "pending-review", changes: { outcome: check.outcome, timedFields: timed }, at: madeAt }, trx);
    await insertJointState({ jointId, reviewState: "pending-review", revisionNo: 1, outcome: check.outcome, madeAt }, trx);
    if (replaces) await markJointReplaced({ jointId: replaces.jointId, replacedByJointId: jointId }, trx);
    const coil = (await lockCoil({ id: a.id }, trx))!;
    const pull = planPull(coil, lengthAM);
    if (!pull.ok) throw new Error(`demo seed: ${pull.message}`);
    await writeCoilPull({ coil, pull, pullM: lengthAM, jointId, userId: fuserId, jobId: job.id }, trx);
    await insertAuditEntry({ actorUserId: fuserId, action: "joint-recorded", entityType: "joint", entityId: jointId, details: { jobCode: p.job, jointNo, outcome: check.outcome, demo: true } }, trx);
    return { jointId, jointNo, outcome: check.outcome };
  };

  await knex.transaction(async (trx) => {
    for (let i = 0; i < PLAN.length; i += 1) {
      const p = PLAN[i]!;
      // Day 0 is yesterday, so no demo joint lies in the future whatever the hour of seeding.
      const madeAt = new Date(midnight - (p.day + 1) * DAY_MS + p.hour * 3_600_000 + ((i * 17) % 50) * 60_000);
      const made = await record(trx, p, i, madeAt, null);
      if (!made) continue;
      // Older joints within limits have been reviewed and accepted by the inspector.
      if (made.outcome === "within-limits" && p.day >= 6 && inspectorId) {
        const at = new Date(madeAt.getTime() + 26 * 3_600_000);
        await insertJointRevision({ jointId: made.jointId, revisionNo: 2, kind: "accepted", byUserId: inspectorId, reviewState: "accepted", reason: "Values and bead photos in order", at }, trx);
        await trx("joint_states").where({ joint_id: made.jointId }).update({ review_state: "accepted", revision_no: 2, updated_at: at });
      }
      // The first out-of-limits joint on the main job was cut out at once and remade.
      if (made.outcome === "out-of-limits" && p.job === "WO-24117" && p.day >= 3 && !cutOutDone && inspectorId) {
        cutOutDone = true;
        const at = new Date(madeAt.getTime() + 20 * 60_000);
        await insertJointRevision({ jointId: made.jointId, revisionNo: 2, kind: "cut-out", byUserId: inspectorId, reviewState: "cut-out", reason: "Out of limits: cut out and remake per the procedure", at }, trx);
        await trx("joint_states").where({ joint_id: made.jointId }).update({ review_state: "cut-out", revision_no: 2, updated_at: at });
        await record(trx, { ...p, fault: null }, i + 100, new Date(at.getTime() + 30 * 60_000), { jointId: made.jointId });
      }
    }
    for (const [jobId, last] of counters) await trx("job_counters").where({ job_id: jobId }).update({ last_joint_no: last });
    await trx("audit_log").insert({ actor_user_id: null, action: "demo-joints-loaded", entity_type: "database", entity_id: null, details: JSON.stringify({ today: isoDaysFrom(today, 0), joints: [...counters.values()].reduce((s, n) => s + n, 0) }) });
  });
}
