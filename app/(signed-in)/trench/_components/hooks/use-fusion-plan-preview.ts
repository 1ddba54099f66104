"use client";
// The pressure plan shown while the joint is set up: the job's procedure, the machine's
// piston area, coil A's size and the measured drag pressure give the gauge pressures and
// the phase limits; until then, the one thing still missing is named. The computation
// (fusion-tools) is fetched after the screen is usable, not with the page.
import { useEffect, useMemo, useState } from "react";
import type { FusionPlan } from "@/domain/fusion/plan";
import { noPublishedVersionMessage } from "@/domain/joints/pre-record";
import { loadFusionTools, type FusionTools } from "../../_client/load-fusion-tools";
import { phaseLimits } from "@/domain/joints/timer";
import type { TrenchCoil, TrenchSetup } from "@/app/_server/trench/setup-types";

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
  const [tools, setTools] = useState<FusionTools | null>(null);
  const [toolsFailed, setToolsFailed] = useState(false);
  const ready = Boolean(job?.procedure && machine?.isUsable && coilA && typeof drag === "number");

  // Load on mount; after a failed load, again once everything for a plan is given.
  useEffect(() => {
    if (tools) return;
    let live = true;
    loadFusionTools().then(
      (t) => live && setTools(t),
      () => live && setToolsFailed(true),
    );
    return () => {
      live = false;
    };
  }, [tools, ready]);

  const { plan, planProblem } = useMemo((): { plan: FusionPlan | null; planProblem: string | null } => {
    if (!job) return { plan: null, planProblem: "Choose the job: its procedure sets the limits." };
    if (!job.procedure) return { plan: null, planProblem: noPublishedVersionMessage(job.code) };
    if (!machine) return { plan: null, planProblem: "Choose the fusion machine: its piston area turns pressures into gauge readings." };
    if (!machine.isUsable || machine.pistonAreaMm2 === null) return { plan: null, planProblem: machine.problems.join(" ") };
    if (!coilA) return { plan: null, planProblem: "Scan or type coil A: its size sets the plan." };
    if (typeof drag !== "number") return { plan: null, planProblem: "Enter the drag pressure you measured to see the gauge pressures to set." };
    if (!tools) return { plan: null, planProblem: toolsFailed ? "The plan could not be loaded on this device (no signal yet). It appears when the connection is back; the joint can still be recorded." : "Working out the plan …" };
    const { withInstrument, planButtFusion, buttFusionPlanInput } = tools;
    try {
      return { plan: withInstrument(planButtFusion(buttFusionPlanInput({ procedure: job.procedure.definition, pipe: coilA, machine: { pistonAreaMm2: machine.pistonAreaMm2 }, dragPressureMpa: drag })), machine), planProblem: null };
    } catch (error) {
      return { plan: null, planProblem: (error as Error).message };
    }
  }, [job, machine, coilA, drag, tools, toolsFailed]);

  return { job, machine, heater, plan, planProblem, limits: phaseLimits(plan) };
}
