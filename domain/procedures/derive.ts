// Deriving an operator's procedure: a base procedure may only be tightened.

import { clone } from '@/domain/procedures/helpers';
import type { Sourced } from '@/domain/sources';
import type {
  WeatherRules,
  ProcedureDefinition,
  SizeRule,
  SourcedRange,
  Window,
} from '@/domain/procedures/types';
import { formatQuantity, type QuantityKind, type UnitSystem } from '@/domain/units/format';
import { SHELTER_PHRASES, shelterAtLeast, type Shelter } from '@/domain/joints/shelters';
import { weatherRulesOf } from '@/domain/procedures/weather';

/** Narrow a window: a new minimum may only be higher, a new maximum only lower. */
export interface WindowTightening {
  min?: number;
  max?: number;
}

/** Raise a minimum-type rule: scale by factor ≥ 1 and/or never below `atLeast`. */
export interface MinimumTightening {
  factor?: number;
  atLeast?: number;
}

/** Lower a maximum-type rule: scale by factor ≤ 1 and/or never above `atMost`. */
export interface MaximumTightening {
  factor?: number;
  atMost?: number;
}

/** What an operator may change in a base procedure (all optional; absent = unchanged). */
export interface ProcedureTightening {
  heaterTemperatureC?: WindowTightening;
  beadUpInterfacialPressureMpa?: WindowTightening;
  fusionInterfacialPressureMpa?: WindowTightening;
  coolingInterfacialPressureMpa?: WindowTightening;
  minBeadMm?: MinimumTightening;
  heatSoakMinS?: MinimumTightening;
  heatSoakMaxS?: MaximumTightening;
  maxChangeoverS?: MaximumTightening;
  maxPressureBuildUpS?: MaximumTightening;
  minCoolingS?: MinimumTightening;
  wallRangeMm?: WindowTightening;
  outsideDiameterRangeMm?: WindowTightening;
  weather?: WeatherTightening;
}

/**
 * An operator's weather rules (°C): the ambient range may only narrow, a shelter asked for
 * only grow, the cold threshold only rise. A cold-shelter rule where the base has none
 * needs both the temperature and the shelter.
 */
export interface WeatherTightening {
  ambientMinC?: number;
  ambientMaxC?: number;
  shelterAlways?: Exclude<Shelter, 'none'>;
  coldShelter?: Exclude<Shelter, 'none'>;
  coldShelterBelowC?: number;
}

/** One refused change, named by field path (e.g. 'heaterTemperatureC.min'). */
export interface ProcedureFieldError {
  field: string;
  message: string;
}

export type DeriveProcedureResult =
  | { ok: true; procedure: ProcedureDefinition }
  | { ok: false; errors: ProcedureFieldError[] };

export interface DeriveProcedureOptions {
  label?: string;
  /** Notes added to the base procedure's notes. */
  notes?: string[];
  /** Units of the error messages; SI by default. */
  system?: UnitSystem;
  /** Source text for tightened values, e.g. 'Operator procedure GP-7 rev 3'. */
  source?: string;
}

const WINDOW_FIELDS = [
  { key: 'heaterTemperatureC', label: 'Heater temperature', kind: 'temperature' },
  { key: 'beadUpInterfacialPressureMpa', label: 'Bead-up interfacial pressure', kind: 'pressure' },
  { key: 'fusionInterfacialPressureMpa', label: 'Fusion interfacial pressure', kind: 'pressure' },
  { key: 'coolingInterfacialPressureMpa', label: 'Cooling interfacial pressure', kind: 'pressure' },
] as const;

const RANGE_FIELDS = [
  { key: 'wallRangeMm', label: 'Wall range', kind: 'length-mm' },
  { key: 'outsideDiameterRangeMm', label: 'Outside-diameter range', kind: 'length-mm' },
] as const;

function isNumber(value: unknown): value is number {
  return typeof value === 'number' && Number.isFinite(value);
}

/**
 * Derive an operator's procedure from a base (built-in or already derived) by tightening
 * it. Every change must narrow: a window's min may only rise and its max only fall, a
 * minimum rule (bead, heat-soak minimum, cooling) may only be scaled up (factor ≥ 1) or
 * given a floor, a maximum rule (heat-soak maximum, changeover, pressure build-up) only
 * scaled down (factor ≤ 1) or given a cap. Anything that would loosen is refused and all
 * refusals are listed, one per field. Values in canonical SI (°C, MPa, mm, s).
 * Tightened values keep the base's status when only narrowed by the operator, and carry
 * `options.source` (default "operator tightening of <base label>").
 */
