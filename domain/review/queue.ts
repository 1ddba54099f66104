// The review queue's ordering rule, and the plan-versus-recorded comparison each queue item
// shows. Canonical SI in, the user's units out (domain/units).
import type { JointConditions } from "@/domain/procedures/weather";
import type { FusionPlan } from "@/domain/fusion/plan";
import { checkJoint, isRequiredValue, MAX_MISALIGNMENT_WALL_FRACTION, type JointFinding } from "@/domain/fusion/check";
import type { JointOutcome } from "@/domain/joints/outcomes";
import type { JointParameter } from "@/domain/fusion/parameters";
import { formatQuantity, formatRange, type QuantityKind, type UnitSystem } from "@/domain/units/format";
import { missingValueText, NOT_RECORDED_OPTIONAL, RECORDED_VALUE_DEFINITIONS, type RecordedValues } from "@/domain/joints/values";
import { SHELTER_LABELS, SHELTER_PHRASES } from "@/domain/joints/shelters";

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
  /**
   * "finding" when the check raised a finding on this parameter, "not-recorded" when a value
   * the procedure requires is missing, "optional" when an optional value was left empty
   * (neutral, not a finding), "info" for a value the check does not judge.
   */
  status: "ok" | "finding" | "not-recorded" | "optional" | "info";
};

/** The words of a row's check column (the review panel shows them). */
export const COMPARISON_STATUS_WORDS: Record<ComparisonRow["status"], string> = {
  ok: "Within plan",
  finding: "Out of limits",
  "not-recorded": "Not recorded (required)",
  optional: "Optional",
  info: "—",
};

/** What the plan asks of each checked parameter, in the user's units. */
const PLAN_TEXT: Partial<Record<JointParameter, (plan: FusionPlan, system: UnitSystem) => string>> = {
  heaterTemperature: (plan, system) => formatRange(plan.heaterTemperatureC.min, plan.heaterTemperatureC.max, "temperature", system),
  beadUpPressure: (plan, system) => formatRange(plan.beadUpGaugePressureMpa.min, plan.beadUpGaugePressureMpa.max, "pressure", system),
  fusionPressure: (plan, system) => formatRange(plan.fusionGaugePressureMpa.min, plan.fusionGaugePressureMpa.max, "pressure", system),
  bead: (plan, system) => (plan.minBeadMm === null ? "not defined" : `at least ${formatQuantity(plan.minBeadMm, "length-mm", system)}`),
  heatSoak: (plan, system) => {
    if (!plan.heatSoakS && plan.heatSoakTargetS === null) return "no time set (ended by the bead)";
    const window = plan.heatSoakS ? formatRange(plan.heatSoakS.min, plan.heatSoakS.max, "duration", system) : "";
    const target = plan.heatSoakTargetS !== null ? `target ${formatQuantity(plan.heatSoakTargetS, "duration", system)}` : "";
    return [window, target].filter(Boolean).join(", ");
  },
  heatSoakPressure: (plan, system) => (plan.maxHeatSoakGaugePressureMpa == null ? "no limit in the procedure" : `at most ${formatQuantity(plan.maxHeatSoakGaugePressureMpa, "pressure", system)}`),
  changeover: (plan, system) => (plan.maxChangeoverS === null ? "not defined" : `at most ${formatQuantity(plan.maxChangeoverS, "duration", system)}`),
  cooling: (plan, system) => (plan.minCoolingS === null ? "not defined" : `at least ${formatQuantity(plan.minCoolingS, "duration", system)}`),
  // The measured hi-lo row (the yes/no alignment check reads "required").
  alignment: (plan, system) => `at most ${formatQuantity(MAX_MISALIGNMENT_WALL_FRACTION * plan.wallMm, "length-mm", system)} (10 % of the wall)`,
};

/**
 * One row per recorded value (domain/joints/values, in its order), then ambient and
 * shelter: what the plan asked (a window, a minimum, a maximum, "required") and what was
 * recorded, each in the user's units. A row is a finding when the joint check found that
 * parameter out of limits; a missing value is "not recorded (required)" only when the
 * check requires it (isRequiredValue, or a not-recorded finding), otherwise it reads "not
 * recorded (optional)" and is neutral. A value the check does not judge shows the plan's
 * own figure when it has one (drag pressure, used in the plan).
 */
