// Minimum long-term (cold) bend radius of PE pipe, R = α × OD, with α by DR.
// Source: PPI Handbook of PE Pipe minimum-bend-ratio table, as reproduced in two pipe
// suppliers' pages (CONFIRMED-2nd).

import { DomainError } from '@/domain/errors';
import { assertPipeInput } from '@/domain/pipe/geometry';

/**
 * Bend ratio bands: a DR up to and including `maxSdr` uses `ratio`. The published rows
 * (DR 7, 7.3, 9 → 20; 11, 13.5, 15 → 25; 17, 21 → 27; 26 → 34; 32.5 → 42; 41 → 52) are
 * taken as bands so that an in-between DR (e.g. 9.33) gets the next, larger ratio —
 * our choice, on the safe side. DR below 7 uses the DR 7 ratio.
 */
export const BEND_RATIO_BANDS: readonly { maxSdr: number; ratio: number }[] = [
  { maxSdr: 9, ratio: 20 },
  { maxSdr: 15, ratio: 25 },
  { maxSdr: 21, ratio: 27 },
  { maxSdr: 26, ratio: 34 },
  { maxSdr: 32.5, ratio: 42 },
  { maxSdr: 41, ratio: 52 },
];

/** Ratio when a fitting or flange is in the bend (same table). */
export const FITTING_IN_BEND_RATIO = 100;

/** Bend ratio α (R / OD) for a DR; throws DomainError for DR ≤ 2 or DR > 41 (not in the table). */
export function bendRatio(sdr: number, fittingInBend = false): number {
  if (!Number.isFinite(sdr) || sdr <= 2) throw new DomainError('invalid-input', `SDR must be more than 2 (got ${sdr})`);
  if (fittingInBend) return FITTING_IN_BEND_RATIO;
  const band = BEND_RATIO_BANDS.find((entry) => sdr <= entry.maxSdr);
  if (!band) throw new DomainError('outside-table', `The bend-ratio table ends at DR 41 (got DR ${sdr})`);
  return band.ratio;
}

/**
 * Minimum cold-bend radius in mm = α × OD (mm), not rounded. `fittingInBend` uses α = 100.
 * Throws DomainError for OD ≤ 0, SDR ≤ 2 or DR beyond the table.
 */
export function minimumBendRadiusMm(input: { outsideDiameterMm: number; sdr: number; fittingInBend?: boolean }): number {
  assertPipeInput(input.outsideDiameterMm, input.sdr);
  return bendRatio(input.sdr, input.fittingInBend ?? false) * input.outsideDiameterMm;
}
