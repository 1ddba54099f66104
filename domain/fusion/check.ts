// Joint check: every recorded value of a butt-fusion joint against its pressure plan
// (windows from the procedure the plan was made under; see domain/procedures for sources).
// A value exactly on a limit passes, and a pressure or temperature reading within half a
// resolution step of the machine's instrument (domain/fusion/instrument); a value not
// recorded is a finding of its own.

import type { FusionPlan } from '@/domain/fusion/plan';
import type { JointParameter } from '@/domain/fusion/parameters';
import type { JointOutcome } from '@/domain/joints/outcomes';
import { jointMeasurements, type RecordedValueDefinition, type RecordedValues } from '@/domain/joints/values';
import { readingTolerance } from '@/domain/fusion/instrument';
import { MAX_MISALIGNMENT_WALL_FRACTION } from '@/domain/procedures/alignment';
import { adjustedMinCoolingS, weatherProblems, type JointConditions } from '@/domain/procedures/weather';
import {
  formatQuantity,
  formatRange,
  type QuantityKind,
  type UnitSystem,
} from '@/domain/units/format';

export type { JointOutcome } from '@/domain/joints/outcomes';
export { JOINT_PARAMETERS, type JointParameter } from '@/domain/fusion/parameters';

/** Why a finding was raised. */
export type FindingKind = 'below-minimum' | 'above-maximum' | 'not-recorded' | 'check-failed' | 'disagrees-with-trace';

export interface JointFinding {
  parameter: JointParameter;
  kind: FindingKind;
  /** Measured value in canonical SI (°C, MPa, mm, s), true/false for checks, null if not recorded. */
  measured: number | boolean | null;
  /** The limit in canonical SI; null for boolean checks. */
  limit: { min: number | null; max: number | null } | null;
  /** Plain-language sentence in the user's units. */
  message: string;
}

export interface JointCheck {
  outcome: JointOutcome;
  findings: JointFinding[];
}

/**
 * Recorded values in canonical SI. The five core values are always expected: null or
 * undefined is a "not recorded" finding. Heat soak is expected when the plan has a
 * heat-soak window. Bead-up pressure and pressure build-up are checked when given.
 * Boolean checks (facing, alignment, visual bead) are checked when the key is present:
 * false fails, null is "not recorded"; an absent key is not part of this record.
 * Heat-soak gauge pressure is checked when given (typed or read from a trace); the lowest
 * pressure held during cooling comes only from a trace read against the plan.
 */
export interface JointMeasurements {
  heaterTemperatureC: number | null | undefined;
  fusionGaugePressureMpa: number | null | undefined;
  beadMm: number | null | undefined;
  changeoverS: number | null | undefined;
  coolingS: number | null | undefined;
  heatSoakS?: number | null;
  beadUpGaugePressureMpa?: number | null;
  pressureBuildUpS?: number | null;
  heatSoakGaugePressureMpa?: number | null;
  /** Heater surface read with a pyrometer or surface thermometer, °C (apart from the dial); checked when recorded. */
  heaterSurfaceTemperatureC?: number | null;
  /** Outside misalignment (hi-lo) of the two ends in the machine, mm; checked when recorded. */
  misalignmentMm?: number | null;
  /** Lowest gauge pressure held during the plan's minimum cooling time, MPa (from a trace). */
  lowestCoolingGaugePressureMpa?: number | null;
  facingOk?: boolean | null;
  alignmentOk?: boolean | null;
  visualBeadOk?: boolean | null;
}

export interface CheckJointOptions {
  /** Units of the messages; SI by default. */
  system?: UnitSystem;
  /**
   * The ambient temperature and shelter recorded with the joint. With them, the plan's
   * weather rules are checked (ambient range, shelter) and its minimum cooling time grows
   * in warm weather where the procedure says so; without them (a plan preview, a value
   * check alone) weather is not judged.
   */
  conditions?: JointConditions;
}

/**
 * The gauge pressure the joint must be held at or above while it cools, MPa: the fusion
 * gauge minimum, or for ISO 21307 dual low-pressure the reduced cooling pressure P5 that
 * follows the full-pressure stretch (the plan's cooling gauge minimum). The duration of the
 * full-pressure stretch is only a note of that procedure, so it is not checked here.
 */
export function coolingHoldMinimumGaugePressureMpa(plan: FusionPlan): number {
  return plan.coolingGaugePressureMpa ? plan.coolingGaugePressureMpa.min : plan.fusionGaugePressureMpa.min;
}

export { MAX_MISALIGNMENT_WALL_FRACTION } from '@/domain/procedures/alignment';

const isRecorded = (value: number | null | undefined): value is number =>
  typeof value === 'number' && Number.isFinite(value);

