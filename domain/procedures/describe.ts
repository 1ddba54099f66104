// Describing a procedure for the Procedures screen.

import { describeStatus, type Sourced, type ValueStatus } from '@/domain/sources';
import { MM_PER_IN } from '@/domain/units/conversions';
import {
  formatDuration,
  formatQuantity,
  formatRange,
  roundTo,
  type QuantityKind,
  type UnitSystem,
} from '@/domain/units/format';
import type { ProcedureDefinition, SizeBasis, SizeRule } from '@/domain/procedures/types';
import { builtInProcedure } from '@/domain/procedures/built-in';
import { MAX_MISALIGNMENT_WALL_FRACTION, MISALIGNMENT_SOURCE } from '@/domain/procedures/alignment';
import { HANDLING_WAIT_MINUTES, HANDLING_WAIT_SOURCE } from '@/domain/procedures/handling';
import { weatherRulesOf } from '@/domain/procedures/weather';
import { SHELTER_PHRASES } from '@/domain/joints/shelters';

export type ProcedureParameter =
  | 'heaterTemperature'
  | 'beadUpPressure'
  | 'fusionPressure'
  | 'coolingPressure'
  | 'bead'
  | 'heatSoak'
  | 'changeover'
  | 'changeoverWhereNone'
  | 'pressureBuildUp'
  | 'cooling'
  | 'wallRange'
  | 'outsideDiameterRange'
  | 'heatSoakPressure'
  | 'misalignment'
  | 'handlingWait'
  | 'ambientRange'
  | 'shelterAlways'
  | 'coldShelter'
  | 'coolingAdjustment';

export interface ProcedureWindowRow {
  parameter: ProcedureParameter;
  label: string;
  /** The value in the user's units, in words ("204–232 °C", "11 min per inch of wall"). */
  value: string;
  /** Table rows for banded values, one line per band; empty otherwise. */
  details: string[];
  source: string;
  status: ValueStatus;
  statusText: string;
}

/**
 * Rows for the read-only Procedures screen: each defined window of a procedure with its
 * value in the user's units, its source and status. Undefined windows are left out.
 */
export function describeProcedureWindows(definition: ProcedureDefinition, system: UnitSystem): ProcedureWindowRow[] {
  const w = definition.windows;
  const rows: ProcedureWindowRow[] = [];
  const push = (parameter: ProcedureParameter, label: string, value: string, details: string[], sourced: Sourced) =>
    rows.push({ parameter, label, value, details, source: sourced.source, status: sourced.status, statusText: describeStatus(sourced.status) });

  push('heaterTemperature', 'Heater surface temperature', formatRange(w.heaterTemperatureC.min, w.heaterTemperatureC.max, 'temperature', system), [], w.heaterTemperatureC);
  push('beadUpPressure', 'Bead-up interfacial pressure', formatRange(w.beadUpInterfacialPressureMpa.min, w.beadUpInterfacialPressureMpa.max, 'pressure', system), [], w.beadUpInterfacialPressureMpa);
  push('fusionPressure', 'Fusion interfacial pressure', formatRange(w.fusionInterfacialPressureMpa.min, w.fusionInterfacialPressureMpa.max, 'pressure', system), [], w.fusionInterfacialPressureMpa);
  if (w.coolingInterfacialPressureMpa) {
    push('coolingPressure', 'Reduced cooling interfacial pressure', formatRange(w.coolingInterfacialPressureMpa.min, w.coolingInterfacialPressureMpa.max, 'pressure', system), [], w.coolingInterfacialPressureMpa);
  }
  const soak = w.heatSoakInterfacialPressureMpa !== undefined ? w.heatSoakInterfacialPressureMpa : builtInProcedure(definition.standard).windows.heatSoakInterfacialPressureMpa;
  if (soak) {
    push('heatSoakPressure', 'Heat-soak interfacial pressure', soak.max === 0 ? 'at drag (without force)' : `at most ${formatQuantity(soak.max, 'pressure', system)} above drag`, [], soak);
  }
  if (w.minBeadMm) push('bead', 'Minimum bead size', ...describeRule(w.minBeadMm.rule, 'length-mm', system), w.minBeadMm);
  if (w.heatSoakS) {
    const parts: string[] = [];
    if (w.heatSoakS.target) parts.push(`target ${describeRule(w.heatSoakS.target, 'duration', system)[0]}`);
    if (w.heatSoakS.min) parts.push(`at least ${describeRule(w.heatSoakS.min, 'duration', system)[0]}`);
    if (w.heatSoakS.max) parts.push(`at most ${describeRule(w.heatSoakS.max, 'duration', system)[0]}`);
    push('heatSoak', 'Heat-soak time', parts.join('; '), [], w.heatSoakS);
  }
  if (w.maxChangeoverS) push('changeover', 'Maximum changeover (heater removal) time', ...describeRule(w.maxChangeoverS.rule, 'duration', system), w.maxChangeoverS);
  if (w.maxChangeoverS?.whereNone) {
    push('changeoverWhereNone', 'Maximum changeover where the table gives none', formatDuration(w.maxChangeoverS.whereNone.value), [], w.maxChangeoverS.whereNone);
  }
  if (w.maxPressureBuildUpS) push('pressureBuildUp', 'Maximum pressure build-up time', ...describeRule(w.maxPressureBuildUpS.rule, 'duration', system), w.maxPressureBuildUpS);
  if (w.minCoolingS) push('cooling', 'Minimum cooling time under pressure', ...describeRule(w.minCoolingS.rule, 'duration', system), w.minCoolingS);
  if (w.wallRangeMm) push('wallRange', 'Walls covered', formatRange(w.wallRangeMm.min, w.wallRangeMm.max, 'length-mm', system), [], w.wallRangeMm);
  if (w.outsideDiameterRangeMm) {
    push('outsideDiameterRange', 'Outside diameters covered', formatRange(w.outsideDiameterRangeMm.min, w.outsideDiameterRangeMm.max, 'length-mm', system), [], w.outsideDiameterRangeMm);
  }
  push('misalignment', 'Outside misalignment (hi-lo)', `at most ${MAX_MISALIGNMENT_WALL_FRACTION * 100} % of the wall`, [], MISALIGNMENT_SOURCE);
  push('handlingWait', 'Handling after cooling', `no pulling, installation or rough handling for ${HANDLING_WAIT_MINUTES} minutes after removal from the machine`, [], HANDLING_WAIT_SOURCE);
  const weather = weatherRulesOf(definition);
  if (weather?.ambientRangeC) {
    const r = weather.ambientRangeC;
    push('ambientRange', 'Ambient temperature', r.min !== null || r.max !== null ? formatRange(r.min, r.max, 'temperature', system) : 'any', [], r);
  }
  if (weather?.shelterAlways) push('shelterAlways', 'Shelter at any temperature', `at least ${SHELTER_PHRASES[weather.shelterAlways.shelter]}`, [], weather.shelterAlways);
  if (weather?.coldShelter) {
    push('coldShelter', 'Shelter in the cold', `at least ${SHELTER_PHRASES[weather.coldShelter.shelter]} below ${formatQuantity(weather.coldShelter.belowC, 'temperature', system)}`, [], weather.coldShelter);
  }
  if (weather?.coolingAdjustment) {
    const a = weather.coolingAdjustment;
    // A temperature step of 1 °C is 1.8 °F, so the percentage per °F is 5/9 of it.
    const perDegree = system === 'us' ? `${trimNumber((a.percentPerC * 5) / 9, 2)} % longer for each °F` : `${trimNumber(a.percentPerC, 2)} % longer for each °C`;
    push('coolingAdjustment', 'Cooling time in warm weather', `${perDegree} above ${formatQuantity(a.referenceC, 'temperature', system)}`, [], a);
  }
  return rows;
}