export function deriveProcedure(
  base: ProcedureDefinition,
  tightening: ProcedureTightening,
  options: DeriveProcedureOptions = {},
): DeriveProcedureResult {
  const system = options.system ?? 'si';
  const errors: ProcedureFieldError[] = [];
  const windows = clone(base.windows);
  const operatorSource = options.source ?? `operator tightening of ${base.label}`;
  const fmt = (value: number, kind: QuantityKind) => formatQuantity(value, kind, system);
  /** Where a tightened value comes from: the operator, within the base's own source and status (confirmed when the base had none). */
  const tightenedFrom = (current: Sourced | null | undefined): Sourced =>
    current ? { source: `${operatorSource}; within ${current.source}`, status: current.status } : { source: operatorSource, status: 'confirmed' };

  for (const field of WINDOW_FIELDS) {
    const change = tightening[field.key];
    if (!change) continue;
    const current = windows[field.key];
    if (!current) {
      errors.push({ field: field.key, message: `${field.label} is not part of ${base.label}, so it cannot be tightened` });
      continue;
    }
    const next = narrowWindow(field.key, field.label, field.kind, current, change, base.label, fmt, errors);
    if (next) windows[field.key] = { ...next, ...tightenedFrom(current) };
  }

  for (const field of RANGE_FIELDS) {
    const change = tightening[field.key];
    if (!change) continue;
    const current = windows[field.key];
    const merged = narrowRange(field.key, field.label, field.kind, current, change, base.label, fmt, errors);
    if (merged) {
      windows[field.key] = { ...merged, ...tightenedFrom(current) };
    }
  }

  const minimumRule = (key: 'minBeadMm' | 'minCoolingS', label: string): void => {
    const change = tightening[key];
    if (!change) return;
    const rule = raiseRule(key, label, windows[key]?.rule ?? null, change, base.label, errors);
    if (rule) {
      const current = windows[key];
      windows[key] = { rule, ...tightenedFrom(current) };
    }
  };
  const maximumRule = (key: 'maxChangeoverS' | 'maxPressureBuildUpS', label: string): void => {
    const change = tightening[key];
    if (!change) return;
    const rule = lowerRule(key, label, windows[key]?.rule ?? null, change, base.label, errors);
    if (rule) {
      const current = windows[key];
      windows[key] = {
        rule,
        ...tightenedFrom(current),
        // A cap applies where the table is silent too; the value there only narrows.
        ...(current?.whereNone ? { whereNone: { ...current.whereNone, value: Math.min(current.whereNone.value * (change.factor ?? 1), change.atMost ?? Infinity) } } : {}),
      };
    }
  };
  minimumRule('minBeadMm', 'Minimum bead');
  minimumRule('minCoolingS', 'Minimum cooling');
  maximumRule('maxChangeoverS', 'Maximum changeover');
  maximumRule('maxPressureBuildUpS', 'Maximum pressure build-up');

  if (tightening.heatSoakMinS || tightening.heatSoakMaxS) {
    const current = windows.heatSoakS;
    const min = tightening.heatSoakMinS
      ? raiseRule('heatSoakMinS', 'Heat-soak minimum', current?.min ?? null, tightening.heatSoakMinS, base.label, errors)
      : (current?.min ?? null);
    const max = tightening.heatSoakMaxS
      ? lowerRule('heatSoakMaxS', 'Heat-soak maximum', current?.max ?? null, tightening.heatSoakMaxS, base.label, errors)
      : (current?.max ?? null);
    windows.heatSoakS = {
      target: current?.target ?? null,
      min,
      max,
      ...tightenedFrom(current),
    };
  }

  if (tightening.weather) {
    const weather = tightenWeather(weatherRulesOf(base), tightening.weather, base.label, operatorSource, fmt, errors);
    if (weather) windows.weather = weather;
  }

  if (errors.length > 0) return { ok: false, errors };
  return {
    ok: true,
    procedure: {
      standard: base.standard,
      label: options.label ?? `${base.label} (tightened)`,
      windows,
      notes: [...base.notes, ...(options.notes ?? [])],
    },
  };
}

