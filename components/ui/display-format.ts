// The one place an instant (and a count) becomes text on a screen, a label or in a mail.
// Instants are shown as local time in the organisation's time zone with the offset from
// UTC (ISO 8601-1:2019 §5.4.2, a space for the "T"): "2026-03-08 01:30 −06:00"; dates
// alone are the local calendar date. The zone rules are domain/dates/zone's.
import { formatZoned, type ZonedPrecision } from "@/domain/dates/zone";

/** How much of the instant to show. */
export type InstantPrecision = ZonedPrecision;

/**
 * `at` in `timeZone` as "2026-03-01" (date), "2026-03-01 10:12 −06:00" (minute) or
 * "2026-03-01 10:12:05 −06:00" (second). Truncates, never rounds.
 */
export function formatInstant(at: Date | string | number, precision: InstantPrecision, timeZone: string): string {
  return formatZoned(at, timeZone, precision, true);
}

/** A count with thousands separators ("1,234,567"). */
export function formatCount(n: number): string {
  return n.toLocaleString("en-US");
}
