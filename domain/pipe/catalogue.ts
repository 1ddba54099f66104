// Catalogue of PE pipe sizes: IPS (iron pipe size, ODs of ASME B36.10 as used by
// ASTM D2513/D3035), CTS (copper tube size) and the metric ISO 4427-2 / ISO 4437-2 series,
// with the metric minimum-wall (e_min) tables for SDR 11 and SDR 17.
// Status of each value (CONFIRMED, CONFIRMED-2nd, FROM MEMORY) is marked beside it.

import { DomainError } from '@/domain/errors';
import { inToMm } from '@/domain/units/conversions';
import type { ValueStatus } from '@/domain/sources';

export type PipeSeries = 'ips' | 'cts' | 'metric';

export const PIPE_SERIES: readonly PipeSeries[] = ['ips', 'cts', 'metric'];

/** One entry of a size catalogue; `outsideDiameterMm` is canonical (IPS/CTS: inch OD × 25.4). */
export interface PipeSize {
  series: PipeSeries;
  /** Canonical nominal key: '1/2', '1-1/4', '2' for IPS/CTS; '63' (mm) for metric. */
  nominal: string;
  /** Label for pickers, e.g. '1¼" IPS', '63 mm'. */
  label: string;
  outsideDiameterMm: number;
  /** Outside diameter in inches for IPS/CTS (the defining value); null for metric. */
  outsideDiameterIn: number | null;
  status: ValueStatus;
}

interface InchSizeRow {
  nominal: string;
  label: string;
  odIn: number;
  status: ValueStatus;
}

// IPS ODs in inches — CONFIRMED (pipe makers' data sheets; F2897-23a Table 6 walls
// back-compute to these ODs); ASME B36.10 outside diameters.
const IPS_ROWS: readonly InchSizeRow[] = [
  { nominal: '1/2', label: '½"', odIn: 0.84, status: 'confirmed' },
  { nominal: '3/4', label: '¾"', odIn: 1.05, status: 'confirmed' },
  { nominal: '1', label: '1"', odIn: 1.315, status: 'confirmed' },
  { nominal: '1-1/4', label: '1¼"', odIn: 1.66, status: 'confirmed' },
  { nominal: '1-1/2', label: '1½"', odIn: 1.9, status: 'confirmed' },
  { nominal: '2', label: '2"', odIn: 2.375, status: 'confirmed' },
  { nominal: '3', label: '3"', odIn: 3.5, status: 'confirmed' },
  { nominal: '4', label: '4"', odIn: 4.5, status: 'confirmed' },
  { nominal: '5', label: '5"', odIn: 5.563, status: 'confirmed' },
  { nominal: '6', label: '6"', odIn: 6.625, status: 'confirmed' },
  { nominal: '8', label: '8"', odIn: 8.625, status: 'confirmed' },
  { nominal: '10', label: '10"', odIn: 10.75, status: 'confirmed' },
  { nominal: '12', label: '12"', odIn: 12.75, status: 'confirmed' },
  { nominal: '14', label: '14"', odIn: 14, status: 'confirmed' },
  { nominal: '16', label: '16"', odIn: 16, status: 'confirmed' },
  { nominal: '18', label: '18"', odIn: 18, status: 'confirmed' },
  { nominal: '20', label: '20"', odIn: 20, status: 'confirmed' },
  { nominal: '22', label: '22"', odIn: 22, status: 'confirmed' },
  { nominal: '24', label: '24"', odIn: 24, status: 'confirmed' },
];

// CTS ODs (nominal + 1/8 in): ¾"–2" CONFIRMED, ¼"–½" FROM MEMORY.
const CTS_ROWS: readonly InchSizeRow[] = [
  { nominal: '1/4', label: '¼"', odIn: 0.375, status: 'from-memory' },
  { nominal: '3/8', label: '⅜"', odIn: 0.5, status: 'from-memory' },
  { nominal: '1/2', label: '½"', odIn: 0.625, status: 'from-memory' },
  { nominal: '3/4', label: '¾"', odIn: 0.875, status: 'confirmed' },
  { nominal: '1', label: '1"', odIn: 1.125, status: 'confirmed' },
  { nominal: '1-1/4', label: '1¼"', odIn: 1.375, status: 'confirmed' },
  { nominal: '1-1/2', label: '1½"', odIn: 1.625, status: 'confirmed' },
  { nominal: '2', label: '2"', odIn: 2.125, status: 'confirmed' },
];

/** Metric nominal outside diameters d_n, mm — ISO 4427-2 / 4437-2, CONFIRMED-2nd. */
export const METRIC_OUTSIDE_DIAMETERS_MM: readonly number[] = [
  16, 20, 25, 32, 40, 50, 63, 75, 90, 110, 125, 140, 160, 180, 200, 225, 250, 280, 315, 355,
  400, 450, 500, 560, 630,
];

/** Metric SDR series (ISO 4427-2; S = (SDR − 1) / 2), CONFIRMED-2nd. */
export const METRIC_SDR_SERIES: readonly number[] = [6, 7.4, 9, 11, 13.6, 17, 21, 26, 33, 41];

/** IPS SDRs that appear in ASTM D2513/D3035 and F2897 Table 6 (9.33 is a gas-pipe DR). */
export const IPS_SDR_SERIES: readonly number[] = [7, 9, 9.33, 11, 13.5, 17, 21, 26, 32.5];

