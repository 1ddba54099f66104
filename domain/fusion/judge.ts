// One recorded value judged against the plan while it is typed (the Trench shows it beside
// the field before the joint is recorded). The verdict is checkJoint's own for that value
// (domain/fusion/check: same limits, same on-limit rule and instrument tolerance), so the
// device can never say "inside" where the check finds a miss; the server's check of the
// whole joint remains the record. Limits per the plan's procedure (ASTM F2620 / ISO 21307 /
// DVS 2207-1 windows, domain/procedures).

import type { FusionPlan } from '@/domain/fusion/plan';
import { checkJoint, readingSlack, valueLimits, type CheckJointOptions, type JointMeasurements, type LimitedValueKey } from '@/domain/fusion/check';
import { QUANTITY_VALUES, type QuantityValueKey } from '@/domain/joints/values';
import { formatQuantity, formatRange, type QuantityKind, type UnitSystem } from '@/domain/units/format';

/** Where a value sits: inside its limit (or on it), below the minimum, above the maximum. */
export type ValueVerdict = 'inside' | 'below' | 'above';

export interface ValueJudgement {
  verdict: ValueVerdict;
  /** The limit the value was held to, canonical SI; either end may be null. */
  limit: { min: number | null; max: number | null };
  /** Inside only because the instrument cannot read closer (half a resolution step past the limit). */
  byReadingStep: boolean;
  /** Plain words in the user's units: "Inside 400–450 °F", "Above the window (400–450 °F)". */
  text: string;
}

/**
 * Judge one recorded value (canonical SI: °C, MPa, mm, s) against the plan, as the joint
 * check would judge it. Returns null where the plan sets no limit for this value (drag,
 * a heat soak the procedure ends by bead size) or the value is not a finite number.
 * `options.system` sets the units of the words (SI by default); `options.conditions`
 * (recorded ambient and shelter) lengthens the minimum cooling time in warm weather where
 * the procedure says so, as the server's check does.
 */
export function judgeValue(plan: FusionPlan, key: QuantityValueKey, value: number, options: CheckJointOptions = {}): ValueJudgement | null {
  const definition = QUANTITY_VALUES.find((d) => d.key === key);
  const limits = valueLimits(plan, options);
  if (!Number.isFinite(value) || !definition || definition.parameter === null || !(key in limits)) return null;
  const limit = limits[key as LimitedValueKey];
  if (!limit || (limit.min === null && limit.max === null)) return null;

  // checkJoint with only this value recorded: the other core values are "not recorded"
  // findings, which are left aside; a miss on this value is the verdict.
  const only = { heaterTemperatureC: null, fusionGaugePressureMpa: null, beadMm: null, changeoverS: null, coolingS: null, [key]: value } as JointMeasurements;
  const miss = checkJoint(plan, only, { conditions: options.conditions }).findings.find(
    (f) => f.parameter === definition.parameter && f.kind !== 'not-recorded' && f.measured === value,
  );
  const verdict: ValueVerdict = miss?.kind === 'below-minimum' ? 'below' : miss?.kind === 'above-maximum' ? 'above' : 'inside';
  const kind = definition.quantity;
  const byReadingStep = verdict === 'inside' && readingSlack(plan, kind) > 0 && ((limit.min !== null && value < limit.min) || (limit.max !== null && value > limit.max));
  return { verdict, limit: { ...limit }, byReadingStep, text: words(verdict, limit, kind, options.system ?? 'si', byReadingStep) };
}

function words(verdict: ValueVerdict, limit: { min: number | null; max: number | null }, kind: QuantityKind, system: UnitSystem, byReadingStep: boolean): string {
  const isTime = kind === 'duration';
  const step = byReadingStep ? (kind === 'pressure' ? ' (within the gauge’s reading step)' : ' (within the thermometer’s reading step)') : '';
  if (limit.min !== null && limit.max !== null) {
    const range = formatRange(limit.min, limit.max, kind, system);
    if (verdict === 'inside') return `Inside ${range}${step}`;
    if (isTime) return `${verdict === 'above' ? 'Longer' : 'Shorter'} than the window (${range})`;
    return `${verdict === 'above' ? 'Above' : 'Below'} the window (${range})`;
  }
  if (limit.min !== null) {
    const min = formatQuantity(limit.min, kind, system);
    if (verdict === 'inside') return `Meets the ${min} minimum${step}`;
    return `${isTime ? 'Shorter than' : 'Below'} the minimum (${min})`;
  }
  const max = formatQuantity(limit.max as number, kind, system);
  if (verdict === 'inside') return `Within the ${max} maximum${step}`;
  return `${isTime ? 'Longer than' : 'Above'} the maximum (${max})`;
}
