"use client";
import { formatInstant, type InstantPrecision } from "./display-format";
import { useTimeZone } from "./time-zone";

/**
 * An instant as a `<time>` element: machine-readable `dateTime` (UTC), the local time in the
 * organisation's zone with its offset inside ("2026-03-08 01:30 −06:00"; a date alone for
 * precision "date").
 */
export function TimeDisplay({ at, precision = "minute" }: { at: Date | string | number; precision?: InstantPrecision }) {
  const timeZone = useTimeZone();
  const date = new Date(at);
  return <time dateTime={date.toISOString()}>{formatInstant(date, precision, timeZone)}</time>;
}
