// Published minimum walls of PE pipe, looked up by series, nominal size and SDR (or by a
// fixed wall designation), and the record of where a plan's wall came from.
//
// Metric (ISO 4427-2 Table 2 / ISO 4437-2): e_min = d_n / (2·S + 1) with S the exact ISO 4065
// preferred number (R10 series, S = 10^(k/10): S 5 = 5.012, S 8 = 7.943), rounded UP to
// 0.1 mm; small sizes raised to 2.0, 2.3 or 3.0 mm (footnote of an ISO 4427-based national
// table) [CONFIRMED-2nd]. Where this rule and a printed table value disagree the printed
// value wins (METRIC_MINIMUM_WALL_MM): 75 and 355 mm SDR 11, 125 and 250 mm SDR 17 print
// 0.1 mm less than the rule, because d_n/(2S+1) exceeds the printed value by < 0.005 mm.
// IPS (ASTM D3035 / D2513 tables; ASTM F2897-23a Table 6): OD/DR rounded to 0.001 in, the
// printed exception 1" DR 9.33 = 0.140 in, the gas DRs 9.3, 9.9, 10, 11.5, 15.5 and the fixed
// 0.090 in ("D") walls. CTS: fixed walls of ASTM F2897-23a Table 6.

import { DomainError } from '@/domain/errors';
import { roundTo } from '@/domain/units/format';
import { inToMm } from '@/domain/units/conversions';
import type { ValueStatus } from '@/domain/sources';
import {
  findPipeSize,
  IPS_SDR_SERIES,
  METRIC_MINIMUM_WALL_MM,
  METRIC_OUTSIDE_DIAMETERS_MM,
  pipeSizes,
  type PipeSeries,
  type PipeSize,
} from '@/domain/pipe/catalogue';

/** Where a plan's wall came from. */
export type WallSource =
  /** A published table (standard and table named in `source`). */
  | { kind: 'table'; source: string; status: ValueStatus }
  /** A wall the caller gave (e.g. measured, or an operator's entry). */
  | { kind: 'given' }
  /** No table lists this size and SDR: wall = OD / SDR, not rounded. */
  | { kind: 'od-over-sdr' };

export interface TableWall {
  series: PipeSeries;
  /** Catalogue nominal key ('2', '1-1/4', '63'). */
  nominal: string;
  /** DR / SDR; for fixed-wall designations OD / wall (not a printed DR). */
  sdr: number;
  wallMm: number;
  /** The printed inch wall for IPS/CTS; null for metric. */
  wallIn: number | null;
  source: Extract<WallSource, { kind: 'table' }>;
}

// ISO 4065 S series: exact R10 preferred numbers, S = 10^(k/10) (ISO 3), keyed by SDR = 2S + 1
// as rounded in ISO 4427-2 (SDR 11 ↔ S 5, SDR 17 ↔ S 8).
const S_EXPONENT_BY_SDR: Readonly<Record<number, number>> = {
  6: 4, 7.4: 5, 9: 6, 11: 7, 13.6: 8, 17: 9, 21: 10, 26: 11, 33: 12, 41: 13,
};

/** Exact ISO 4065 S value for a metric SDR (e.g. SDR 11 → 5.0119); null for other SDRs. */
export function isoSeriesS(sdr: number): number | null {
  const k = S_EXPONENT_BY_SDR[sdr];
  return k === undefined ? null : 10 ** (k / 10);
}

const ISO_SOURCE = 'ISO 4427-2 Table 2 / ISO 4437-2 (e_min)';
const ISO_RULE_SOURCE = 'ISO 4427-2 Table 2 / ISO 4437-2 (e_min from the ISO 4065 S series, rounded up to 0.1 mm)';
// Below this unfloored value the tables leave the cell empty (e.g. 16 mm SDR 11, 25 mm
// SDR 17) instead of raising it to 2.0 mm. The threshold is our reading of which cells are
// printed (20 mm SDR 11 at 1.81 mm is printed, 25 mm SDR 17 at 1.48 mm is not); unconfirmed.
const METRIC_SMALLEST_PRINTED_MM = 1.75;

