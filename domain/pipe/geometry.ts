// Pipe geometry for butt fusion: minimum wall t = OD / SDR and fusion (annular end) area
// A = π·(OD − t)·t, which equals π/4·(OD² − ID²) with ID = OD − 2t.
// Sources: SDR = OD / minimum wall (ASTM D3035, ISO 4427 notes); published walls of
// catalogued sizes come from domain/pipe/walls.

import { DomainError } from '@/domain/errors';
import { mmToIn } from '@/domain/units/conversions';
import { findPipeSize, type PipeSeries } from '@/domain/pipe/catalogue';
import { tableWall, type WallSource } from '@/domain/pipe/walls';

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

export interface PipeSizeGeometry extends PipeGeometry {
  outsideDiameterMm: number;
  /** Where the wall came from: a published table, or OD / SDR when no table lists it. */
  wallSource: WallSource;
}

/**
 * Geometry of a catalogued size: the published wall (domain/pipe/walls: ISO 4427-2 / 4437-2,
 * ASTM D3035 / D2513, ASTM F2897-23a Table 6) where a table lists the size and SDR, else
 * OD/SDR. Units mm / mm². Throws DomainError for an unknown size or SDR ≤ 2.
 */
export function pipeGeometryForSize(input: { series: PipeSeries; nominal: string; sdr: number }): PipeSizeGeometry {
  const size = findPipeSize(input.series, input.nominal);
  assertPipeInput(size.outsideDiameterMm, input.sdr);
  const od = size.outsideDiameterMm;
  const table = tableWall({ series: input.series, nominal: size.nominal, sdr: input.sdr });
  if (table) {
    return { outsideDiameterMm: od, wallMm: table.wallMm, fusionAreaMm2: fusionAreaMm2(od, table.wallMm), wallSource: table.source };
  }
  const wallMm = od / input.sdr;
  return { outsideDiameterMm: od, wallMm, fusionAreaMm2: fusionAreaMm2(od, wallMm), wallSource: { kind: 'od-over-sdr' } };
}

/** Wall in inches of a wall in mm (for US display of a computed wall), not rounded. */
export function wallIn(wallMm: number): number {
  return mmToIn(wallMm);
}
