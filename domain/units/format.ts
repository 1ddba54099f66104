// Display of SI quantities in the user's unit system (SI or US customary), and the
// numeric converters forms use to turn a typed value back into canonical SI.
// Conversion factors from NIST SP 811 (see conversions.ts); display precision is our own
// choice, sized to what a gauge, thermometer or tape in the trench can read.

import { DomainError } from '@/domain/errors';
import {
  cToF,
  fToC,
  ftToM,
  in2ToMm2,
  inToMm,
  mm2ToIn2,
  mmToIn,
  mpaToPsi,
  mToFt,
  psiToMpa,
} from '@/domain/units/conversions';

/** The unit preference stored per user: SI, or US customary (NIST SP 811 factors). */
export const UNIT_SYSTEMS = ['si', 'us'] as const;
export type UnitSystem = (typeof UNIT_SYSTEMS)[number];

/**
 * Kinds of quantity the UI shows. Canonical SI unit of each kind:
 * length-mm → mm (wall, OD, bead), length-m → m (coil and run lengths),
 * pressure → MPa, temperature → °C, area → mm², duration → s.
 */
export type QuantityKind =
  | 'length-mm'
  | 'length-m'
  | 'pressure'
  | 'temperature'
  | 'area'
  | 'duration';

export const QUANTITY_KINDS: readonly QuantityKind[] = [
  'length-mm',
  'length-m',
  'pressure',
  'temperature',
  'area',
  'duration',
];

const LABELS: Record<QuantityKind, Record<UnitSystem, string>> = {
  'length-mm': { si: 'mm', us: 'in' },
  'length-m': { si: 'm', us: 'ft' },
  pressure: { si: 'MPa', us: 'psi' },
  temperature: { si: '°C', us: '°F' },
  area: { si: 'mm²', us: 'in²' },
  duration: { si: 's', us: 's' },
};

// Decimals shown per kind and system: 0.1 mm / 0.001 in (the ASTM wall tables' step),
// 0.01 MPa / 1 psi (gauge resolution), 1 °C / 1 °F, whole seconds.
const DECIMALS: Record<QuantityKind, Record<UnitSystem, number>> = {
  'length-mm': { si: 1, us: 3 },
  'length-m': { si: 1, us: 0 },
  pressure: { si: 2, us: 0 },
  temperature: { si: 0, us: 0 },
  area: { si: 0, us: 2 },
  duration: { si: 0, us: 0 },
};

/** Unit symbol shown beside a field of this kind, e.g. unitLabel('pressure', 'us') → 'psi'. */
export function unitLabel(kind: QuantityKind, system: UnitSystem): string {
  return LABELS[kind][system];
}

/**
 * Decimals the formatters show for this kind in this system (see table above). Given a
 * value, small pressures get one more place so a reduced cooling pressure (0.025 MPa,
 * 3.6 psi) does not read as 0.03 MPa / 4 psi.
 */
export function displayDecimals(kind: QuantityKind, system: UnitSystem, valueSi?: number): number {
  const base = DECIMALS[kind][system];
  if (kind === 'pressure' && valueSi !== undefined) {
    const shown = Math.abs(toDisplay(valueSi, kind, system));
    if (system === 'si' && shown < 0.1) return base + 1;
    if (system === 'us' && shown < 10) return base + 1;
  }
  return base;
}

/**
 * Canonical SI value → number in the user's units (not rounded).
 * US: mm → in, m → ft, MPa → psi, °C → °F, mm² → in²; durations stay in seconds.
 */
export function toDisplay(valueSi: number, kind: QuantityKind, system: UnitSystem): number {
  if (system === 'si') return valueSi;
  switch (kind) {
    case 'length-mm':
      return mmToIn(valueSi);
    case 'length-m':
      return mToFt(valueSi);
    case 'pressure':
      return mpaToPsi(valueSi);
    case 'temperature':
      return cToF(valueSi);
    case 'area':
      return mm2ToIn2(valueSi);
    case 'duration':
      return valueSi;
  }
}

/** Number typed in the user's units → canonical SI (inverse of toDisplay, not rounded). */
export function fromDisplay(value: number, kind: QuantityKind, system: UnitSystem): number {
  if (system === 'si') return value;
  switch (kind) {
    case 'length-mm':
      return inToMm(value);
    case 'length-m':
      return ftToM(value);
    case 'pressure':
      return psiToMpa(value);
    case 'temperature':
      return fToC(value);
    case 'area':
      return in2ToMm2(value);
    case 'duration':
      return value;
  }
}

