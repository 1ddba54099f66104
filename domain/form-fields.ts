// Field builders shared by the office screens' input schemas (Jobs, Equipment, Procedures,
// Qualifications): blank → undefined, numbers and dates with messages naming the field,
// and the units the person typed values in (si or us) → canonical SI.
import { z } from 'zod';
import { fromDisplay, type QuantityKind, type UnitSystem, UNIT_SYSTEMS } from '@/domain/units/format';
import { isIsoDate } from '@/domain/dates/civil';

export const blankToUndefined = (value: unknown) => (value === '' || value === null || (typeof value === 'string' && value.trim() === '') ? undefined : value);

/** Form text → number (blank → undefined, so "Enter …" can be told from "must be a number"). */
export const toNumberInput = (value: unknown) => {
  const v = blankToUndefined(value);
  return typeof v === 'string' ? Number(v.trim().replace(',', '.')) : v;
};

/** A number typed in a form (string or number); blank → undefined when optional. */
export function numberField(label: string, opts: { min?: number; max?: number; positive?: boolean; integer?: boolean } = {}) {
  let n = z
    .number({ error: (issue) => (issue.input === undefined ? `Enter ${label.toLowerCase()}.` : `${label} must be a number.`) })
    .refine(Number.isFinite, { error: `${label} must be a number.` });
  if (opts.integer) n = n.refine(Number.isInteger, { error: `${label} must be a whole number.` });
  if (opts.positive) n = n.refine((v) => v > 0, { error: `${label} must be more than 0.` });
  if (opts.min !== undefined) {
    const min = opts.min;
    n = n.refine((v) => v >= min, { error: `${label} must be ${min} or more.` });
  }
  if (opts.max !== undefined) {
    const max = opts.max;
    n = n.refine((v) => v <= max, { error: `${label} must be ${max} or less.` });
  }
  return n;
}

export function requiredNumber(label: string, opts: Parameters<typeof numberField>[1] = {}) {
  return z.preprocess(toNumberInput, numberField(label, opts));
}

export function optionalNumber(label: string, opts: Parameters<typeof numberField>[1] = {}) {
  return z.preprocess(toNumberInput, numberField(label, opts).optional());
}

export function requiredText(label: string, min: number, max: number) {
  return z
    .string({ error: `Enter ${label.toLowerCase()}.` })
    .trim()
    .min(1, { error: `Enter ${label.toLowerCase()}.`, abort: true })
    .min(min, { error: `${label} must be at least ${min} characters.` })
    .max(max, { error: `${label} must be at most ${max} characters.` });
}

export function optionalText(label: string, max: number) {
  return z.preprocess(
    blankToUndefined,
    z.string({ error: `${label} must be text.` }).trim().max(max, { error: `${label} must be at most ${max} characters.` }).optional(),
  );
}

export function requiredDate(label: string) {
  return z
    .string({ error: `Enter ${label.toLowerCase()}.` })
    .trim()
    .min(1, { error: `Enter ${label.toLowerCase()}.` })
    .refine(isIsoDate, { error: `${label} must be a real date (YYYY-MM-DD).` });
}

export function optionalDate(label: string) {
  return z.preprocess(blankToUndefined, z.string().trim().refine(isIsoDate, { error: `${label} must be a real date (YYYY-MM-DD).` }).optional());
}

export const idField = (label: string) =>
  z.preprocess(blankToUndefined, z.coerce.number({ error: `Choose ${label.toLowerCase()}.` }).int({ error: `Choose ${label.toLowerCase()}.` }).positive({ error: `Choose ${label.toLowerCase()}.` }));

export const optionalIdField = (label: string) =>
  z.preprocess(blankToUndefined, z.coerce.number({ error: `${label} is not valid.` }).int().positive({ error: `${label} is not valid.` }).optional());

export const versionField = z.coerce.number({ error: 'Record version is missing; reload the page.' }).int().positive({ error: 'Record version is missing; reload the page.' });

export const unitsField = z.enum(UNIT_SYSTEMS, { error: 'Say which units the values are in (SI or US customary).' });

export const toSi = (value: number | undefined, kind: QuantityKind, units: UnitSystem) => (value === undefined ? undefined : fromDisplay(value, kind, units));
