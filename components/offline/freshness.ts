// The words that tell a person how old the data on a screen is: "Data from 09:42 UTC, 3 h
// ago; no signal". Times in the organisation's time zone, as every screen shows them.
import { formatZoned } from "@/domain/dates/zone";

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
 * the browser says of the connection. The time alone on the same local day, else with its date.
 */
export function describeFreshness({ loadedAt, now, online, timeZone = "UTC" }: { loadedAt: string; now: number | null; online: boolean; timeZone?: string }): string {
  const at = new Date(loadedAt);
  // "UTC" in an organisation on UTC, else the offset ("−06:00") of the organisation's zone.
  const suffix = timeZone === "UTC" ? "UTC" : formatZoned(at, timeZone).split(" ")[2];
  const localDate = (instant: number | Date) => formatZoned(instant, timeZone, "date");
  const sameDay = now !== null && localDate(now) === localDate(at);
  const local = formatZoned(at, timeZone, "minute", false);
  const when = now === null || sameDay ? `${local.slice(11)} ${suffix}` : `${local} ${suffix}`;
  const age = now === null ? "" : `, ${describeAge(now - at.getTime())}`;
  return `Data from ${when}${age}${online ? "" : "; no signal"}`;
}
