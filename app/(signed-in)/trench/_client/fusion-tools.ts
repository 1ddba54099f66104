// The pressure plan, the joint check and the per-value judgement on the device. They carry
// the standards' tables (pipe walls, procedure windows), so they are not part of the Trench
// page's first load: the screen fetches them as soon as it has painted (load-fusion-tools.ts)
// and uses them once a job, machine, coil and drag pressure are given, or a joint is recorded.
import { checkJoint } from "@/domain/fusion/check";
import { withInstrument } from "@/domain/fusion/instrument";
import { judgeValue } from "@/domain/fusion/judge";
import { planButtFusion } from "@/domain/fusion/plan";
import { buttFusionPlanInput } from "@/domain/joints/pre-record";

export const fusionTools = { checkJoint, judgeValue, withInstrument, planButtFusion, buttFusionPlanInput };
export type FusionTools = typeof fusionTools;