/** Round up to 0.1 mm (the 1e-9 keeps an exact tenth such as 10.0 from going up). */
const ceilTenth = (value: number): number => roundTo(Math.ceil(value * 10 - 1e-9) / 10, 1);

/**
 * Metric e_min by the ISO 4065 rule alone (no printed-table override), mm: d_n/(2S+1) rounded
 * up to 0.1 mm, at least 2.0 mm, and for d_n ≤ 25 mm values under 3.0 mm raised to the next of
 * 2.0, 2.3, 3.0 mm (national-table footnote; scope of the footnote read as d_n ≤ 25, unconfirmed).
 * Null for an SDR outside the ISO 4427-2 series or a cell the tables leave empty.
 */
export function metricRuleWallMm(outsideDiameterMm: number, sdr: number): number | null {
  const s = isoSeriesS(sdr);
  if (s === null) return null;
  const exact = outsideDiameterMm / (2 * s + 1);
  if (exact < METRIC_SMALLEST_PRINTED_MM) return null;
  let wall = Math.max(2.0, ceilTenth(exact));
  if (outsideDiameterMm <= 25 && wall < 3.0) wall = wall <= 2.0 ? 2.0 : wall <= 2.3 ? 2.3 : 3.0;
  return wall;
}

/**
 * Metric minimum wall e_min in mm for d_n 16–630 and the ISO 4427-2 SDR series: the printed
 * table value where we hold one (SDR 11 and 17), else the ISO 4065 rule. Null when neither
 * applies (an SDR outside the series, a size outside the OD series, an empty cell).
 */
export function metricMinimumWallMm(outsideDiameterMm: number, sdr: number): number | null {
  if (!METRIC_OUTSIDE_DIAMETERS_MM.includes(outsideDiameterMm)) return null;
  const printed = sdr === 11 || sdr === 17 ? METRIC_MINIMUM_WALL_MM[sdr][outsideDiameterMm] : undefined;
  return printed ?? metricRuleWallMm(outsideDiameterMm, sdr);
}

// ASTM F2897-23a Table 6 (size factors) lists these IPS walls, in inches, keyed
// 'nominal@DR' [CONFIRMED-2nd: read in a public reproduction of the table]. The gas DRs
// 9.3, 9.9, 10, 11.5 and 15.5 appear only here. 'D' marks the fixed 0.090 in wall.
const F2897_IPS_WALLS_IN: Readonly<Record<string, number>> = {
  '1/2@9.3': 0.09, '1/2@11': 0.076, '3/4@11': 0.095, '3/4@D': 0.09,
  '1@9.33': 0.14, '1@9.9': 0.133, '1@11': 0.12, '1@13.5': 0.097, '1@D': 0.09,
  '1-1/4@9.33': 0.178, '1-1/4@10': 0.166, '1-1/4@11': 0.151, '1-1/4@13.5': 0.123, '1-1/4@17': 0.098, '1-1/4@D': 0.09,
  '1-1/2@11': 0.173, '1-1/2@13.5': 0.141, '1-1/2@17': 0.112, '1-1/2@D': 0.09,
  '2@9.33': 0.255, '2@11': 0.216, '2@13.5': 0.176,
  '3@11': 0.318, '3@11.5': 0.304, '3@13.5': 0.259,
  '4@9.33': 0.482, '4@11': 0.409, '4@11.5': 0.391, '4@13.5': 0.333, '4@15.5': 0.29, '4@17': 0.265,
  '6@11': 0.602, '6@11.5': 0.576, '6@13.5': 0.491, '6@17': 0.39, '6@21': 0.315,
  '8@11': 0.784, '8@11.5': 0.75, '8@13.5': 0.639, '8@17': 0.507, '8@21': 0.411,
  '10@11': 0.977, '10@11.5': 0.935, '10@13.5': 0.796, '10@17': 0.632, '10@21': 0.512,
  // 12" DR 13.5 reads "0.994" in the reproduction beside "(23.98)" mm; 23.98 mm is 0.944 in
  // and 12.75/13.5 = 0.944, so 0.994 is taken as a reproduction slip.
  '12@11': 1.159, '12@11.5': 1.109, '12@13.5': 0.944, '12@17': 0.75, '12@21': 0.607,
  '14@11': 1.273, '14@13.5': 1.037, '14@17': 0.824, '14@21': 0.667,
  '16@11': 1.455, '16@13.5': 1.185, '16@17': 0.941, '16@21': 0.762,
  '18@11': 1.636, '18@13.5': 1.333, '18@17': 1.059, '18@21': 0.857,
  '20@11': 1.818, '20@13.5': 1.481, '20@17': 1.176, '20@21': 0.952,
  '22@11': 2.0, '22@13.5': 1.63, '22@17': 1.294, '22@21': 1.048,
  '24@11': 2.182, '24@13.5': 1.778, '24@17': 1.412, '24@21': 1.143,
};