function basisWord(basis: SizeBasis): string {
  return basis === 'wall-mm' ? 'wall' : 'OD';
}

function trimNumber(value: number, decimals: number): string {
  return String(roundTo(value, decimals));
}

function formatValue(value: number, kind: QuantityKind, system: UnitSystem): string {
  return kind === 'duration' ? formatDuration(value) : formatQuantity(value, kind, system);
}

/** [summary, band lines] for a rule in the user's units. */
export function describeRule(rule: SizeRule, kind: QuantityKind, system: UnitSystem): [string, string[]] {
  switch (rule.kind) {
    case 'constant':
      return [formatValue(rule.value, kind, system), []];
    case 'linear': {
      // Per inch in US units, per mm in SI; durations per unit of length in s or min.
      const perUnit = system === 'us' ? rule.perMm * MM_PER_IN : rule.perMm;
      const unit = system === 'us' ? 'inch' : 'mm';
      const perText = kind === 'duration'
        ? perUnit >= 60 ? formatDuration(perUnit) : `${trimNumber(perUnit, 2)} s`
        : `${trimNumber(system === 'us' ? perUnit / MM_PER_IN : perUnit, 3)} ${kind === 'length-mm' && system === 'us' ? 'in' : 'mm'}`;
      const offsetText = rule.offset !== 0 ? `${formatValue(rule.offset, kind, system)} + ` : '';
      return [`${offsetText}${perText} per ${unit} of ${basisWord(rule.basis)}`, []];
    }
    case 'bands': {
      const lines: string[] = [];
      let lower = rule.startMm;
      // The table's start is inclusive; after a band that excludes its upper bound, the
      // next band includes it ("from"); otherwise the next band starts just over it.
      let lowOp = rule.startMm > 0 ? 'from' : '';
      for (const band of rule.bands) {
        const lowText = formatQuantity(lower, 'length-mm', system);
        const highText = formatQuantity(band.upToMm, 'length-mm', system);
        const highOp = band.upperInclusive ? 'up to' : 'under';
        const where = lowOp === '' ? `${basisWord(rule.basis)} ${highOp} ${highText}` : `${basisWord(rule.basis)} ${lowOp} ${lowText} ${highOp} ${highText}`;
        const value = band.from === band.to || !rule.interpolate
          ? formatValue(band.from, kind, system)
          : `${formatValue(band.from, kind, system)} to ${formatValue(band.to, kind, system)} (linear)`;
        lines.push(`${where}: ${value}`);
        lower = band.upToMm;
        lowOp = band.upperInclusive ? 'over' : 'from';
      }
      return [`by ${basisWord(rule.basis)}, see table`, lines];
    }
    case 'adjusted': {
      const [summary, lines] = describeRule(rule.rule, kind, system);
      const parts = [summary];
      if (rule.factor !== 1) parts.push(`× ${trimNumber(rule.factor, 3)}`);
      if (rule.atLeast !== null) parts.push(`at least ${formatValue(rule.atLeast, kind, system)}`);
      if (rule.atMost !== null) parts.push(`at most ${formatValue(rule.atMost, kind, system)}`);
      return [parts.join(', '), lines];
    }
  }
}
