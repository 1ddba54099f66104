// The Register's filter and sort, read from URL query parameters (so a view can be
// bookmarked and shared) by the page, the JSON API and the export alike. Plain-language
// messages name the field. Dates are whole local days in the organisation's time zone,
// inclusive at both ends (domain/dates/zone).
import { z } from 'zod';
import { localDayRange } from '@/domain/dates/zone';
import { optionalId } from '@/domain/form-fields';
import { JOINT_PARAMETERS } from '@/domain/fusion/parameters';
import { JOINT_OUTCOMES as REGISTER_OUTCOMES } from '@/domain/joints/outcomes';
import { REVIEW_STATES } from '@/domain/joints/review-states';

// The words the Register shows and filters by are the joints' and the checks' own.
export { JOINT_OUTCOMES as REGISTER_OUTCOMES, OUTCOME_LABELS, type JointOutcome as RegisterOutcome } from '@/domain/joints/outcomes';
export { REVIEW_STATES, REVIEW_STATE_LABELS, type ReviewState } from '@/domain/joints/review-states';
export { FINDING_PARAMETER_LABELS } from '@/domain/fusion/parameters';

/**
 * Sort keys of the Register. Each is backed by an index, so a page costs the same at the
 * start and a million rows in (see the register migration). Ties are broken by joint id.
 */
export const REGISTER_SORTS = ['madeAt', 'number', 'pipeSize', 'heaterTemperature'] as const;
export type RegisterSort = (typeof REGISTER_SORTS)[number];
export type SortDirection = 'asc' | 'desc';

export const REGISTER_SORT_LABELS: Record<RegisterSort, string> = {
  madeAt: 'Date made',
  number: 'Job and joint number',
  pipeSize: 'Pipe size',
  heaterTemperature: 'Heater temperature',
};

/** Rows per page the API serves at most; the grid asks for 100. */
export const MAX_PAGE_SIZE = 500;
export const DEFAULT_PAGE_SIZE = 100;

/** An empty query parameter (an unset select or a cleared box) means "no filter". */
const blankToUndefined = (value: unknown) => (typeof value === 'string' && value.trim() === '' ? undefined : value);

const idParam = (what: string) => optionalId(`The ${what} must be chosen from the list (a number id).`);

const dayParam = (what: string) =>
  z.preprocess(
    blankToUndefined,
    z
      .string()
      .regex(/^\d{4}-\d{2}-\d{2}$/, { error: `The ${what} must be a date written as YYYY-MM-DD.` })
      .refine((v) => isRealDay(v), { error: `The ${what} is not a real calendar date.` })
      .optional(),
  );

const textParam = (what: string, max: number) =>
  z.preprocess(
    blankToUndefined,
    z
      .string({ error: `The ${what} must be text.` })
      .trim()
      .max(max, { error: `The ${what} is too long (${max} characters at most).` })
      .optional(),
  );

function isRealDay(value: string): boolean {
  const [y, m, d] = value.split('-').map(Number);
  const date = new Date(Date.UTC(y, m - 1, d));
  return date.getUTCFullYear() === y && date.getUTCMonth() === m - 1 && date.getUTCDate() === d;
}

const filterShape = {
  job: idParam('job'),
  from: dayParam('first day'),
  to: dayParam('last day'),
  fuser: idParam('fuser'),
  machine: idParam('fusion machine'),
  lot: textParam('lot', 40),
  outcome: z.preprocess(blankToUndefined, z.enum(REGISTER_OUTCOMES, { error: 'The outcome must be within limits or out of limits.' }).optional()),
  review: z.preprocess(blankToUndefined, z.enum(REVIEW_STATES, { error: 'The review state must be pending review, accepted or cut out.' }).optional()),
  finding: z.preprocess(blankToUndefined, z.enum(JOINT_PARAMETERS, { error: 'The finding must be one of the checked parameters.' }).optional()),
  q: textParam('search', 300),
};

function checkDayOrder(value: { from?: string; to?: string }, ctx: z.RefinementCtx): void {
  if (value.from && value.to && value.from > value.to) {
    ctx.addIssue({ code: 'custom', path: ['to'], message: 'The last day must be on or after the first day.' });
  }
}

/** The filter alone (export and count). */
export const registerFilterSchema = z.object(filterShape).superRefine(checkDayOrder);
export type RegisterFilter = z.output<typeof registerFilterSchema>;

