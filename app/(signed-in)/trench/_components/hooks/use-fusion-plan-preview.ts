"use client";
// The pressure plan shown while the joint is set up: the job's procedure, the machine's
// piston area, coil A's size and the measured drag pressure give the gauge pressures and
// the phase limits (the phase limits come without the drag, `timingPlan`); until then,
// the one thing still missing is named.
import { useMemo } from "react";
import type { FusionPlan } from "@/domain/fusion/plan";
import { noPublishedVersionMessage } from "@/domain/joints/pre-record";
import { phaseLimits } from "@/domain/joints/timer";
import type { TrenchCoil, TrenchSetup } from "@/app/_server/trench/setup-types";
import { useFusionTools } from "../../_client/load-fusion-tools";

export interface PlanInputs {
  jobId: unknown;
  machineId: unknown;
  heaterId: unknown;
  drag: unknown;
  coilA: TrenchCoil | null;
}

export function useFusionPlanPreview(setup: TrenchSetup, { jobId, machineId, heaterId, drag, coilA }: PlanInputs) {
  const job = setup.jobs.find((j) => j.id === jobId) ?? null;
  const machine = setup.machines.find((m) => m.id === machineId) ?? null;
  const heater = setup.heaters.find((h) => h.id === heaterId) ?? null;
  const tools = useFusionTools();

  const { plan, timingPlan, planProblem } = useMemo((): { plan: FusionPlan | null; timingPlan: FusionPlan | null; planProblem: string | null } => {
    if (!job) return { plan: null, timingPlan: null, planProblem: "Choose the job: its procedure sets the limits." };
    if (!job.procedure) return { plan: null, timingPlan: null, planProblem: noPublishedVersionMessage(job.code) };
    if (!machine) return { plan: null, timingPlan: null, planProblem: "Choose the fusion machine: its piston area turns pressures into gauge readings." };
    if (!machine.isUsable || machine.pistonAreaMm2 === null) return { plan: null, timingPlan: null, planProblem: machine.problems.join(" ") };
    if (!coilA) return { plan: null, timingPlan: null, planProblem: "Scan or type coil A: its size sets the plan." };
    if (!tools) return { plan: null, timingPlan: null, planProblem: "Working out the plan …" };
    const { withInstrument, planButtFusion, buttFusionPlanInput } = tools;
    const make = (dragPressureMpa: number) => withInstrument(planButtFusion(buttFusionPlanInput({ procedure: job.procedure!.definition, pipe: coilA, machine: { pistonAreaMm2: machine.pistonAreaMm2! }, dragPressureMpa })), machine);
    try {
      // The phase times depend on the pipe and the procedure, not on drag: the timer gets
      // its limits before the drag pressure is measured (gauge pressures wait for it).
      if (typeof drag !== "number") return { plan: null, timingPlan: make(0), planProblem: "Enter the drag pressure you measured to see the gauge pressures to set." };
      const full = make(drag);
      return { plan: full, timingPlan: full, planProblem: null };
    } catch (error) {
      return { plan: null, timingPlan: null, planProblem: (error as Error).message };
    }
  }, [job, machine, coilA, drag, tools]);

  return { job, machine, heater, plan, timingPlan, planProblem, limits: phaseLimits(timingPlan) };
}
