// Field builders shared by the office screens' input schemas (Jobs, Equipment, Procedures,
// Qualifications): blank → undefined, numbers and dates with messages naming the field,
// and the units the person typed values in (si or us) → canonical SI.
import { z } from 'zod';
import { fromDisplay, type QuantityKind, type UnitSystem, UNIT_SYSTEMS } from '@/domain/units/format';
import { isIsoDate } from '@/domain/dates/civil';

export const blankToUndefined = (value: unknown) => (value === '' || value === null || (typeof value === 'string' && value.trim() === '') ? undefined : value);

/** A number as people write it: optional sign, digits with an optional decimal point (or comma), an optional exponent. No hex, binary, "Infinity" or thousands separators. */
const DECIMAL = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:e[+-]?\d+)?$/i;

/** Text → number, NaN unless it is a plain decimal number; 1e309 and 400 nines become Infinity (refused as not finite by every field below). */
export function parseDecimal(text: string): number {
  const t = text.trim().replace(',', '.');
  return DECIMAL.test(t) ? Number(t) : NaN;
}

/** Form text → number (blank → undefined, so "Enter …" can be told from "must be a number"). */
export const toNumberInput = (value: unknown) => {
  const v = blankToUndefined(value);
  return typeof v === 'string' ? parseDecimal(v) : v;
};

/**
 * The range of each kind of id column (MariaDB: INT UNSIGNED to 4,294,967,295; BIGINT UNSIGNED
 * to 2^64 − 1, of which a JavaScript number holds every whole number only up to 2^53 − 1).
 * `int`: people, crews, jobs, procedures and their versions, coils, machines, heater plates,
 * qualifications; `bigint`: joints, their revisions, attachments, audit and event rows.
 */
export const ID_MAX = { int: 4_294_967_295, bigint: Number.MAX_SAFE_INTEGER } as const;
export type IdColumn = keyof typeof ID_MAX;

/** An id written as text: plain digits only (no sign, fraction, exponent or hex); anything else is NaN. */
const toIdInput = (value: unknown) => {
  const v = blankToUndefined(value);
  if (typeof v !== 'string') return v;
  const t = v.trim();
  return /^\d{1,30}$/.test(t) ? Number(t) : NaN;
};

/** A record id in the column's range (a JSON number, or digits in a form or query string). */
export function idNumber(message: string, column: IdColumn = 'int') {
  const max = ID_MAX[column];
  return z
    .number({ error: message })
    .int({ error: message })
    .positive({ error: message })
    .max(max, { error: message });
}

/** The id in a text (a path segment or query parameter), or null when it is not one: digits only, 1 to the column's largest. */
export function parseId(text: unknown, column: IdColumn = 'int'): number | null {
  const n = toIdInput(text);
  return typeof n === 'number' && Number.isInteger(n) && n > 0 && n <= ID_MAX[column] ? n : null;
}

/** A required id from a form, query string or JSON; blank → "message" as if missing. */
export const requiredId = (message: string, column: IdColumn = 'int', invalid = message) =>
  z.preprocess(toIdInput, z.number({ error: (issue) => (issue.input === undefined ? message : invalid) }).pipe(idNumber(invalid, column)));

/** An optional id (blank → undefined). */
export const optionalId = (message: string, column: IdColumn = 'int') => z.preprocess(toIdInput, idNumber(message, column).optional());

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

export const idField = (label: string, column: IdColumn = 'int') => requiredId(`Choose ${label.toLowerCase()}.`, column);

export const optionalIdField = (label: string, column: IdColumn = 'int') => optionalId(`${label} is not valid.`, column);

export const versionField = requiredId('Record version is missing; reload the page.');

export const unitsField = z.enum(UNIT_SYSTEMS, { error: 'Say which units the values are in (SI or US customary).' });

export const toSi = (value: number | undefined, kind: QuantityKind, units: UnitSystem) => (value === undefined ? undefined : fromDisplay(value, kind, units));
