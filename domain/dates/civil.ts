// Civil-date arithmetic on ISO 'YYYY-MM-DD' strings (proleptic Gregorian, no time zone,
// no clock). Used by qualification status, the traceability code and the office records
// (jobs, heater checks). Which civil date an instant falls on in the organisation's time
// zone is domain/dates/zone's (isoDateIn); isoDateOf below is the UTC date.

import { DomainError } from '@/domain/errors';

export interface CivilDate {
  year: number;
  month: number;
  day: number;
}

/** Gregorian leap year: divisible by 4, except centuries not divisible by 400. */
export function isLeapYear(year: number): boolean {
  return (year % 4 === 0 && year % 100 !== 0) || year % 400 === 0;
}

/** Days in a month (1–12) of a year. */
export function daysInMonth(year: number, month: number): number {
  return [31, isLeapYear(year) ? 29 : 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31][month - 1] as number;
}

/** 'YYYY-MM-DD' from parts, zero-padded. */
export function formatIsoDate(year: number, month: number, day: number): string {
  return `${String(year).padStart(4, '0')}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
}

/** Parse 'YYYY-MM-DD'; throws DomainError naming the field for anything else or an impossible date. */
export function parseIsoDate(text: string, field = 'Date'): CivilDate {
  const match = typeof text === 'string' ? /^(\d{4})-(\d{2})-(\d{2})$/.exec(text) : null;
  if (!match) throw new DomainError('invalid-input', `${field} must be a date written YYYY-MM-DD (got "${String(text)}")`);
  const year = Number(match[1]);
  const month = Number(match[2]);
  const day = Number(match[3]);
  if (month < 1 || month > 12 || day < 1 || day > daysInMonth(year, month)) {
    throw new DomainError('invalid-input', `${field} ${text} is not a real date`);
  }
  return { year, month, day };
}

/**
 * Add calendar months, clamping to the last day of the target month
 * (2025-11-30 + 15 months → 2027-02-28; 2024-01-31 + 1 → 2024-02-29). Negative months subtract.
 */
export function addMonths(date: string, months: number): string {
  const { year, month, day } = parseIsoDate(date);
  const index = year * 12 + (month - 1) + months;
  const targetYear = Math.floor(index / 12);
  const targetMonth = (index % 12) + 1;
  return formatIsoDate(targetYear, targetMonth, Math.min(day, daysInMonth(targetYear, targetMonth)));
}

/** Whole days from `from` to `to` (positive when `to` is later). */
export function daysBetween(from: string, to: string): number {
  const a = parseIsoDate(from);
  const b = parseIsoDate(to);
  return Math.round((Date.UTC(b.year, b.month - 1, b.day) - Date.UTC(a.year, a.month - 1, a.day)) / 86_400_000);
}

/** The earlier of two ISO dates (ISO dates compare correctly as strings). */
export function earlierDate(a: string, b: string): string {
  return a <= b ? a : b;
}

/** ISO date of an instant in UTC (seeds and fixtures; people's days are isoDateIn in domain/dates/zone). */
export function isoDateOf(instant: Date): string {
  return instant.toISOString().slice(0, 10);
}

/** Add whole days to an ISO date. */
export function addDays(date: string, days: number): string {
  const [y, m, d] = date.split('-').map(Number) as [number, number, number];
  return new Date(Date.UTC(y, m - 1, d) + days * 86_400_000).toISOString().slice(0, 10);
}

/** True for a real calendar date written YYYY-MM-DD. */
export function isIsoDate(text: string): boolean {
  const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
  if (!match) return false;
  const [y, m, d] = [Number(match[1]), Number(match[2]), Number(match[3])];
  const date = new Date(Date.UTC(y, m - 1, d));
  return date.getUTCFullYear() === y && date.getUTCMonth() === m - 1 && date.getUTCDate() === d;
}

const MONTH_ABBREVIATIONS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sept', 'Oct', 'Nov', 'Dec'] as const;

/** An ISO date as day and abbreviated month, as CLDR's British English writes it ("2026-11-30" → "30 Nov", September "Sept"), for short lines on a phone. */
export function formatDayMonth(date: string): string {
  const { month, day } = parseIsoDate(date);
  return `${day} ${MONTH_ABBREVIATIONS[month - 1]}`;
}
