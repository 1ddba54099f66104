// A procedure's weather rules applied to one joint: the ambient range, the shelter asked
// for (at any temperature, and in the cold) and the cooling time's growth in warm weather.
// The rules are procedure data (domain/procedures/types WeatherRules, each with its source);
// this module only applies them. Pure; °C and s.
import { builtInProcedure } from '@/domain/procedures/built-in';
import type { ProcedureDefinition, WeatherRules } from '@/domain/procedures/types';
import { SHELTER_LABELS, SHELTER_PHRASES, shelterAtLeast, type Shelter } from '@/domain/joints/shelters';
import { formatQuantity, type UnitSystem } from '@/domain/units/format';

/** The conditions a joint was made in, as recorded at the trench. */
export interface JointConditions {
  ambientC: number | null;
  shelter: Shelter | null;
}

/** A procedure's weather rules; a version stored before they were modelled takes its base standard's. */
export function weatherRulesOf(procedure: ProcedureDefinition): WeatherRules | null {
  if (procedure.windows.weather !== undefined) return procedure.windows.weather;
  return builtInProcedure(procedure.standard).windows.weather ?? null;
}

/** True when the rules ask for anything at all. */
export function hasWeatherRules(rules: WeatherRules | null | undefined): rules is WeatherRules {
  return !!rules && !!(rules.ambientRangeC || rules.shelterAlways || rules.coldShelter || rules.coolingAdjustment);
}

/**
 * The minimum cooling time at an ambient temperature: `minCoolingS` grown by the rule's
 * percentage for each °C above its reference, rounded up to the whole second; unchanged at
 * or below the reference, without a rule or without a recorded ambient.
 */
export function adjustedMinCoolingS(minCoolingS: number | null, rules: WeatherRules | null | undefined, ambientC: number | null | undefined): number | null {
  const adjustment = rules?.coolingAdjustment;
  if (minCoolingS === null || !adjustment || typeof ambientC !== 'number' || !Number.isFinite(ambientC)) return minCoolingS;
  const above = ambientC - adjustment.referenceC;
  if (above <= 0) return minCoolingS;
  // 1e-6: 420 × 1.05 = 441.00000000000006 must stay 441, not become 442.
  return Math.ceil(minCoolingS * (1 + (adjustment.percentPerC / 100) * above) - 1e-6);
}

export type WeatherProblem =
  | { parameter: 'ambient'; kind: 'below-minimum' | 'above-maximum' | 'not-recorded'; measured: number | null; limit: { min: number | null; max: number | null }; message: string }
  | { parameter: 'shelter'; kind: 'check-failed' | 'not-recorded'; measured: null; limit: null; message: string };

/**
 * The weather rules a joint breaks, in `system` units: ambient outside the range, less
 * shelter than asked for at any temperature, less shelter than asked for in the cold. An
 * unrecorded ambient or shelter is a problem only when a rule needs it.
 */
export function weatherProblems(rules: WeatherRules | null | undefined, conditions: JointConditions, system: UnitSystem = 'si'): WeatherProblem[] {
  if (!hasWeatherRules(rules)) return [];
  const out: WeatherProblem[] = [];
  const t = (v: number) => formatQuantity(v, 'temperature', system);
  const { ambientC, shelter } = conditions;
  const range = rules.ambientRangeC;
  const ambientKnown = typeof ambientC === 'number' && Number.isFinite(ambientC);
  if ((range || rules.coldShelter) && !ambientKnown) {
    out.push({ parameter: 'ambient', kind: 'not-recorded', measured: null, limit: range ? { min: range.min, max: range.max } : { min: null, max: null }, message: 'Ambient temperature was not recorded' });
  }
  if (range && ambientKnown) {
    const limit = { min: range.min, max: range.max };
    if (range.min !== null && ambientC < range.min) {
      out.push({ parameter: 'ambient', kind: 'below-minimum', measured: ambientC, limit, message: `Ambient temperature ${t(ambientC)} is below ${t(range.min)}, the coldest this procedure allows` });
    } else if (range.max !== null && ambientC > range.max) {
      out.push({ parameter: 'ambient', kind: 'above-maximum', measured: ambientC, limit, message: `Ambient temperature ${t(ambientC)} is above ${t(range.max)}, the warmest this procedure allows` });
    }
  }
  const needs: { shelter: Exclude<Shelter, 'none'>; why: string }[] = [];
  if (rules.shelterAlways) needs.push({ shelter: rules.shelterAlways.shelter, why: 'at any temperature' });
  if (rules.coldShelter && ambientKnown && ambientC < rules.coldShelter.belowC) {
    needs.push({ shelter: rules.coldShelter.shelter, why: `below ${t(rules.coldShelter.belowC)} (ambient ${t(ambientC)})` });
  }
  if (needs.length && shelter === null) {
    out.push({ parameter: 'shelter', kind: 'not-recorded', measured: null, limit: null, message: 'Shelter was not recorded' });
  } else if (shelter !== null) {
    // The strictest unmet need speaks for all.
    const unmet = needs.filter((n) => !shelterAtLeast(shelter, n.shelter)).sort((a, b) => (shelterAtLeast(a.shelter, b.shelter) ? -1 : 1))[0];
    if (unmet) {
      out.push({ parameter: 'shelter', kind: 'check-failed', measured: null, limit: null, message: `Shelter was ${SHELTER_LABELS[shelter].toLowerCase()}; the procedure asks for at least ${SHELTER_PHRASES[unmet.shelter]} ${unmet.why}` });
    }
  }
  return out;
}