function narrowWindow(
  key: string,
  label: string,
  kind: QuantityKind,
  current: Window,
  change: WindowTightening,
  baseLabel: string,
  fmt: (value: number, kind: QuantityKind) => string,
  errors: ProcedureFieldError[],
): Window | null {
  const before = errors.length;
  const min = change.min ?? current.min;
  const max = change.max ?? current.max;
  if (change.min !== undefined && !isNumber(change.min)) errors.push({ field: `${key}.min`, message: `${label} minimum must be a number` });
  else if (change.min !== undefined && change.min < current.min) {
    errors.push({ field: `${key}.min`, message: `${label} minimum ${fmt(change.min, kind)} is below the ${fmt(current.min, kind)} of ${baseLabel}; a derived procedure may only raise it` });
  }
  if (change.max !== undefined && !isNumber(change.max)) errors.push({ field: `${key}.max`, message: `${label} maximum must be a number` });
  else if (change.max !== undefined && change.max > current.max) {
    errors.push({ field: `${key}.max`, message: `${label} maximum ${fmt(change.max, kind)} is above the ${fmt(current.max, kind)} of ${baseLabel}; a derived procedure may only lower it` });
  }
  if (errors.length === before && min > max) {
    errors.push({ field: key, message: `${label} minimum ${fmt(min, kind)} is above its maximum ${fmt(max, kind)}` });
  }
  return errors.length === before ? { min, max } : null;
}

function narrowRange(
  key: string,
  label: string,
  kind: QuantityKind,
  current: SourcedRange | null,
  change: WindowTightening,
  baseLabel: string,
  fmt: (value: number, kind: QuantityKind) => string,
  errors: ProcedureFieldError[],
): { min: number | null; max: number | null } | null {
  const before = errors.length;
  const baseMin = current?.min ?? null;
  const baseMax = current?.max ?? null;
  if (change.min !== undefined) {
    if (!isNumber(change.min) || change.min < 0) errors.push({ field: `${key}.min`, message: `${label} minimum must be a number of 0 or more` });
    else if (baseMin !== null && change.min < baseMin) {
      errors.push({ field: `${key}.min`, message: `${label} minimum ${fmt(change.min, kind)} is below the ${fmt(baseMin, kind)} of ${baseLabel}; a derived procedure may only raise it` });
    }
  }
  if (change.max !== undefined) {
    if (!isNumber(change.max) || change.max <= 0) errors.push({ field: `${key}.max`, message: `${label} maximum must be a number above 0` });
    else if (baseMax !== null && change.max > baseMax) {
      errors.push({ field: `${key}.max`, message: `${label} maximum ${fmt(change.max, kind)} is above the ${fmt(baseMax, kind)} of ${baseLabel}; a derived procedure may only lower it` });
    }
  }
  const min = change.min ?? baseMin;
  const max = change.max ?? baseMax;
  if (errors.length === before && min !== null && max !== null && min > max) {
    errors.push({ field: key, message: `${label} minimum ${fmt(min, kind)} is above its maximum ${fmt(max, kind)}` });
  }
  return errors.length === before ? { min, max } : null;
}

function raiseRule(
  key: string,
  label: string,
  current: SizeRule | null,
  change: MinimumTightening,
  baseLabel: string,
  errors: ProcedureFieldError[],
): SizeRule | null {
  const before = errors.length;
  if (change.factor !== undefined) {
    if (!isNumber(change.factor) || change.factor <= 0) errors.push({ field: `${key}.factor`, message: `${label} factor must be a number above 0` });
    else if (change.factor < 1) {
      errors.push({ field: `${key}.factor`, message: `${label} factor ${change.factor} would lower the minimum of ${baseLabel}; use a factor of 1 or more` });
    } else if (current === null) {
      errors.push({ field: `${key}.factor`, message: `${baseLabel} has no ${label.toLowerCase()} to scale; give a fixed minimum instead` });
    }
  }
  if (change.atLeast !== undefined && (!isNumber(change.atLeast) || change.atLeast < 0)) {
    errors.push({ field: `${key}.atLeast`, message: `${label} must be a number of 0 or more (got ${String(change.atLeast)})` });
  }
  if (errors.length > before) return null;
  if (current === null) {
    return change.atLeast !== undefined ? { kind: 'constant', value: change.atLeast } : null;
  }
  return { kind: 'adjusted', rule: current, factor: change.factor ?? 1, atLeast: change.atLeast ?? null, atMost: null };
}

function lowerRule(
  key: string,
  label: string,
  current: SizeRule | null,
  change: MaximumTightening,
  baseLabel: string,
  errors: ProcedureFieldError[],
): SizeRule | null {
  const before = errors.length;
  if (change.factor !== undefined) {
    if (!isNumber(change.factor) || change.factor <= 0) errors.push({ field: `${key}.factor`, message: `${label} factor must be a number above 0` });
    else if (change.factor > 1) {
      errors.push({ field: `${key}.factor`, message: `${label} factor ${change.factor} would raise the maximum of ${baseLabel}; use a factor of 1 or less` });
    } else if (current === null) {
      errors.push({ field: `${key}.factor`, message: `${baseLabel} has no ${label.toLowerCase()} to scale; give a fixed maximum instead` });
    }
  }
  if (change.atMost !== undefined && (!isNumber(change.atMost) || change.atMost <= 0)) {
    errors.push({ field: `${key}.atMost`, message: `${label} must be a number above 0 (got ${String(change.atMost)})` });
  }
  if (errors.length > before) return null;
  if (current === null) {
    return change.atMost !== undefined ? { kind: 'constant', value: change.atMost } : null;
  }
  return { kind: 'adjusted', rule: current, factor: change.factor ?? 1, atLeast: null, atMost: change.atMost ?? null };
}

