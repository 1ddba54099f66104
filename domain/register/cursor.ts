// Keyset (seek) cursors of the Register: the sort-key values of the last row of a page and
// its joint id. The next page starts strictly after that row, so rows are never skipped or
// repeated even when many joints share a sort value (ties are broken by id), and a deep
// page costs the same as the first. The cursor names its sort, so a cursor from another
// sort is refused instead of silently seeking in the wrong order.
import type { RegisterSort, SortDirection } from '@/domain/register/filter';

/** One sort-key value: numbers (dates as epoch milliseconds) or null for an empty value. */
export type KeyValue = number | null;

export interface RegisterCursor {
  sort: RegisterSort;
  dir: SortDirection;
  /** Values of the sort keys in order (see SORT_KEY_COUNT), then nothing else. */
  keys: KeyValue[];
  /** Joint id of the last row (the tie-breaker). */
  id: number;
}

/** How many key values each sort has before the id. */
export const SORT_KEY_COUNT: Record<RegisterSort, number> = {
  madeAt: 1,
  number: 2,
  pipeSize: 2,
  heaterTemperature: 1,
};

function toBase64Url(text: string): string {
  const bytes = new TextEncoder().encode(text);
  let binary = '';
  for (const b of bytes) binary += String.fromCharCode(b);
  return btoa(binary).replace(/\+/g, '-').replace(/\//g, '_').replace(/=+$/, '');
}

function fromBase64Url(text: string): string {
  const padded = text.replace(/-/g, '+').replace(/_/g, '/') + '='.repeat((4 - (text.length % 4)) % 4);
  const binary = atob(padded);
  const bytes = Uint8Array.from(binary, (c) => c.charCodeAt(0));
  return new TextDecoder().decode(bytes);
}

/** Opaque text for the `after` query parameter. */
export function encodeCursor(cursor: RegisterCursor): string {
  return toBase64Url(JSON.stringify([cursor.sort, cursor.dir, cursor.keys, cursor.id]));
}

export type DecodeCursorResult = { ok: true; cursor: RegisterCursor } | { ok: false; message: string };

/**
 * Reads an `after` parameter back. Refuses text that is not a cursor, and a cursor made
 * for another sort or direction than the one asked for (plain message for the `after` field).
 */
export function decodeCursor(text: string, expected: { sort: RegisterSort; dir: SortDirection }): DecodeCursorResult {
  const invalid = { ok: false as const, message: 'The page cursor is not valid; start again from the first page.' };
  if (!/^[A-Za-z0-9_-]{1,400}$/.test(text)) return invalid;
  let parsed: unknown;
  try {
    parsed = JSON.parse(fromBase64Url(text));
  } catch {
    return invalid;
  }
  if (!Array.isArray(parsed) || parsed.length !== 4) return invalid;
  const [sort, dir, keys, id] = parsed as [unknown, unknown, unknown, unknown];
  if (sort !== expected.sort || dir !== expected.dir) {
    return { ok: false, message: 'The page cursor belongs to another sort order; start again from the first page.' };
  }
  if (!Array.isArray(keys) || keys.length !== SORT_KEY_COUNT[expected.sort]) return invalid;
  if (!keys.every((k) => k === null || (typeof k === 'number' && Number.isFinite(k)))) return invalid;
  if (typeof id !== 'number' || !Number.isSafeInteger(id) || id < 1) return invalid;
  return { ok: true, cursor: { sort: expected.sort, dir: expected.dir, keys: keys as KeyValue[], id } };
}

/** The row values a cursor is made from, per sort (madeAt as epoch ms). */
export interface SortKeySource {
  id: number;
  madeAt: Date;
  jobId: number;
  jointNo: number;
  outsideDiameterMm: number;
  sdr: number;
  heaterTemperatureC: number | null;
}

/** Cursor pointing just after `row` in the given order. */
export function cursorAfter(row: SortKeySource, sort: RegisterSort, dir: SortDirection): RegisterCursor {
  const keys: KeyValue[] =
    sort === 'madeAt'
      ? [row.madeAt.getTime()]
      : sort === 'number'
        ? [row.jobId, row.jointNo]
        : sort === 'pipeSize'
          ? [row.outsideDiameterMm, row.sdr]
          : [row.heaterTemperatureC];
  return { sort, dir, keys, id: row.id };
}
