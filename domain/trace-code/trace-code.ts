// ASTM F2897-23a tracking and traceability code: parse and build the 16-character code
// (manufacturer, lot, production date, material, component type, size, index).
// Source: ASTM F2897-23a §§3–5, Tables 1, 2, 4, 5, 6 (CONFIRMED).
//
// Century convention (our choice, documented): the code stores a two-digit year (DDDYY).
// F2897 was first published in 2011, so no code can name a year before 2000; YY is read
// as 20YY (00–99 → 2000–2099) and buildTraceCode only accepts years 2000–2099.

import { DomainError } from '@/domain/errors';
import { formatIsoDate, isLeapYear } from '@/domain/dates/civil';
import { COMPONENT_TYPE_CODES } from '@/domain/trace-code/component-types';

/** Base-62 digits in value order: 0–9 → 0–9, a–z → 10–35, A–Z → 36–61 (F2897 Table 2). */
export const BASE62_ALPHABET = '0123456789abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ';

export const TRACE_CODE_LENGTH = 16;

/** Material codes, F2897-23a Table 4 (CONFIRMED). */
export const MATERIAL_CODES: Readonly<Record<string, string>> = {
  A: 'PE2406', B: 'PE2708', d: 'PE2708 PLUS', C: 'PE3408', D: 'PE3608', E: 'PE3708', F: 'PE3710',
  G: 'PE4608', H: 'PE4710', e: 'PE4710 PLUS', W: 'PE80', Z: 'PE100', J: 'PVC', K: 'PA11', L: 'PA12',
  Y: 'PEX', M: 'steel', N: 'stainless steel', O: 'cast iron', P: 'copper', Q: 'brass',
  R: 'malleable iron', S: 'ductile iron', T: 'reinforced epoxy resin', U: 'nylon', V: 'glass-filled nylon',
  X: 'other', '0': 'steel grade A', '1': 'steel grade B', '2': 'steel grade C', '3': 'steel X42',
  '4': 'steel X46', '5': 'steel X52', '6': 'steel X56', '7': 'steel X60', '8': 'steel X65', '9': 'steel X70',
};

/** A size factor of F2897-23a Table 6 (a selection; §5.7, CONFIRMED). */
export interface SizeFactorEntry {
  series: 'ips' | 'cts';
  nominal: string;
  /** SDR for IPS entries; null for CTS tubing sold by wall. */
  sdr: number | null;
  wallIn: number;
  factor: number;
}

export const TABLE_6_SIZE_FACTORS: readonly SizeFactorEntry[] = [
  { series: 'cts', nominal: '1/2', sdr: null, wallIn: 0.09, factor: 4 },
  { series: 'ips', nominal: '3/4', sdr: 11, wallIn: 0.095, factor: 20 },
  { series: 'ips', nominal: '1', sdr: 11, wallIn: 0.12, factor: 24 },
  { series: 'ips', nominal: '1-1/4', sdr: 11, wallIn: 0.151, factor: 29 },
  { series: 'ips', nominal: '1-1/2', sdr: 11, wallIn: 0.173, factor: 33 },
  { series: 'ips', nominal: '2', sdr: 9.33, wallIn: 0.255, factor: 37 },
  { series: 'ips', nominal: '2', sdr: 11, wallIn: 0.216, factor: 38 },
  { series: 'ips', nominal: '2', sdr: 13.5, wallIn: 0.176, factor: 39 },
  { series: 'ips', nominal: '3', sdr: 11, wallIn: 0.318, factor: 40 },
  { series: 'ips', nominal: '4', sdr: 11, wallIn: 0.409, factor: 44 },
  { series: 'ips', nominal: '4', sdr: 13.5, wallIn: 0.333, factor: 46 },
  { series: 'ips', nominal: '4', sdr: 17, wallIn: 0.265, factor: 48 },
  { series: 'ips', nominal: '6', sdr: 11, wallIn: 0.602, factor: 49 },
  { series: 'ips', nominal: '6', sdr: 13.5, wallIn: 0.491, factor: 51 },
  { series: 'ips', nominal: '6', sdr: 17, wallIn: 0.39, factor: 52 },
  { series: 'ips', nominal: '8', sdr: 11, wallIn: 0.784, factor: 54 },
  { series: 'ips', nominal: '8', sdr: 13.5, wallIn: 0.639, factor: 56 },
  { series: 'ips', nominal: '10', sdr: 11, wallIn: 0.977, factor: 59 },
  { series: 'ips', nominal: '12', sdr: 11, wallIn: 1.159, factor: 64 },
  { series: 'ips', nominal: '24', sdr: 21, wallIn: 1.143, factor: 92 },
];

/** Table 6 factor for a pipe (IPS by SDR, CTS by wall in inches), or null when not in our selection. */
export function sizeFactorFor(input: { series: 'ips' | 'cts'; nominal: string; sdr?: number; wallIn?: number }): number | null {
  const entry = TABLE_6_SIZE_FACTORS.find(
    (row) =>
      row.series === input.series &&
      row.nominal === input.nominal &&
      (row.sdr !== null ? row.sdr === input.sdr : input.wallIn !== undefined && Math.abs(row.wallIn - input.wallIn) < 5e-4),
  );
  return entry ? entry.factor : null;
}

