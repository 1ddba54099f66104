// The review queue's ordering rule, and the plan-versus-recorded comparison each queue item
// shows. Canonical SI in, the user's units out (domain/units).
import type { FusionPlan } from "@/domain/fusion/plan";
import { checkJoint, type JointFinding, type JointOutcome, type JointParameter } from "@/domain/fusion/check";
import { formatQuantity, formatRange, type QuantityKind, type UnitSystem } from "@/domain/units/format";
import { jointMeasurements } from "@/domain/joints/measurements";

/**
 * Queue order: joints out of limits first, then the rest; within each, the oldest joint
 * first (made at), then by id so the order is total. database/queries/reviews.ts sorts the
 * same way in SQL; tests check the two agree.
 */
export function compareQueueItems(a: { outcome: JointOutcome; madeAt: Date; jointId: number }, b: { outcome: JointOutcome; madeAt: Date; jointId: number }): number {
  const rank = (o: JointOutcome) => (o === "out-of-limits" ? 0 : 1);
  return rank(a.outcome) - rank(b.outcome) || a.madeAt.getTime() - b.madeAt.getTime() || a.jointId - b.jointId;
}

/** Values recorded for a joint (canonical SI; null when not recorded). */
export type RecordedValues = {
  heaterTemperatureC: number | null;
  dragPressureMpa: number | null;
  beadUpGaugeMpa: number | null;
  fusionGaugeMpa: number | null;
  beadMm: number | null;
  heatSoakS: number | null;
  changeoverS: number | null;
  coolingS: number | null;
  facingOk: boolean | null;
  alignmentOk: boolean | null;
  beadRollbackOk: boolean | null;
  vGrooveOk: boolean | null;
};

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
 * One row per value: what the plan asked (a window, a minimum, a maximum, "required") and
 * what was recorded, each in the user's units, with the row flagged when the joint check
 * found that parameter out of limits or missing.
 */
export function planVersusRecorded(plan: FusionPlan, recorded: RecordedValues, findings: readonly JointFinding[], system: UnitSystem): ComparisonRow[] {
  const flagged = new Map<JointParameter, JointFinding>();
  for (const f of findings) if (!flagged.has(f.parameter)) flagged.set(f.parameter, f);
  const q = (value: number | null, kind: QuantityKind) => (value === null ? "not recorded" : formatQuantity(value, kind, system));
  const yesNo = (value: boolean | null) => (value === null ? "not recorded" : value ? "yes" : "no");
  const status = (parameter: JointParameter | null, value: unknown): ComparisonRow["status"] => {
    if (parameter && flagged.has(parameter)) return flagged.get(parameter)!.kind === "not-recorded" ? "not-recorded" : "finding";
    if (parameter === null) return "info";
    return value === null ? "not-recorded" : "ok";
  };
  const rows: ComparisonRow[] = [];
  const push = (key: string, parameter: JointParameter | null, label: string, planText: string, value: number | boolean | null, recordedText: string) =>
    rows.push({ key, parameter, label, planText, recordedText, status: status(parameter, value) });

  push("heaterTemperature", "heaterTemperature", "Heater temperature", formatRange(plan.heaterTemperatureC.min, plan.heaterTemperatureC.max, "temperature", system), recorded.heaterTemperatureC, q(recorded.heaterTemperatureC, "temperature"));
  push("dragPressure", null, "Drag pressure", `${formatQuantity(plan.dragPressureMpa, "pressure", system)} (used in the plan)`, recorded.dragPressureMpa, q(recorded.dragPressureMpa, "pressure"));
  push("beadUpPressure", "beadUpPressure", "Bead-up gauge pressure", formatRange(plan.beadUpGaugePressureMpa.min, plan.beadUpGaugePressureMpa.max, "pressure", system), recorded.beadUpGaugeMpa, q(recorded.beadUpGaugeMpa, "pressure"));
  push("fusionPressure", "fusionPressure", "Fusion gauge pressure", formatRange(plan.fusionGaugePressureMpa.min, plan.fusionGaugePressureMpa.max, "pressure", system), recorded.fusionGaugeMpa, q(recorded.fusionGaugeMpa, "pressure"));
  push("bead", "bead", "Bead size", plan.minBeadMm === null ? "not defined" : `at least ${formatQuantity(plan.minBeadMm, "length-mm", system)}`, recorded.beadMm, q(recorded.beadMm, "length-mm"));
  if (plan.heatSoakS || plan.heatSoakTargetS !== null) {
    const window = plan.heatSoakS ? formatRange(plan.heatSoakS.min, plan.heatSoakS.max, "duration", system) : "";
    const target = plan.heatSoakTargetS !== null ? `target ${formatQuantity(plan.heatSoakTargetS, "duration", system)}` : "";
    push("heatSoak", "heatSoak", "Heat soak", [window, target].filter(Boolean).join(", "), recorded.heatSoakS, q(recorded.heatSoakS, "duration"));
  }
  push("changeover", "changeover", "Changeover", plan.maxChangeoverS === null ? "not defined" : `at most ${formatQuantity(plan.maxChangeoverS, "duration", system)}`, recorded.changeoverS, q(recorded.changeoverS, "duration"));
  push("cooling", "cooling", "Cooling under pressure", plan.minCoolingS === null ? "not defined" : `at least ${formatQuantity(plan.minCoolingS, "duration", system)}`, recorded.coolingS, q(recorded.coolingS, "duration"));
  push("facing", "facing", "Facing complete and square", "required", recorded.facingOk, yesNo(recorded.facingOk));
  push("alignment", "alignment", "Alignment", "required", recorded.alignmentOk, yesNo(recorded.alignmentOk));
  push("beadRollback", "visualBead", "Bead rolled back to the pipe", "required", recorded.beadRollbackOk, yesNo(recorded.beadRollbackOk));
  push("vGroove", "visualBead", "V-groove above the pipe surface", "required", recorded.vGrooveOk, yesNo(recorded.vGrooveOk));
  return rows;
}

/**
 * The joint's findings with messages in the viewer's units: the check is run again on the
 * stored plan and values with `system`; when that does not give the same parameters as the
 * findings stored at recording (a value the check then had that is not stored here), the
 * stored findings are shown as they are.
 */
export function findingsForViewer(plan: FusionPlan | null, recorded: RecordedValues, stored: readonly JointFinding[], system: UnitSystem): JointFinding[] {
  if (!plan) return [...stored];
  const again = checkJoint(plan, jointMeasurements(recorded), { system }).findings;
  const key = (list: readonly JointFinding[]) => list.map((f) => `${f.parameter}:${f.kind}`).sort().join("|");
  return key(again) === key(stored) ? again : [...stored];
}
