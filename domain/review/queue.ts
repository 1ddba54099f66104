// The review queue's ordering rule, and the plan-versus-recorded comparison each queue item
// shows. Canonical SI in, the user's units out (domain/units).
import type { JointConditions } from "@/domain/procedures/weather";
import type { FusionPlan } from "@/domain/fusion/plan";
import { checkJoint, MAX_MISALIGNMENT_WALL_FRACTION, type JointFinding } from "@/domain/fusion/check";
import type { JointOutcome } from "@/domain/joints/outcomes";
import type { JointParameter } from "@/domain/fusion/parameters";
import { formatQuantity, formatRange, type QuantityKind, type UnitSystem } from "@/domain/units/format";
import { RECORDED_VALUE_DEFINITIONS, type RecordedValues } from "@/domain/joints/values";

export type { RecordedValues } from "@/domain/joints/values";

/**
 * Queue order: joints out of limits first, then the rest; within each, the oldest joint
 * first (made at), then by id so the order is total. database/queries/reviews.ts sorts the
 * same way in SQL; tests check the two agree.
 */
export function compareQueueItems(a: { outcome: JointOutcome; madeAt: Date; jointId: number }, b: { outcome: JointOutcome; madeAt: Date; jointId: number }): number {
  const rank = (o: JointOutcome) => (o === "out-of-limits" ? 0 : 1);
  return rank(a.outcome) - rank(b.outcome) || a.madeAt.getTime() - b.madeAt.getTime() || a.jointId - b.jointId;
}

export type ComparisonRow = {
  key: string;
  parameter: JointParameter | null;
  label: string;
  planText: string;
  recordedText: string;
  /** "finding" when the check raised a finding on this parameter. */
  status: "ok" | "finding" | "not-recorded" | "info";
};

/**
 * What the plan asks of each checked parameter, in the user's units; null leaves the row
 * out (heat soak under a procedure with neither window nor target).
 */
const PLAN_TEXT: Partial<Record<JointParameter, (plan: FusionPlan, system: UnitSystem) => string | null>> = {
  heaterTemperature: (plan, system) => formatRange(plan.heaterTemperatureC.min, plan.heaterTemperatureC.max, "temperature", system),
  beadUpPressure: (plan, system) => formatRange(plan.beadUpGaugePressureMpa.min, plan.beadUpGaugePressureMpa.max, "pressure", system),
  fusionPressure: (plan, system) => formatRange(plan.fusionGaugePressureMpa.min, plan.fusionGaugePressureMpa.max, "pressure", system),
  bead: (plan, system) => (plan.minBeadMm === null ? "not defined" : `at least ${formatQuantity(plan.minBeadMm, "length-mm", system)}`),
  heatSoak: (plan, system) => {
    if (!plan.heatSoakS && plan.heatSoakTargetS === null) return null;
    const window = plan.heatSoakS ? formatRange(plan.heatSoakS.min, plan.heatSoakS.max, "duration", system) : "";
    const target = plan.heatSoakTargetS !== null ? `target ${formatQuantity(plan.heatSoakTargetS, "duration", system)}` : "";
    return [window, target].filter(Boolean).join(", ");
  },
  changeover: (plan, system) => (plan.maxChangeoverS === null ? "not defined" : `at most ${formatQuantity(plan.maxChangeoverS, "duration", system)}`),
  cooling: (plan, system) => (plan.minCoolingS === null ? "not defined" : `at least ${formatQuantity(plan.minCoolingS, "duration", system)}`),
  // The measured hi-lo row (the yes/no alignment check reads "required").
  alignment: (plan, system) => `at most ${formatQuantity(MAX_MISALIGNMENT_WALL_FRACTION * plan.wallMm, "length-mm", system)} (10 % of the wall)`,
};

/**
 * One row per recorded value (domain/joints/values, in its order): what the plan asked (a
 * window, a minimum, a maximum, "required") and what was recorded, each in the user's
 * units, with the row flagged when the joint check found that parameter out of limits or
 * missing. A value the check does not judge shows the plan's own figure when it has one
 * (drag pressure, used in the plan).
 */
export function planVersusRecorded(plan: FusionPlan, recorded: RecordedValues, findings: readonly JointFinding[], system: UnitSystem): ComparisonRow[] {
  const flagged = new Map<JointParameter, JointFinding>();
  for (const f of findings) if (!flagged.has(f.parameter)) flagged.set(f.parameter, f);
  const status = (parameter: JointParameter | null, value: unknown): ComparisonRow["status"] => {
    if (parameter && flagged.has(parameter)) return flagged.get(parameter)!.kind === "not-recorded" ? "not-recorded" : "finding";
    if (parameter === null) return "info";
    return value === null ? "not-recorded" : "ok";
  };
  const values = recorded as Record<string, number | boolean | null>;
  const planValues = plan as unknown as Record<string, unknown>;
  const rows: ComparisonRow[] = [];
  for (const d of RECORDED_VALUE_DEFINITIONS) {
    const value = values[d.key] ?? null;
    let planText: string | null;
    let recordedText: string;
    if (d.type === "check") {
      planText = "required";
      recordedText = value === null ? "not recorded" : value ? "yes" : "no";
    } else {
      const planned = planValues[d.key];
      planText = d.parameter ? (PLAN_TEXT[d.parameter]?.(plan, system) ?? null) : typeof planned === "number" ? `${formatQuantity(planned, d.quantity, system)} (used in the plan)` : "";
      recordedText = value === null ? "not recorded" : formatQuantity(value as number, d.quantity as QuantityKind, system);
    }
    if (planText === null) continue;
    rows.push({ key: d.name, parameter: d.parameter, label: d.label, planText, recordedText, status: status(d.parameter, value) });
  }
  return rows;
}

/**
 * The joint's findings with messages in the viewer's units: the check is run again on the
 * stored plan and values with `system`; when that does not give the same parameters as the
 * findings stored at recording (a value the check then had that is not stored here), the
 * stored findings are shown as they are.
 */
export function findingsForViewer(plan: FusionPlan | null, recorded: RecordedValues, stored: readonly JointFinding[], system: UnitSystem, conditions?: JointConditions): JointFinding[] {
  if (!plan) return [...stored];
  const again = checkJoint(plan, recorded, { system, conditions }).findings;
  const key = (list: readonly JointFinding[]) => list.map((f) => `${f.parameter}:${f.kind}`).sort().join("|");
  return key(again) === key(stored) ? again : [...stored];
}
