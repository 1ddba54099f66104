// The words that tell a person how old the data on a screen is: "Data from 09:42 UTC, 3 h
// ago; no signal". Times are shown as every screen shows them (components/ui/display-format).
import { formatInstant } from "@/components/ui/display-format";

/** "just now" under a minute, then whole minutes, whole hours under two days, whole days (truncated). */
export function describeAge(ageMs: number): string {
  const minutes = Math.floor(Math.max(0, ageMs) / 60_000);
  if (minutes < 1) return "just now";
  if (minutes < 60) return `${minutes} min ago`;
  const hours = Math.floor(minutes / 60);
  if (hours < 48) return `${hours} h ago`;
  return `${Math.floor(hours / 24)} days ago`;
}

/**
 * The freshness line. `loadedAt` is when the server read the data (ISO instant), `now` the
 * device's clock in ms (null before the page is on the device: no age shown), `online` what
 * the browser says of the connection. The time alone on the same UTC day, else with its date.
 */
export function describeFreshness({ loadedAt, now, online }: { loadedAt: string; now: number | null; online: boolean }): string {
  const at = new Date(loadedAt);
  const sameDay = now !== null && new Date(now).toISOString().slice(0, 10) === at.toISOString().slice(0, 10);
  const when = now === null || sameDay ? `${formatInstant(at, "minute").slice(11)} UTC` : formatInstant(at, "minute", true);
  const age = now === null ? "" : `, ${describeAge(now - at.getTime())}`;
  return `Data from ${when}${age}${online ? "" : "; no signal"}`;
}