/**
 * Metric minimum wall e_min, mm, by d_n — the printed ISO 4427-2 Table 2 / ISO 4437-2 values
 * read in reproductions (CONFIRMED-2nd). domain/pipe/walls computes every SDR from the
 * ISO 4065 S series and checks it against these; where the two differ the printed value wins.
 * 500 mm SDR 17 is 29.7 (one reproduction reads 27.7, most likely a misprint; the rule gives 29.7).
 */
export const METRIC_MINIMUM_WALL_MM: Readonly<Record<11 | 17, Readonly<Record<number, number>>>> = {
  11: {
    20: 2.0, 25: 2.3, 32: 3.0, 40: 3.7, 50: 4.6, 63: 5.8, 75: 6.8, 90: 8.2, 110: 10.0,
    125: 11.4, 140: 12.7, 160: 14.6, 180: 16.4, 200: 18.2, 225: 20.5, 250: 22.7, 280: 25.4,
    315: 28.6, 355: 32.2, 400: 36.3, 450: 40.9, 500: 45.4, 560: 50.8,
  },
  17: {
    32: 2.0, 40: 2.4, 50: 3.0, 63: 3.8, 75: 4.5, 90: 5.4, 110: 6.6, 125: 7.4, 140: 8.3,
    160: 9.5, 180: 10.7, 200: 11.9, 225: 13.4, 250: 14.8, 280: 16.6, 315: 18.7, 355: 21.1,
    400: 23.7, 450: 26.7, 500: 29.7, 560: 33.2,
  },
};

function inchSize(series: 'ips' | 'cts', row: InchSizeRow): PipeSize {
  return {
    series,
    nominal: row.nominal,
    label: `${row.label} ${series.toUpperCase()}`,
    outsideDiameterMm: inToMm(row.odIn),
    outsideDiameterIn: row.odIn,
    status: row.status,
  };
}

const CATALOGUE: Readonly<Record<PipeSeries, readonly PipeSize[]>> = {
  ips: IPS_ROWS.map((row) => inchSize('ips', row)),
  cts: CTS_ROWS.map((row) => inchSize('cts', row)),
  metric: METRIC_OUTSIDE_DIAMETERS_MM.map((od) => ({
    series: 'metric' as const,
    nominal: String(od),
    label: `${od} mm`,
    outsideDiameterMm: od,
    outsideDiameterIn: null,
    status: 'confirmed-2nd' as const,
  })),
};

/** All sizes of a series in ascending OD, for pickers. */
export function pipeSizes(series: PipeSeries): readonly PipeSize[] {
  const sizes = CATALOGUE[series];
  if (!sizes) throw new DomainError('invalid-input', `Unknown pipe series "${String(series)}"; use ips, cts or metric`);
  return sizes;
}

const FRACTIONS: Record<string, string> = { '¼': '1/4', '⅜': '3/8', '½': '1/2', '¾': '3/4' };
const DECIMAL_NOMINALS: Record<string, string> = {
  '0.25': '1/4', '.25': '1/4', '0.375': '3/8', '.375': '3/8', '0.5': '1/2', '.5': '1/2',
  '0.75': '3/4', '.75': '3/4', '1.25': '1-1/4', '1.5': '1-1/2',
};

/**
 * Normalise how people write a nominal size: '1 1/4', '1-1/4', '1¼', '1.25', '1¼"',
 * '2 in', ' 63 mm' → the catalogue key ('1-1/4', '2', '63').
 */
export function normaliseNominal(nominal: string): string {
  let text = nominal.trim().replace(/["”]|\s*(in|inch|inches|mm)$/i, '').trim();
  for (const [glyph, fraction] of Object.entries(FRACTIONS)) {
    text = text.replace(new RegExp(`^(\\d+)\\s*${glyph}$`), `$1-${fraction}`).replace(glyph, fraction);
  }
  text = text.replace(/^(\d+)\s+(\d\/\d)$/, '$1-$2');
  return DECIMAL_NOMINALS[text] ?? text;
}

/** Catalogue entry for a nominal size; throws DomainError('unknown-size') if absent. */
export function findPipeSize(series: PipeSeries, nominal: string): PipeSize {
  const key = normaliseNominal(nominal);
  const size = pipeSizes(series).find((entry) => entry.nominal === key);
  if (!size) {
    const known = pipeSizes(series).map((entry) => entry.nominal).join(', ');
    throw new DomainError('unknown-size', `No ${series.toUpperCase()} size "${nominal}"; known sizes: ${known}`);
  }
  return size;
}

/**
 * Outside diameter in mm of a nominal size. IPS/CTS: the inch OD × 25.4 exactly
 * (e.g. 2" IPS → 60.325 mm); metric: d_n itself. Throws DomainError for an unknown size.
 * Source: ASME B36.10 IPS ODs (CONFIRMED), CTS = nominal + ⅛" (¾"–2" CONFIRMED), ISO 4427-2 / ISO 4437-2 (metric CONFIRMED-2nd).
 */
export function nominalOutsideDiameterMm(series: PipeSeries, nominal: string): number {
  return findPipeSize(series, nominal).outsideDiameterMm;
}