/**
 * SI value → user's units rounded to the displayed decimals (half away from zero).
 * Used by the joint check so that a value that reads the same as its limit counts as
 * on the limit.
 */
export function roundForDisplay(valueSi: number, kind: QuantityKind, system: UnitSystem): number {
  return roundTo(toDisplay(valueSi, kind, system), displayDecimals(kind, system, valueSi));
}

/** Round half away from zero to `decimals` places, immune to 1.005-style binary artefacts. */
export function roundTo(value: number, decimals: number): number {
  const factor = 10 ** decimals;
  const scaled = Math.abs(value) * factor;
  const rounded = Math.round(scaled * (1 + Number.EPSILON * 4)) / factor;
  return value < 0 ? -rounded : rounded;
}

function formatNumber(value: number, decimals: number): string {
  const text = roundTo(value, decimals).toFixed(decimals);
  // "-0" and "-0.00" read as a sign error on screen.
  return /^-0(\.0+)?$/.test(text) ? text.slice(1) : text;
}

/**
 * Seconds → "45 s", "6 min 37 s", "6 min", "1 h 20 min". Rounded to the whole second
 * (trench stopwatches read whole seconds); hours drop the seconds.
 */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds)) throw new DomainError('invalid-input', 'A duration must be a finite number of seconds');
  const sign = seconds < 0 ? '−' : '';
  const total = Math.round(Math.abs(seconds));
  const h = Math.floor(total / 3600);
  const min = Math.floor((total % 3600) / 60);
  const s = total % 60;
  if (h > 0) return `${sign}${h} h${min > 0 ? ` ${min} min` : ''}`;
  if (min > 0) return `${sign}${min} min${s > 0 ? ` ${s} s` : ''}`;
  return `${sign}${s} s`;
}

/** Optional display overrides. */
export interface FormatOptions {
  /** Decimals to show instead of the default for this kind and system. */
  decimals?: number;
}

/**
 * Canonical SI value → display string in the user's system with its unit, e.g.
 * formatQuantity(0.62, 'pressure', 'si') → "0.62 MPa", (0.6205, 'pressure', 'us') → "90 psi",
 * (232.2, 'temperature', 'si') → "232 °C", (397, 'duration', 'us') → "6 min 37 s".
 * Rounding: half away from zero to displayDecimals(kind, system).
 */
export function formatQuantity(
  valueSi: number,
  kind: QuantityKind,
  system: UnitSystem,
  options: FormatOptions = {},
): string {
  if (kind === 'duration') return formatDuration(valueSi);
  const decimals = options.decimals ?? displayDecimals(kind, system, valueSi);
  return `${formatNumber(toDisplay(valueSi, kind, system), decimals)} ${unitLabel(kind, system)}`;
}

/**
 * A window min–max in the user's units, e.g. "204–232 °C", "60–90 psi",
 * "8 s – 10 s" for durations. Either end may be null: "at least 5.0 mm", "at most 10 s".
 */
export function formatRange(
  minSi: number | null,
  maxSi: number | null,
  kind: QuantityKind,
  system: UnitSystem,
): string {
  if (minSi === null && maxSi === null) return 'not defined';
  if (minSi === null) return `at most ${formatQuantity(maxSi as number, kind, system)}`;
  if (maxSi === null) return `at least ${formatQuantity(minSi, kind, system)}`;
  if (kind === 'duration') {
    const low = formatDuration(minSi);
    const high = formatDuration(maxSi);
    return low === high ? low : `${low} – ${high}`;
  }
  const decimals = Math.max(displayDecimals(kind, system, minSi), displayDecimals(kind, system, maxSi));
  const low = formatNumber(toDisplay(minSi, kind, system), decimals);
  const high = formatNumber(toDisplay(maxSi, kind, system), decimals);
  if (low === high) return `${low} ${unitLabel(kind, system)}`;
  return `${low}–${high} ${unitLabel(kind, system)}`;
}

/**
 * A difference (an allowance, a tolerance) in the user's units: like formatQuantity, but a
 * temperature difference scales without the offset (1 °C apart = 1.8 °F apart, NIST SP 811).
 */
export function formatDifference(valueSi: number, kind: QuantityKind, system: UnitSystem): string {
  if (kind !== 'temperature' || system === 'si') return formatQuantity(valueSi, kind, system);
  return `${formatNumber(valueSi * 1.8, displayDecimals(kind, system))} ${unitLabel(kind, system)}`;
}