/**
 * The limits checkJoint holds each recorded quantity to, canonical SI (°C, MPa, mm, s);
 * null where the plan sets none for that value (heat soak ended by bead size, a procedure
 * without a pressure build-up limit). Defined here once: the check and the device's
 * per-value judgement (domain/fusion/judge) both read them. With `conditions`, the minimum
 * cooling time grows in warm weather where the procedure says so (domain/procedures/weather).
 */
export function valueLimits(plan: FusionPlan, options: Pick<CheckJointOptions, 'conditions'> = {}) {
  const minCoolingS = options.conditions ? adjustedMinCoolingS(plan.minCoolingS, plan.weather, options.conditions.ambientC) : plan.minCoolingS;
  return {
    heaterTemperatureC: { min: plan.heaterTemperatureC.min, max: plan.heaterTemperatureC.max },
    // The dial is only a general indicator; the surface reading is judged on its own (PPI).
    heaterSurfaceTemperatureC: { min: plan.heaterTemperatureC.min, max: plan.heaterTemperatureC.max },
    beadUpGaugePressureMpa: { min: plan.beadUpGaugePressureMpa.min, max: plan.beadUpGaugePressureMpa.max },
    fusionGaugePressureMpa: { min: plan.fusionGaugePressureMpa.min, max: plan.fusionGaugePressureMpa.max },
    beadMm: { min: plan.minBeadMm, max: null },
    heatSoakS: plan.heatSoakS ? { min: plan.heatSoakS.min, max: plan.heatSoakS.max } : null,
    heatSoakGaugePressureMpa: { min: null, max: plan.maxHeatSoakGaugePressureMpa ?? null },
    changeoverS: { min: null, max: plan.maxChangeoverS },
    pressureBuildUpS: { min: null, max: plan.pressureBuildUpS },
    coolingS: { min: minCoolingS, max: null },
    // Outside misalignment at most 10 % of the wall (PE pipe makers' butt-fusion guides).
    misalignmentMm: { min: null, max: MAX_MISALIGNMENT_WALL_FRACTION * plan.wallMm },
  } satisfies Record<string, { min: number | null; max: number | null } | null>;
}

/**
 * Whether checkJoint raises a "not recorded" finding when this value is missing under this
 * plan — the one answer to "is it required?" for every screen that shows a missing value:
 * every yes/no check; a quantity whose `missingIsFinding` is set (domain/joints/values),
 * heat soak only where the plan has a heat-soak window. Drag pressure (no check parameter)
 * and the optional readings (bead-up, heat-soak gauge, pyrometer, hi-lo) are not.
 */
export function isRequiredValue(plan: Pick<FusionPlan, 'heatSoakS'>, definition: RecordedValueDefinition): boolean {
  if (definition.parameter === null) return false;
  if (definition.type === 'check') return true;
  if (!definition.missingIsFinding) return false;
  if (definition.parameter === 'heatSoak') return !!plan.heatSoakS;
  return true;
}

/** The recorded quantities the check holds to a limit of the plan. */
export type LimitedValueKey = keyof ReturnType<typeof valueLimits>;

/** Half a resolution step of the plan's instrument for this kind of reading (gauge MPa, thermometer °C); 0 for bead, misalignment and times. */
export function readingSlack(plan: FusionPlan, kind: QuantityKind): number {
  return kind === 'pressure' ? readingTolerance(plan.instrument?.gaugeResolutionMpa) : kind === 'temperature' ? readingTolerance(plan.instrument?.thermometerResolutionC) : 0;
}

/** A value passes a limit when inside it or on it, or within half a resolution step of the plan's instrument (see checkJoint). */
export function passesLimit(plan: FusionPlan, value: number, limit: number, side: 'min' | 'max', kind: QuantityKind): boolean {
  // 1e-9: binary fractions (232.2 + 0.05) must not turn "half a step" into "just over".
  const slack = readingSlack(plan, kind) + 1e-9;
  return side === 'min' ? value >= limit - slack : value <= limit + slack;
}

/**
 * Check recorded values against a plan. Inputs canonical SI; messages in `options.system`.
 * On-limit rule: a value passes when it is inside the limit or on it. A gauge pressure or a
 * temperature also passes within half a resolution step of the plan's instrument (gauge
 * MPa, thermometer °C; domain/fusion/instrument): the instrument cannot read closer.
 * Bead, misalignment and times have no instrument tolerance; plans without an instrument
 * have none either.
 * Outcome is out-of-limits when there is at least one finding. A joint's RecordedValues
 * (domain/joints/values) are taken as they are: the two bead checks become the visual bead.
 */
