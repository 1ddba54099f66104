// The review queue's ordering rule, and the plan-versus-recorded comparison each queue item
// shows. Canonical SI in, the user's units out (domain/units).
import type { JointConditions } from "@/domain/procedures/weather";
import type { FusionPlan } from "@/domain/fusion/plan";
import { checkJoint, isRequiredValue, MAX_MISALIGNMENT_WALL_FRACTION, type JointFinding } from "@/domain/fusion/check";
import type { JointOutcome } from "@/domain/joints/outcomes";
import type { JointParameter } from "@/domain/fusion/parameters";
import { localDayRange } from "@/domain/dates/zone";
import type { QueueOrder } from "@/domain/review/schemas";

export { BATCH_SKIP_LABELS, type BatchSkipReason } from "@/domain/review/schemas";
import { formatQuantity, formatRange, type QuantityKind, type UnitSystem } from "@/domain/units/format";
import { missingValueText, NOT_RECORDED_OPTIONAL, RECORDED_VALUE_DEFINITIONS, type RecordedValues } from "@/domain/joints/values";
import { SHELTER_LABELS, SHELTER_PHRASES } from "@/domain/joints/shelters";

export type { RecordedValues } from "@/domain/joints/values";

type QueueKey = { outcome: JointOutcome; madeAt: Date; jointId: number };

/**
 * Queue orders. "oldest" (the default): the joint made first, then by id so the order is
 * total. "out-of-limits-first": joints out of limits first, then the rest, each oldest
 * first. database/queries/reviews.ts sorts the same way in SQL; tests check the two agree.
 */
export function compareQueueItems(a: QueueKey, b: QueueKey, order: QueueOrder = "oldest"): number {
  const rank = (o: JointOutcome) => (order === "out-of-limits-first" && o === "within-limits" ? 1 : 0);
  return rank(a.outcome) - rank(b.outcome) || a.madeAt.getTime() - b.madeAt.getTime() || a.jointId - b.jointId;
}

/** Where a page of the queue ends: the last item's sort key (outcome, made at, id). Keyset paging, never an offset. */
export type QueueCursor = QueueKey;

/** The cursor as the URL carries it: "o" or "w", made at in ms, joint id (e.g. "w.1764576000000.37"). */
export function encodeQueueCursor(c: QueueCursor): string {
  return `${c.outcome === "out-of-limits" ? "o" : "w"}.${c.madeAt.getTime()}.${c.jointId}`;
}

/** The cursor back from its text; null when it is not one encodeQueueCursor wrote. */
export function decodeQueueCursor(text: string): QueueCursor | null {
  const match = /^([ow])\.(\d{1,15})\.(\d{1,12})$/.exec(text);
  if (!match) return null;
  const jointId = Number(match[3]);
  if (!Number.isSafeInteger(jointId) || jointId < 1) return null;
  return { outcome: match[1] === "o" ? "out-of-limits" : "within-limits", madeAt: new Date(Number(match[2])), jointId };
}

/** The queue filter as the query reads it: ids, and instants for the age and the days made. */
export type QueueQuery = {
  jobId?: number;
  fuserId?: number;
  machineId?: number;
  outcome?: JointOutcome;
  finding?: JointParameter;
  /** Made before this instant (waiting more than N days). */
  madeBefore?: Date;
  /** Made at or after this instant (the first day's start). */
  madeFrom?: Date;
  /** Made before this instant (the day after the last day). */
  madeUntil?: Date;
};

/**
 * The filter from the URL (domain/review/schemas queueFilterSchema) as instants: "waiting
 * more than N days" is made more than N × 24 h before `now`; the days made are the
 * organisation's local days in `zone`, both ends included.
 */
export function toQueueQuery(
  f: { job?: number; fuser?: number; machine?: number; outcome?: JointOutcome; finding?: JointParameter; waiting?: number; from?: string; to?: string },
  { now, zone }: { now: Date; zone: string },
): QueueQuery {
  return {
    jobId: f.job,
    fuserId: f.fuser,
    machineId: f.machine,
    outcome: f.outcome,
    finding: f.finding,
    madeBefore: f.waiting ? new Date(now.getTime() - f.waiting * 86_400_000) : undefined,
    madeFrom: f.from ? localDayRange(f.from, zone).start : undefined,
    madeUntil: f.to ? localDayRange(f.to, zone).nextStart : undefined,
  };
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