/** IPS DRs of ASTM F2897-23a Table 6 beyond the D3035 / D2513 series, with the sizes listed. */
export const IPS_GAS_DRS: Readonly<Record<number, readonly string[]>> = {
  9.3: ['1/2'], 9.9: ['1'], 10: ['1-1/4'], 11.5: ['3', '4', '6', '8', '10', '12'], 15.5: ['4'],
};

/** Fixed IPS wall of ASTM D2513 / ASTM F2897-23a Table 6 ("D" designation), inches. */
export const IPS_FIXED_WALL_IN = 0.09;
const IPS_FIXED_WALL_SIZES: readonly string[] = ['3/4', '1', '1-1/4', '1-1/2'];

// CTS tubing is made by wall, not DR: ASTM F2897-23a Table 6 lists these walls (in) per size
// [CONFIRMED-2nd, public reproduction]. The reproduction also lists a "1 3/4 CTS 0.062" row,
// not a size of our catalogue; left out (unconfirmed).
export const CTS_WALLS_IN: Readonly<Record<string, readonly number[]>> = {
  '1/4': [0.062],
  '3/8': [0.062],
  '1/2': [0.062, 0.09, 0.104],
  '3/4': [0.062, 0.077, 0.09],
  '1': [0.062, 0.09, 0.099, 0.101, 0.121],
  '1-1/4': [0.062, 0.09, 0.121],
};

const ASTM_IPS_RULE_SOURCE = 'ASTM D3035 / ASTM D2513 IPS wall tables (OD/DR to 0.001 in)';
const F2897_SOURCE = 'ASTM F2897-23a Table 6';

function ipsPrintedWallIn(size: PipeSize, sdr: number): { wallIn: number; source: string } | null {
  const printed = F2897_IPS_WALLS_IN[`${size.nominal}@${sdr}`];
  if (printed !== undefined) return { wallIn: printed, source: F2897_SOURCE };
  if (IPS_SDR_SERIES.includes(sdr)) {
    return { wallIn: roundTo((size.outsideDiameterIn as number) / sdr, 3), source: ASTM_IPS_RULE_SOURCE };
  }
  if (IPS_GAS_DRS[sdr]?.includes(size.nominal)) {
    return { wallIn: roundTo((size.outsideDiameterIn as number) / sdr, 3), source: F2897_SOURCE };
  }
  return null;
}

/**
 * Minimum wall in inches of an IPS pipe as the ASTM tables list it: OD/DR rounded half up to
 * 0.001 in, except the printed values of ASTM F2897-23a Table 6 (e.g. 1" DR 9.33 = 0.140 in
 * while 1.315/9.33 = 0.1409). Throws DomainError for an unknown size or SDR ≤ 2; for a DR no
 * table lists, returns the same rounding of OD/DR.
 */
export function ipsMinimumWallIn(nominal: string, sdr: number): number {
  const size = findPipeSize('ips', nominal);
  if (typeof sdr !== 'number' || !Number.isFinite(sdr) || sdr <= 2) {
    throw new DomainError('invalid-input', `SDR must be more than 2 (got ${String(sdr)})`);
  }
  return ipsPrintedWallIn(size, sdr)?.wallIn ?? roundTo((size.outsideDiameterIn as number) / sdr, 3);
}

export interface TableWallQuery {
  series: PipeSeries;
  nominal: string;
  /** DR / SDR; not needed when `wallIn` names a fixed wall. */
  sdr?: number;
  /** A fixed wall designation in inches (IPS "D" 0.090 in, CTS walls). */
  wallIn?: number;
}