function tightenWeather(
  current: WeatherRules | null,
  change: WeatherTightening,
  baseLabel: string,
  operatorSource: string,
  fmt: (value: number, kind: QuantityKind) => string,
  errors: ProcedureFieldError[],
): WeatherRules | null {
  const before = errors.length;
  const rules: WeatherRules = current ? clone(current) : { ambientRangeC: null, shelterAlways: null, coldShelter: null, coolingAdjustment: null };
  const t = (v: number) => fmt(v, 'temperature');
  const within = (sourced: { source: string } | null) => (sourced ? `${operatorSource}; within ${sourced.source}` : operatorSource);

  const range = rules.ambientRangeC;
  let min = range?.min ?? null;
  let max = range?.max ?? null;
  if (change.ambientMinC !== undefined) {
    if (!isNumber(change.ambientMinC)) errors.push({ field: 'weather.ambientMinC', message: 'Coldest ambient temperature must be a number' });
    else if (min !== null && change.ambientMinC < min) errors.push({ field: 'weather.ambientMinC', message: `Coldest ambient temperature ${t(change.ambientMinC)} is below the ${t(min)} of ${baseLabel}; a derived procedure may only raise it` });
    else min = change.ambientMinC;
  }
  if (change.ambientMaxC !== undefined) {
    if (!isNumber(change.ambientMaxC)) errors.push({ field: 'weather.ambientMaxC', message: 'Warmest ambient temperature must be a number' });
    else if (max !== null && change.ambientMaxC > max) errors.push({ field: 'weather.ambientMaxC', message: `Warmest ambient temperature ${t(change.ambientMaxC)} is above the ${t(max)} of ${baseLabel}; a derived procedure may only lower it` });
    else max = change.ambientMaxC;
  }
  if (errors.length === before && min !== null && max !== null && min > max) {
    errors.push({ field: 'weather.ambientMinC', message: `Coldest ambient temperature ${t(min)} is above the warmest ${t(max)}` });
  }
  if (change.ambientMinC !== undefined || change.ambientMaxC !== undefined) {
    rules.ambientRangeC = { min, max, source: within(range), status: range ? range.status : 'operator' };
  }

  if (change.shelterAlways !== undefined) {
    const was = rules.shelterAlways;
    if (was && !shelterAtLeast(change.shelterAlways, was.shelter)) {
      errors.push({ field: 'weather.shelterAlways', message: `${baseLabel} asks for at least ${SHELTER_PHRASES[was.shelter]} at any temperature; a derived procedure may not ask for less` });
    } else rules.shelterAlways = { shelter: change.shelterAlways, source: within(was), status: was ? was.status : 'operator' };
  }

  if (change.coldShelter !== undefined || change.coldShelterBelowC !== undefined) {
    const was = rules.coldShelter;
    const shelter = change.coldShelter ?? was?.shelter;
    const belowC = change.coldShelterBelowC ?? was?.belowC;
    if (change.coldShelterBelowC !== undefined && !isNumber(change.coldShelterBelowC)) {
      errors.push({ field: 'weather.coldShelterBelowC', message: 'Shelter needed below must be a temperature' });
    } else if (shelter === undefined) {
      errors.push({ field: 'weather.coldShelter', message: 'Choose the shelter needed in the cold' });
    } else if (belowC === undefined) {
      errors.push({ field: 'weather.coldShelterBelowC', message: 'Give the temperature below which the shelter is needed' });
    } else if (was && belowC < was.belowC) {
      errors.push({ field: 'weather.coldShelterBelowC', message: `${baseLabel} asks for shelter below ${t(was.belowC)}; a derived procedure may only raise that temperature` });
    } else if (was && !shelterAtLeast(shelter, was.shelter)) {
      errors.push({ field: 'weather.coldShelter', message: `${baseLabel} asks for at least ${SHELTER_PHRASES[was.shelter]} in the cold; a derived procedure may not ask for less` });
    } else {
      rules.coldShelter = { belowC, shelter, source: within(was), status: was ? was.status : 'operator' };
    }
  }
  return errors.length === before ? rules : null;
}