/** Size code D = C1 × 378 + C2 + 1 (F2897-23a §5.7). Factors are integers 0–377. */
export function sizeCode(factors: readonly [number, number]): number {
  return factors[0] * 378 + factors[1] + 1;
}

/** Inverse of sizeCode: C1 = ⌊(D − 1) / 378⌋, C2 = (D − 1) mod 378; D = 0 → null (no factor). */
export function sizeFactorsFromCode(code: number): [number, number] | null {
  if (code === 0) return null;
  return [Math.floor((code - 1) / 378), (code - 1) % 378];
}

/** Non-negative integer → base-62 string of exactly `width` characters (left-padded with "0"). */
export function encodeBase62(value: number, width: number): string {
  if (!Number.isInteger(value) || value < 0) throw new DomainError('invalid-input', `Base-62 value must be a whole number of 0 or more (got ${value})`);
  let text = '';
  let rest = value;
  do {
    text = BASE62_ALPHABET[rest % 62] + text;
    rest = Math.floor(rest / 62);
  } while (rest > 0);
  if (text.length > width) throw new DomainError('invalid-input', `${value} needs more than ${width} base-62 characters`);
  return text.padStart(width, '0');
}

/** Base-62 string → integer; NaN if a character is outside the alphabet. */
export function decodeBase62(text: string): number {
  let value = 0;
  for (const char of text) {
    const digit = BASE62_ALPHABET.indexOf(char);
    if (digit < 0) return Number.NaN;
    value = value * 62 + digit;
  }
  return value;
}

export interface TraceCodeValue {
  /** Two-character manufacturer id (registered with the standard's registry). */
  manufacturer: string;
  /** Manufacturer's lot number: 7 digits, leading zeros kept. */
  lot: string;
  /** 'YYYY-MM-DD'. */
  productionDate: string;
  /** Material designation from Table 4, e.g. 'PE4710'. */
  material: string;
  /** Table 4 code character of the material, e.g. 'H'. */
  materialCode: string;
  /** Table 5 component type code, e.g. '12'. */
  componentType: string;
  /** [C1, C2] of Table 6–8, or null when the code is "000" (no factor found). */
  sizeFactors: [number, number] | null;
  /** Base-62 index character: '0' default, '1' Annex A1 coefficients. */
  index: string;
}

export type ParseTraceCodeResult = { ok: true; value: TraceCodeValue } | { ok: false; error: string };

/**
 * The lot field of an F2897 code (positions 3–6: the lot number in base 62, 4 characters)
 * for a lot of 1–7 digits, so coils can be found by the lot their code carries; null for a
 * lot that a code cannot carry (letters, more than 7 digits). Case matters: compare bytes.
 * Source: ASTM F2897-23a Table 1 (lot code, 4 characters) and Table 2 (base 62).
 */
export function traceCodeLotField(lot: string): string | null {
  const text = (lot ?? '').trim();
  if (!/^\d{1,7}$/.test(text)) return null;
  return encodeBase62(Number(text), 4);
}

/** Input of buildTraceCode: as TraceCodeValue, material by designation or code. */
export interface BuildTraceCodeInput {
  manufacturer: string;
  lot: string | number;
  productionDate: string;
  /** Designation ('PE4710') or Table 4 code ('H'). */
  material: string;
  componentType: string;
  sizeFactors: readonly [number, number] | null;
  index?: string;
}

/** Day of year (1–366) of a civil date. */
function dayOfYear(year: number, month: number, day: number): number {
  return Math.round((Date.UTC(year, month - 1, day) - Date.UTC(year, 0, 1)) / 86_400_000) + 1;
}

/**
 * Parse a 16-character F2897 code. Case-sensitive. Errors (one, the first found):
 * wrong length; a character outside 0–9a–zA–Z (1-based position named); unknown
 * material or component type; lot above 7 digits; day 0, day above 366, or day 366
 * in a non-leap year; index other than 0 or 1. Years read as 20YY (see top).
 * Source: ASTM F2897-23a Tables 1, 2, 4, 5 and §5.7 (CONFIRMED).
 */
