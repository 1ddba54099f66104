// Pipe geometry for butt fusion: minimum wall t = OD / SDR and fusion (annular end) area
// A = π·(OD − t)·t, which equals π/4·(OD² − ID²) with ID = OD − 2t.
// Sources: SDR = OD / minimum wall (ASTM D3035, ISO 4427 notes);
// ASTM IPS tables = OD/SDR rounded to 0.001 in; ISO metric walls looked up (ISO 4427-2 / ISO 4437-2 tables).

import { DomainError } from '@/domain/errors';
import { roundTo } from '@/domain/units/format';
import { inToMm, mmToIn } from '@/domain/units/conversions';
import {
  findPipeSize,
  METRIC_MINIMUM_WALL_MM,
  type PipeSeries,
} from '@/domain/pipe/catalogue';

export interface PipeGeometryInput {
  outsideDiameterMm: number;
  sdr: number;
  /** A wall from a table (e.g. ISO e_min); defaults to OD / SDR. */
  wallMm?: number;
}

export interface PipeGeometry {
  wallMm: number;
  fusionAreaMm2: number;
}

function assertFinite(value: number, name: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new DomainError('invalid-input', `${name} must be a number`);
  }
}

/** Throws DomainError unless OD > 0 and SDR > 2 (SDR ≤ 2 means no bore). */
export function assertPipeInput(outsideDiameterMm: number, sdr: number): void {
  assertFinite(outsideDiameterMm, 'Outside diameter');
  assertFinite(sdr, 'SDR');
  if (outsideDiameterMm <= 0) {
    throw new DomainError('invalid-input', `Outside diameter must be more than 0 mm (got ${outsideDiameterMm})`);
  }
  if (sdr <= 2) {
    throw new DomainError('invalid-input', `SDR must be more than 2 (got ${sdr}); at SDR 2 the wall would fill the bore`);
  }
}

/**
 * Fusion (annular end) area in mm² of a pipe end: π·(OD − t)·t. Inputs mm; not rounded.
 * Source: exact geometry.
 */
export function fusionAreaMm2(outsideDiameterMm: number, wallMm: number): number {
  return Math.PI * (outsideDiameterMm - wallMm) * wallMm;
}

/**
 * Minimum wall and fusion area of a pipe. Inputs: OD in mm, SDR (dimensionless), optional
 * table wall in mm. Wall = OD / SDR unless `wallMm` is given; nothing is rounded (round
 * for display only). Throws DomainError for OD ≤ 0, SDR ≤ 2 or a wall outside (0, OD/2).
 * Source: SDR definition (ASTM D3035 / ISO 4427).
 */
export function pipeGeometry(input: PipeGeometryInput): PipeGeometry {
  const { outsideDiameterMm, sdr } = input;
  assertPipeInput(outsideDiameterMm, sdr);
  let wallMm = outsideDiameterMm / sdr;
  if (input.wallMm !== undefined) {
    assertFinite(input.wallMm, 'Wall');
    if (input.wallMm <= 0 || input.wallMm >= outsideDiameterMm / 2) {
      throw new DomainError('invalid-input', `Wall must be more than 0 mm and less than half the ${outsideDiameterMm} mm outside diameter (got ${input.wallMm} mm)`);
    }
    wallMm = input.wallMm;
  }
  return { wallMm, fusionAreaMm2: fusionAreaMm2(outsideDiameterMm, wallMm) };
}

// Published IPS walls that are not the plain rounding of OD/SDR (ASTM D3035 table,
// CONFIRMED from ASTM F2897-23a Table 6 / D2513 listing): 1" SDR 9.33 is listed at
// 0.140 in although 1.315 / 9.33 = 0.1409.
const IPS_WALL_EXCEPTIONS_IN: Readonly<Record<string, number>> = { '1@9.33': 0.14 };

/**
 * Minimum wall in inches of an IPS pipe as the ASTM tables list it: OD/SDR rounded half
 * up to 0.001 in, except the listed exceptions. Throws DomainError for an unknown size or
 * SDR ≤ 2. Source: ASTM D3035 table, ASTM F2897-23a Table 6, CONFIRMED.
 */
export function ipsMinimumWallIn(nominal: string, sdr: number): number {
  const size = findPipeSize('ips', nominal);
  assertPipeInput(size.outsideDiameterMm, sdr);
  const exception = IPS_WALL_EXCEPTIONS_IN[`${size.nominal}@${sdr}`];
  if (exception !== undefined) return exception;
  return roundTo((size.outsideDiameterIn as number) / sdr, 3);
}

/**
 * Metric minimum wall e_min in mm looked up in the ISO 4427-2 / 4437-2 table for SDR 11
 * or 17 (CONFIRMED-2nd). Returns null when the table has no entry
 * (other SDRs, 16 mm, 630 mm) — callers then fall back to OD/SDR and say so.
 */
export function metricMinimumWallMm(outsideDiameterMm: number, sdr: number): number | null {
  if (sdr !== 11 && sdr !== 17) return null;
  return METRIC_MINIMUM_WALL_MM[sdr][outsideDiameterMm] ?? null;
}

export interface PipeSizeGeometry extends PipeGeometry {
  outsideDiameterMm: number;
  /** Where the wall came from: a published table, or OD / SDR when no table value exists. */
  wallSource: 'ips-table' | 'metric-table' | 'od-over-sdr';
}

/**
 * Geometry of a catalogued size: IPS walls from the 0.001 in table rounding, metric walls
 * from the ISO e_min table (SDR 11 and 17), anything else OD/SDR. Units mm / mm².
 * Throws DomainError for an unknown size or SDR ≤ 2.
 */
export function pipeGeometryForSize(input: { series: PipeSeries; nominal: string; sdr: number }): PipeSizeGeometry {
  const size = findPipeSize(input.series, input.nominal);
  assertPipeInput(size.outsideDiameterMm, input.sdr);
  const od = size.outsideDiameterMm;
  if (input.series === 'ips') {
    const wallMm = inToMm(ipsMinimumWallIn(size.nominal, input.sdr));
    return { outsideDiameterMm: od, wallMm, fusionAreaMm2: fusionAreaMm2(od, wallMm), wallSource: 'ips-table' };
  }
  if (input.series === 'metric') {
    const table = metricMinimumWallMm(od, input.sdr);
    if (table !== null) {
      return { outsideDiameterMm: od, wallMm: table, fusionAreaMm2: fusionAreaMm2(od, table), wallSource: 'metric-table' };
    }
  }
  const wallMm = od / input.sdr;
  return { outsideDiameterMm: od, wallMm, fusionAreaMm2: fusionAreaMm2(od, wallMm), wallSource: 'od-over-sdr' };
}

/** Wall in inches of a wall in mm (for US display of a computed wall), not rounded. */
export function wallIn(wallMm: number): number {
  return mmToIn(wallMm);
}
