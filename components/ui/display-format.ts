// The one place an instant (and a count) becomes text on a screen, a label or in a mail.
// Instants are shown in UTC as ISO 8601 calendar dates and times (ISO 8601-1:2019 §5.2.2,
// §5.3) with a space for the "T"; a later issue shows them in the organisation's time zone,
// and changes only this file.

/** How much of the instant to show. */
export type InstantPrecision = "date" | "minute" | "second";

/**
 * `at` as "2026-03-01" (date), "2026-03-01 10:12" (minute) or "2026-03-01 10:12:05"
 * (second), in UTC; `withZone` adds " UTC". Truncates, never rounds.
 */
export function formatInstant(at: Date | string | number, precision: InstantPrecision = "minute", withZone = false): string {
  const iso = new Date(at).toISOString();
  const text = precision === "date" ? iso.slice(0, 10) : `${iso.slice(0, 10)} ${iso.slice(11, precision === "minute" ? 16 : 19)}`;
  return withZone && precision !== "date" ? `${text} UTC` : text;
}

/** The browser's own local date and time, as the device-side screens show them today. */
export function formatDeviceInstant(at: Date | string | number): string {
  return new Date(at).toLocaleString();
}

/** A count with thousands separators ("1,234,567"). */
export function formatCount(n: number): string {
  return n.toLocaleString("en-US");
}