export function checkJoint(plan: FusionPlan, values: JointMeasurements | RecordedValues, options: CheckJointOptions = {}): JointCheck {
  const measured = isRecordedValues(values) ? jointMeasurements(values) : values;
  const system = options.system ?? 'si';
  const findings: JointFinding[] = [];
  const fmt = (value: number, kind: QuantityKind) => formatQuantity(value, kind, system);
  const wallText = `for a ${fmt(plan.wallMm, 'length-mm')} wall`;
  const odText = `for a ${fmt(plan.outsideDiameterMm, 'length-mm')} OD pipe`;

  const limits = valueLimits(plan, options);
  const passes = (value: number, limit: number, side: 'min' | 'max', kind: QuantityKind): boolean => passesLimit(plan, value, limit, side, kind);

  const notRecorded = (parameter: JointParameter, name: string, limit: JointFinding['limit']) =>
    findings.push({ parameter, kind: 'not-recorded', measured: null, limit, message: `${name} was not recorded` });

  const windowCheck = (
    parameter: JointParameter,
    name: string,
    value: number | null | undefined,
    window: { min: number; max: number },
    kind: QuantityKind,
    context: string,
  ) => {
    const limit = { min: window.min, max: window.max };
    if (!isRecorded(value)) return notRecorded(parameter, name, limit);
    const range = formatRange(window.min, window.max, kind, system);
    if (!passes(value, window.min, 'min', kind)) {
      findings.push({ parameter, kind: 'below-minimum', measured: value, limit, message: `${name} ${fmt(value, kind)} is below the ${range} window${context}` });
    } else if (!passes(value, window.max, 'max', kind)) {
      findings.push({ parameter, kind: 'above-maximum', measured: value, limit, message: `${name} ${fmt(value, kind)} is above the ${range} window${context}` });
    }
  };

  const minimumCheck = (
    parameter: JointParameter,
    name: string,
    value: number | null | undefined,
    min: number | null,
    kind: QuantityKind,
    words: { short: string },
    context: string,
  ) => {
    const limit = { min, max: null };
    if (!isRecorded(value)) return notRecorded(parameter, name, min === null ? null : limit);
    if (min === null) return;
    if (!passes(value, min, 'min', kind)) {
      findings.push({ parameter, kind: 'below-minimum', measured: value, limit, message: `${name} ${fmt(value, kind)} is ${words.short} than the ${fmt(min, kind)} minimum ${context}` });
    }
  };

  const maximumCheck = (
    parameter: JointParameter,
    name: string,
    value: number | null | undefined,
    max: number | null,
    kind: QuantityKind,
    words: { long: string },
    context: string,
  ) => {
    const limit = { min: null, max };
    if (!isRecorded(value)) return notRecorded(parameter, name, max === null ? null : limit);
    if (max === null) return;
    if (!passes(value, max, 'max', kind)) {
      findings.push({ parameter, kind: 'above-maximum', measured: value, limit, message: `${name} ${fmt(value, kind)} is ${words.long} than the ${fmt(max, kind)} maximum ${context}` });
    }
  };

  windowCheck('heaterTemperature', 'Heater temperature', measured.heaterTemperatureC, limits.heaterTemperatureC, 'temperature', '');
  // The dial is only a general indicator; the surface reading is judged on its own (PPI).
  if (isRecorded(measured.heaterSurfaceTemperatureC)) {
    windowCheck('heaterTemperature', 'Heater surface temperature', measured.heaterSurfaceTemperatureC, limits.heaterSurfaceTemperatureC, 'temperature', ' (pyrometer reading)');
  }
  if (measured.beadUpGaugePressureMpa !== undefined) {
    windowCheck('beadUpPressure', 'Bead-up gauge pressure', measured.beadUpGaugePressureMpa, limits.beadUpGaugePressureMpa, 'pressure', ' for this pipe and machine');
  }
  windowCheck('fusionPressure', 'Fusion gauge pressure', measured.fusionGaugePressureMpa, limits.fusionGaugePressureMpa, 'pressure', ' for this pipe and machine');
  minimumCheck('bead', 'Bead', measured.beadMm, limits.beadMm.min, 'length-mm', { short: 'smaller' }, plan.minBeadBasis === 'outside-diameter-mm' ? odText : wallText);

  if (limits.heatSoakS) {
    const value = measured.heatSoakS;
    const limit = { ...limits.heatSoakS };
    if (!isRecorded(value)) {
      notRecorded('heatSoak', 'Heat-soak time', limit);
    } else if (limit.min !== null && !passes(value, limit.min, 'min', 'duration')) {
      findings.push({ parameter: 'heatSoak', kind: 'below-minimum', measured: value, limit, message: `Heat soak ${fmt(value, 'duration')} is shorter than the ${fmt(limit.min, 'duration')} minimum ${wallText}` });
    } else if (limit.max !== null && !passes(value, limit.max, 'max', 'duration')) {
      findings.push({ parameter: 'heatSoak', kind: 'above-maximum', measured: value, limit, message: `Heat soak ${fmt(value, 'duration')} is longer than the ${fmt(limit.max, 'duration')} maximum ${wallText}` });
    }
  }

  if (measured.heatSoakGaugePressureMpa !== undefined) {
    const max = limits.heatSoakGaugePressureMpa.max;
    const value = measured.heatSoakGaugePressureMpa;
    const limit = { min: null, max };
    if (!isRecorded(value)) {
      notRecorded('heatSoakPressure', 'Heat-soak gauge pressure', max === null ? null : limit);
    } else if (max !== null && !passes(value, max, 'max', 'pressure')) {
      // F2620 / ISO 21307 soak at drag ("without force"); DVS 2207-1 allows a little force.
      const why = plan.maxHeatSoakInterfacialPressureMpa
        ? `the ${fmt(max, 'pressure')} maximum for this pipe and machine (${fmt(plan.maxHeatSoakInterfacialPressureMpa, 'pressure')} at the pipe ends)`
        : `the ${fmt(max, 'pressure')} drag: the ends must soak against the heater without force`;
      findings.push({ parameter: 'heatSoakPressure', kind: 'above-maximum', measured: value, limit, message: `Heat-soak gauge pressure ${fmt(value, 'pressure')} is above ${why}` });
    }
  }

  maximumCheck('changeover', 'Changeover', measured.changeoverS, limits.changeoverS.max, 'duration', { long: 'longer' }, wallText);
  if (measured.pressureBuildUpS !== undefined) {
    maximumCheck('pressureBuildUp', 'Pressure build-up', measured.pressureBuildUpS, limits.pressureBuildUpS.max, 'duration', { long: 'longer' }, wallText);
  }
  const minCoolingS = limits.coolingS.min;
  const coolingContext = minCoolingS !== plan.minCoolingS && options.conditions?.ambientC != null
    ? `${wallText} at ${fmt(options.conditions.ambientC, 'temperature')} ambient (the procedure lengthens cooling in warm weather)`
    : wallText;
  minimumCheck('cooling', 'Cooling', measured.coolingS, minCoolingS, 'duration', { short: 'shorter' }, coolingContext);
  if (isRecorded(measured.lowestCoolingGaugePressureMpa)) {
    const lowest = measured.lowestCoolingGaugePressureMpa;
    const min = coolingHoldMinimumGaugePressureMpa(plan);
    if (!passes(lowest, min, 'min', 'pressure')) {
      // At drag or less nothing pushes the ends together: released (or leaked right down).
      const released = passes(lowest, plan.dragPressureMpa, 'max', 'pressure');
      const message = released
        ? `Pressure was lost during cooling: it fell to ${fmt(lowest, 'pressure')}, at or below the ${fmt(plan.dragPressureMpa, 'pressure')} drag, before the joint had cooled (early release or leak-down)`
        : `Pressure during cooling fell to ${fmt(lowest, 'pressure')}, below the ${fmt(min, 'pressure')} minimum for this pipe and machine (leak-down)`;
      findings.push({ parameter: 'coolingPressure', kind: 'below-minimum', measured: lowest, limit: { min, max: null }, message });
    }
  }

  const booleanCheck = (parameter: JointParameter, value: boolean | null | undefined, name: string, failed: string) => {
    if (value === undefined) return;
    if (value === null) return notRecorded(parameter, name, null);
    if (!value) findings.push({ parameter, kind: 'check-failed', measured: false, limit: null, message: failed });
  };
  if (isRecorded(measured.misalignmentMm)) {
    maximumCheck('alignment', 'Misalignment', measured.misalignmentMm, limits.misalignmentMm.max, 'length-mm', { long: 'more' }, `(10 % of the ${fmt(plan.wallMm, 'length-mm')} wall)`);
  }
  booleanCheck('facing', measured.facingOk, 'Facing check', 'Facing was not confirmed complete and square');
  booleanCheck('alignment', measured.alignmentOk, 'Alignment check', 'Alignment check did not pass');
  booleanCheck('visualBead', measured.visualBeadOk, 'Visual bead check', 'Visual bead check did not pass');
  if (options.conditions) findings.push(...weatherProblems(plan.weather, options.conditions, system));

  return { outcome: findings.length === 0 ? 'within-limits' : 'out-of-limits', findings };
}

/** A joint's record (two bead checks) rather than the check's own input (one visual bead). */
function isRecordedValues(values: JointMeasurements | RecordedValues): values is RecordedValues {
  return !('visualBeadOk' in values) && ('beadRollbackOk' in values || 'vGrooveOk' in values);
}

/** True when a check has at least one finding. */
export function isOutOfLimits(check: JointCheck): boolean {
  return check.outcome === 'out-of-limits';
}
