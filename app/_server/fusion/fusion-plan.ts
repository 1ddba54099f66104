// The pressure plan for a pipe on a machine under a job's current procedure version: the
// use case behind GET /api/v1/fusion-plan (the Trench screen computes the same plan on the
// device with the same domain function, so it works without signal).
import { withInstrument } from "@/domain/fusion/instrument";
import "server-only";
import { findCoilByCodeOrTrace } from "@/database/queries/coils";
import { findMachineById } from "@/database/queries/equipment";
import { findJobById } from "@/database/queries/jobs";
import { currentProcedureVersionForJob } from "@/database/queries/procedures";
import type { UserRecord } from "@/database/queries/users";
import { planButtFusion, type FusionPlan } from "@/domain/fusion/plan";
import { buttFusionPlanInput, NO_PUBLISHED_VERSION_FIELD_MESSAGE, noPublishedVersionMessage } from "@/domain/joints/pre-record";
import type { FusionPlanQuery } from "@/domain/joints/schemas";
import { AppError } from "@/domain/result";
import { formatQuantity, formatRange, type UnitSystem } from "@/domain/units/format";

export type PlanAnswer = {
  procedure: { versionId: number; code: string; name: string; versionNo: number; label: string };
  machine: { id: number; assetTag: string; pistonAreaMm2: number };
  pipe: { coil: string | null; outsideDiameterMm: number; sdr: number };
  plan: FusionPlan;
  /** The same plan in words, in the caller's units. */
  display: Record<string, string>;
};

export function describePlan(plan: FusionPlan, system: UnitSystem): Record<string, string> {
  const q = (v: number | null, kind: Parameters<typeof formatQuantity>[1]) => (v === null ? "not defined" : formatQuantity(v, kind, system));
  return {
    heaterTemperature: formatRange(plan.heaterTemperatureC.min, plan.heaterTemperatureC.max, "temperature", system),
    beadUpGaugePressure: formatRange(plan.beadUpGaugePressureMpa.min, plan.beadUpGaugePressureMpa.max, "pressure", system),
    fusionGaugePressure: formatRange(plan.fusionGaugePressureMpa.min, plan.fusionGaugePressureMpa.max, "pressure", system),
    interfacialPressure: formatRange(plan.interfacialPressureMpa.min, plan.interfacialPressureMpa.max, "pressure", system),
    minBead: q(plan.minBeadMm, "length-mm"),
    heatSoakTarget: plan.heatSoakTargetS === null ? (plan.heatSoakS ? formatRange(plan.heatSoakS.min, plan.heatSoakS.max, "duration", system) : "ended by bead size") : q(plan.heatSoakTargetS, "duration"),
    maxChangeover: q(plan.maxChangeoverS, "duration"),
    minCooling: q(plan.minCoolingS, "duration"),
    wall: q(plan.wallMm, "length-mm"),
    dragPressure: q(plan.dragPressureMpa, "pressure"),
  };
}

export async function fusionPlanFor(q: FusionPlanQuery, user: UserRecord): Promise<PlanAnswer> {
  const job = await findJobById({ id: q.jobId });
  if (!job) throw new AppError("not-found", `Job ${q.jobId} does not exist.`, { jobId: ["No such job."] });
  const version = await currentProcedureVersionForJob({ jobId: job.id });
  if (!version) throw new AppError("conflict", noPublishedVersionMessage(job.code), { jobId: [NO_PUBLISHED_VERSION_FIELD_MESSAGE] });
  const machine = await findMachineById({ id: q.machineId });
  if (!machine) throw new AppError("not-found", `Machine ${q.machineId} does not exist.`, { machineId: ["No such machine."] });
  if (!machine.isUsable) throw new AppError("invalid", machine.problems.join(" "), { machineId: machine.problems });
  let od = q.outsideDiameterMm;
  let sdr = q.sdr;
  let coilCode: string | null = null;
  if (q.coil) {
    const coil = await findCoilByCodeOrTrace({ code: q.coil, preferCrewId: user.crewId });
    if (!coil) throw new AppError("not-found", `No coil "${q.coil}" is on file.`, { coil: ["No such coil."] });
    od = coil.outsideDiameterMm;
    sdr = coil.sdr;
    coilCode = coil.coilCode;
  }
  // An impossible pipe for this procedure throws a DomainError: the wrapper answers 422.
  const plan = withInstrument(planButtFusion(buttFusionPlanInput({ procedure: version.definition, pipe: { outsideDiameterMm: od as number, sdr: sdr as number }, machine: { pistonAreaMm2: machine.pistonAreaMm2 as number }, dragPressureMpa: q.dragPressureMpa })), machine);
  return {
    procedure: { versionId: version.id, code: version.procedureCode, name: version.procedureName, versionNo: version.versionNo, label: version.definition.label },
    machine: { id: machine.id, assetTag: machine.assetTag, pistonAreaMm2: machine.pistonAreaMm2 as number },
    pipe: { coil: coilCode, outsideDiameterMm: od as number, sdr: sdr as number },
    plan,
    display: describePlan(plan, user.unitSystem),
  };
}
