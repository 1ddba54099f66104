// Helpers for building the built-in tables (not part of the public names).

import { inToMm } from '@/domain/units/conversions';
import type { SizeBand } from '@/domain/procedures/types';

export const inBand = (upToIn: number, upperInclusive: boolean, fromValue: number, toValue = fromValue): SizeBand => ({
  upToMm: inToMm(upToIn),
  upperInclusive,
  from: fromValue,
  to: toValue,
});

export const mmBand = (upToMm: number, fromValue: number, toValue = fromValue): SizeBand => ({
  upToMm,
  upperInclusive: true,
  from: fromValue,
  to: toValue,
});

/** A deep copy, so callers can never change the built-in tables. */
export function clone<T>(value: T): T {
  return JSON.parse(JSON.stringify(value)) as T;
}