export function parseTraceCode(code: string): ParseTraceCodeResult {
  if (typeof code !== 'string') return { ok: false, error: 'A traceability code must be text' };
  const text = code.trim();
  if (text.length !== TRACE_CODE_LENGTH) {
    return { ok: false, error: `A traceability code has 16 characters; this one has ${text.length}` };
  }
  for (let i = 0; i < text.length; i += 1) {
    if (!BASE62_ALPHABET.includes(text[i] as string)) {
      return { ok: false, error: `Character "${text[i]}" at position ${i + 1} is not allowed; use only 0–9, a–z and A–Z` };
    }
  }
  const manufacturer = text.slice(0, 2);
  const lotValue = decodeBase62(text.slice(2, 6));
  if (lotValue > 9_999_999) {
    return { ok: false, error: `Lot code "${text.slice(2, 6)}" (positions 3–6) is ${lotValue}, more than the 7 digits a lot may have` };
  }
  const dateValue = decodeBase62(text.slice(6, 9));
  if (dateValue > 99_999) {
    return { ok: false, error: `Production date "${text.slice(6, 9)}" (positions 7–9) is ${dateValue}, more than the 5 digits DDDYY` };
  }
  const day = Math.floor(dateValue / 100);
  const year = 2000 + (dateValue % 100);
  if (day < 1 || day > 366) {
    return { ok: false, error: `Production date "${text.slice(6, 9)}" (positions 7–9) gives day ${day} of ${year}; the day of the year must be 1–366` };
  }
  if (day === 366 && !isLeapYear(year)) {
    return { ok: false, error: `Production date "${text.slice(6, 9)}" (positions 7–9) gives day 366 of ${year}, which is not a leap year` };
  }
  const materialCode = text[9] as string;
  const material = MATERIAL_CODES[materialCode];
  if (!material) return { ok: false, error: `Material code "${materialCode}" at position 10 is not in ASTM F2897 Table 4` };
  const componentType = text.slice(10, 12);
  if (!COMPONENT_TYPE_CODES[componentType]) {
    return { ok: false, error: `Component type "${componentType}" at positions 11–12 is not a known ASTM F2897 Table 5 code` };
  }
  const size = decodeBase62(text.slice(12, 15));
  const index = text[15] as string;
  if (index !== '0' && index !== '1') {
    return { ok: false, error: `Index "${index}" at position 16 must be 0 (default) or 1 (Annex A1 size coefficients)` };
  }
  const date = new Date(Date.UTC(year, 0, day));
  return {
    ok: true,
    value: {
      manufacturer,
      lot: String(lotValue).padStart(7, '0'),
      productionDate: formatIsoDate(date.getUTCFullYear(), date.getUTCMonth() + 1, date.getUTCDate()),
      material,
      materialCode,
      componentType,
      sizeFactors: sizeFactorsFromCode(size),
      index,
    },
  };
}

/**
 * Build the 16-character code. Throws DomainError with a plain message for a bad
 * manufacturer id, a lot that is not 1–7 digits, a date not in 2000–2099 or not a real
 * date, an unknown material or component type, size factors outside 0–377, or an index
 * other than '0'/'1'. Source: ASTM F2897-23a Table 1 and §5.7 (CONFIRMED).
 */
export function buildTraceCode(value: BuildTraceCodeInput): string {
  const manufacturer = value.manufacturer;
  if (manufacturer.length !== 2 || [...manufacturer].some((char) => !BASE62_ALPHABET.includes(char))) {
    throw new DomainError('invalid-input', `Manufacturer id must be 2 characters from 0–9, a–z, A–Z (got "${manufacturer}")`);
  }
  const lotText = String(value.lot);
  if (!/^\d{1,7}$/.test(lotText)) throw new DomainError('invalid-input', `Lot must be 1 to 7 digits (got "${lotText}")`);
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(value.productionDate);
  if (!match) throw new DomainError('invalid-input', `Production date must be YYYY-MM-DD (got "${value.productionDate}")`);
  const [year, month, day] = [Number(match[1]), Number(match[2]), Number(match[3])];
  const check = new Date(Date.UTC(year, month - 1, day));
  if (check.getUTCFullYear() !== year || check.getUTCMonth() !== month - 1 || check.getUTCDate() !== day) {
    throw new DomainError('invalid-input', `Production date ${value.productionDate} is not a real date`);
  }
  if (year < 2000 || year > 2099) throw new DomainError('invalid-input', `Production year must be 2000–2099 (two-digit year in the code); got ${year}`);
  const materialCode = MATERIAL_CODES[value.material] !== undefined && value.material.length === 1
    ? value.material
    : Object.keys(MATERIAL_CODES).find((key) => MATERIAL_CODES[key] === value.material);
  if (!materialCode) throw new DomainError('invalid-input', `Material "${value.material}" is not in ASTM F2897 Table 4`);
  if (!COMPONENT_TYPE_CODES[value.componentType]) {
    throw new DomainError('invalid-input', `Component type "${value.componentType}" is not a known ASTM F2897 Table 5 code`);
  }
  let size = 0;
  if (value.sizeFactors) {
    const [c1, c2] = value.sizeFactors;
    for (const factor of [c1, c2]) {
      if (!Number.isInteger(factor) || factor < 0 || factor > 377) throw new DomainError('invalid-input', `Size factors must be whole numbers 0–377 (got ${factor})`);
    }
    size = sizeCode([c1, c2]);
  }
  const index = value.index ?? '0';
  if (index !== '0' && index !== '1') throw new DomainError('invalid-input', `Index must be "0" or "1" (got "${index}")`);
  const dddyy = dayOfYear(year, month, day) * 100 + (year % 100);
  return `${manufacturer}${encodeBase62(Number(lotText), 4)}${encodeBase62(dddyy, 3)}${materialCode}${value.componentType}${encodeBase62(size, 3)}${index}`;
}