export function planVersusRecorded(plan: FusionPlan, recorded: RecordedValues, findings: readonly JointFinding[], system: UnitSystem, conditions?: JointConditions): ComparisonRow[] {
  const flagged = new Map<JointParameter, JointFinding>();
  for (const f of findings) if (!flagged.has(f.parameter) || f.kind !== "not-recorded") flagged.set(f.parameter, f);
  const notRecordedFinding = (parameter: JointParameter | null) => !!parameter && findings.some((f) => f.parameter === parameter && f.kind === "not-recorded");
  const values = recorded as Record<string, number | boolean | null>;
  const planValues = plan as unknown as Record<string, unknown>;
  const rows: ComparisonRow[] = [];
  for (const d of RECORDED_VALUE_DEFINITIONS) {
    const value = values[d.key] ?? null;
    const required = isRequiredValue(plan, d);
    let status: ComparisonRow["status"];
    if (value === null) status = required || notRecordedFinding(d.parameter) ? "not-recorded" : "optional";
    else if (d.parameter === null) status = "info";
    else {
      const finding = flagged.get(d.parameter);
      status = finding && finding.kind !== "not-recorded" ? "finding" : "ok";
    }
    let planText: string;
    let recordedText: string;
    const missing = missingValueText(d, status === "not-recorded");
    if (d.type === "check") {
      planText = "required";
      recordedText = value === null ? missing : value ? "yes" : "no";
    } else {
      const planned = planValues[d.key];
      planText = d.parameter ? (PLAN_TEXT[d.parameter]?.(plan, system) ?? "") : typeof planned === "number" ? `${formatQuantity(planned, d.quantity, system)} (used in the plan)` : "";
      recordedText = value === null ? missing : formatQuantity(value as number, d.quantity as QuantityKind, system);
    }
    rows.push({ key: d.name, parameter: d.parameter, label: d.label, planText, recordedText, status });
  }
  if (conditions) rows.push(...conditionRows(plan, conditions, findings, system));
  return rows;
}

/** Ambient temperature and shelter against the procedure's weather rules (domain/procedures/weather judges them). */
function conditionRows(plan: FusionPlan, conditions: JointConditions, findings: readonly JointFinding[], system: UnitSystem): ComparisonRow[] {
  const weather = plan.weather ?? null;
  const statusOf = (parameter: "ambient" | "shelter", known: boolean): ComparisonRow["status"] => {
    const finding = findings.find((f) => f.parameter === parameter);
    if (finding) return finding.kind === "not-recorded" ? "not-recorded" : "finding";
    return known ? "ok" : "optional";
  };
  const ambientStatus = statusOf("ambient", conditions.ambientC !== null);
  const shelterStatus = statusOf("shelter", conditions.shelter !== null);
  const missing = (status: ComparisonRow["status"]) => (status === "not-recorded" ? "not recorded" : NOT_RECORDED_OPTIONAL);
  const ambientPlan = weather?.ambientRangeC ? formatRange(weather.ambientRangeC.min, weather.ambientRangeC.max, "temperature", system) : "no range in the procedure";
  const shelterPlan = [
    weather?.shelterAlways ? `at least ${SHELTER_PHRASES[weather.shelterAlways.shelter]}` : "",
    weather?.coldShelter ? `at least ${SHELTER_PHRASES[weather.coldShelter.shelter]} below ${formatQuantity(weather.coldShelter.belowC, "temperature", system)}` : "",
  ].filter(Boolean).join("; ") || "none asked for";
  return [
    { key: "ambient", parameter: "ambient", label: "Ambient temperature", planText: ambientPlan, recordedText: conditions.ambientC === null ? missing(ambientStatus) : formatQuantity(conditions.ambientC, "temperature", system), status: ambientStatus },
    { key: "shelter", parameter: "shelter", label: "Shelter", planText: shelterPlan, recordedText: conditions.shelter === null ? missing(shelterStatus) : SHELTER_LABELS[conditions.shelter], status: shelterStatus },
  ];
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
