// The review queue's ordering rule, and the plan-versus-recorded comparison each queue item
// shows. Canonical SI in, the user's units out (domain/units).
import type { JointConditions } from "@/domain/procedures/weather";
import type { FusionPlan } from "@/domain/fusion/plan";
import { checkJoint, MAX_MISALIGNMENT_WALL_FRACTION, type JointFinding } from "@/domain/fusion/check";
import type { JointOutcome } from "@/domain/joints/outcomes";
import type { JointParameter } from "@/domain/fusion/parameters";
import { localDayRange } from "@/domain/dates/zone";
import type { QueueOrder } from "@/domain/review/schemas";

export { BATCH_SKIP_LABELS, type BatchSkipReason } from "@/domain/review/schemas";
import { formatQuantity, formatRange, type QuantityKind, type UnitSystem } from "@/domain/units/format";
import { RECORDED_VALUE_DEFINITIONS, type RecordedValues } from "@/domain/joints/values";

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