const sortShape = {
  sort: z.preprocess(blankToUndefined, z.enum(REGISTER_SORTS, { error: 'The sort must be date made, number, pipe size or heater temperature.' }).default('madeAt')),
  dir: z.preprocess(blankToUndefined, z.enum(['asc', 'desc'], { error: 'The sort direction must be asc or desc.' }).default('desc')),
};

/** Filter and sort (what the URL of a Register view holds). */
export const registerViewSchema = z.object({ ...filterShape, ...sortShape }).superRefine(checkDayOrder);
export type RegisterView = z.output<typeof registerViewSchema>;

/** One page of the Register: the view plus the keyset cursor and page size. */
export const registerPageQuerySchema = z
  .object({
    ...filterShape,
    ...sortShape,
    after: z.preprocess(blankToUndefined, z.string().max(400, { error: 'The page cursor is too long.' }).optional()),
    limit: z.preprocess(
      blankToUndefined,
      z.coerce
        .number({ error: `The page size must be a number from 1 to ${MAX_PAGE_SIZE}.` })
        .int({ error: `The page size must be a number from 1 to ${MAX_PAGE_SIZE}.` })
        .min(1, { error: `The page size must be a number from 1 to ${MAX_PAGE_SIZE}.` })
        .max(MAX_PAGE_SIZE, { error: `The page size must be a number from 1 to ${MAX_PAGE_SIZE}.` })
        .default(DEFAULT_PAGE_SIZE),
    ),
    /** "1" asks for the count (exact, or "about" while it is taken) with the page; "only" for the count without rows. */
    count: z.preprocess(blankToUndefined, z.enum(['0', '1', 'only'], { error: 'count must be 0, 1 or only.' }).optional()),
  })
  .superRefine(checkDayOrder);
export type RegisterPageQuery = z.output<typeof registerPageQuerySchema>;

export const EXPORT_FORMATS = ['xlsx', 'csv'] as const;
export type ExportFormat = (typeof EXPORT_FORMATS)[number];

/** GET /api/v1/exports/register: the view's filter and sort plus the file format. */
export const registerExportQuerySchema = z
  .object({
    ...filterShape,
    ...sortShape,
    format: z.preprocess(blankToUndefined, z.enum(EXPORT_FORMATS, { error: 'The export format must be xlsx or csv.' }).default('xlsx')),
  })
  .superRefine(checkDayOrder);
export type RegisterExportQuery = z.output<typeof registerExportQuerySchema>;

export const FILTER_KEYS = Object.keys(filterShape) as (keyof RegisterFilter)[];

/** Only the filter fields of a parsed view or query (drops sort, cursor, format …). */
export function pickFilter(value: RegisterFilter & Record<string, unknown>): RegisterFilter {
  const out: RegisterFilter = {};
  for (const key of FILTER_KEYS) {
    if (value[key] !== undefined) (out as Record<string, unknown>)[key] = value[key];
  }
  return out;
}

/** True when no filter field is set (the whole register). */
export function isEmptyFilter(filter: RegisterFilter): boolean {
  return FILTER_KEYS.every((k) => filter[k] === undefined);
}

/**
 * The URL query string of a view (filter + sort), leaving out defaults and blanks, in a
 * fixed key order so equal views give equal URLs. The inverse of registerViewSchema.
 */
export function viewToSearchParams(view: Partial<RegisterView>): URLSearchParams {
  const params = new URLSearchParams();
  for (const key of FILTER_KEYS) {
    const value = view[key];
    if (value !== undefined && value !== null && String(value) !== '') params.set(key, String(value));
  }
  if (view.sort && view.sort !== 'madeAt') params.set('sort', view.sort);
  if (view.dir && view.dir !== 'desc') params.set('dir', view.dir);
  return params;
}

/**
 * First instant of local day `day` in `timeZone` and the first instant of the next local
 * day (for from/to). A day with a daylight-saving change is 23 or 25 hours long.
 */
export function dayBounds(day: string, timeZone: string): { start: Date; nextStart: Date } {
  return localDayRange(day, timeZone);
}

/** The instants a filter's from/to days cover in `timeZone`: [start, nextStart), either end open. */
export function registerDayBounds(filter: Pick<RegisterFilter, 'from' | 'to'>, timeZone: string): { start?: Date; nextStart?: Date } {
  return {
    ...(filter.from ? { start: dayBounds(filter.from, timeZone).start } : {}),
    ...(filter.to ? { nextStart: dayBounds(filter.to, timeZone).nextStart } : {}),
  };
}