/**
 * The published wall of a catalogued size: by SDR (metric, IPS) or by a fixed wall (IPS 0.090
 * in, CTS). Null when no table lists it (callers then use OD / SDR and say so). Throws
 * DomainError for an unknown size.
 */
export function tableWall(query: TableWallQuery): TableWall | null {
  const size = findPipeSize(query.series, query.nominal);
  if (query.wallIn !== undefined) {
    const listed = size.series === 'cts'
      ? (CTS_WALLS_IN[size.nominal] ?? []).includes(query.wallIn)
      : size.series === 'ips' && query.wallIn === IPS_FIXED_WALL_IN && IPS_FIXED_WALL_SIZES.includes(size.nominal);
    if (!listed) return null;
    return {
      series: size.series,
      nominal: size.nominal,
      sdr: (size.outsideDiameterIn as number) / query.wallIn,
      wallMm: inToMm(query.wallIn),
      wallIn: query.wallIn,
      source: { kind: 'table', source: F2897_SOURCE, status: 'confirmed-2nd' },
    };
  }
  const sdr = query.sdr;
  if (sdr === undefined) return null;
  if (size.series === 'metric') {
    const wallMm = metricMinimumWallMm(size.outsideDiameterMm, sdr);
    if (wallMm === null) return null;
    const printed = (sdr === 11 || sdr === 17) && METRIC_MINIMUM_WALL_MM[sdr][size.outsideDiameterMm] !== undefined;
    return {
      series: 'metric', nominal: size.nominal, sdr, wallMm, wallIn: null,
      source: { kind: 'table', source: printed ? ISO_SOURCE : ISO_RULE_SOURCE, status: 'confirmed-2nd' },
    };
  }
  if (size.series === 'ips') {
    const printed = ipsPrintedWallIn(size, sdr);
    if (!printed) return null;
    return {
      series: 'ips', nominal: size.nominal, sdr, wallMm: inToMm(printed.wallIn), wallIn: printed.wallIn,
      source: { kind: 'table', source: printed.source, status: printed.source === F2897_SOURCE ? 'confirmed-2nd' : 'confirmed' },
    };
  }
  // CTS by DR alone: the tables list walls, not DRs, and one DR can fit two walls (1" CTS
  // 0.099 and 0.101 in are both about DR 11), so no table wall is chosen.
  return null;
}

// IPS, CTS and metric ODs of the catalogue lie at least 0.125 mm apart (CTS ½" 15.875 mm vs
// 16 mm); a stored OD within 0.06 mm is that size: 60.33 mm (2 decimals) for 2" IPS =
// 60.325 mm, and the ASME B36.10 metric roundings such as 273.0 mm for 10" = 273.05 mm.
const OD_MATCH_MM = 0.06;

/** Catalogue size whose OD is within 0.06 mm of the given OD, or null. */
export function sizeForOutsideDiameter(outsideDiameterMm: number, series?: PipeSeries): PipeSize | null {
  const all = (series ? [series] : (['metric', 'ips', 'cts'] as const)).flatMap((entry) => pipeSizes(entry));
  return all.find((size) => Math.abs(size.outsideDiameterMm - outsideDiameterMm) <= OD_MATCH_MM) ?? null;
}

/**
 * Table wall for a pipe known only by OD (mm) and SDR: finds the catalogue size by OD (within
 * 0.06 mm) and looks the wall up. Null when the OD is not a catalogued size or no table lists
 * that SDR.
 */
export function tableWallForOutsideDiameter(outsideDiameterMm: number, sdr: number): TableWall | null {
  const size = sizeForOutsideDiameter(outsideDiameterMm);
  return size ? tableWall({ series: size.series, nominal: size.nominal, sdr }) : null;
}

/** Where a plan's wall came from, in words (plans stored before it was kept have none). */
export function describeWallSource(source: WallSource | undefined): string {
  if (!source) return 'not recorded with this plan';
  switch (source.kind) {
    case 'table':
      return source.source;
    case 'given':
      return 'given with the plan (measured or typed)';
    case 'od-over-sdr':
      return 'OD ÷ SDR (no published table lists this size and SDR)';
  }
}
