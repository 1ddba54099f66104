// Local time in the organisation's time zone: what an instant reads as on a wall clock
// there, which instants a local calendar day covers, and the text screens, mail and
// exports show ("2026-03-08 01:30 −06:00"). The zone rules are the IANA time zone
// database's, read through @date-fns/tz (which asks the runtime's Intl for them); no
// offset is computed here by hand. Pure: the zone is always a parameter, never the
// machine's own. Stored instants stay UTC.
import { TZDate } from '@date-fns/tz';
import { DomainError } from '@/domain/errors';
import { addDays, parseIsoDate } from '@/domain/dates/civil';

/** The zone used when none is set and the server's own is unknown. */
export const UTC_ZONE = 'UTC';

/** U+2212 MINUS SIGN, the sign ISO 8601-1:2019 (§3.2.4 note) prefers for a negative offset. */
const MINUS = '\u2212';

/**
 * True for a zone name the runtime's copy of the IANA database knows, written as an
 * Area/Location name ("America/Chicago", "Europe/Berlin", "Etc/GMT+6") or "UTC". Offsets
 * ("+02:00") and abbreviations ("CST", which some runtimes quietly map to one zone of
 * several that use it) are refused.
 */
export function isTimeZone(name: string): boolean {
  if (typeof name !== 'string' || !/^[A-Za-z][A-Za-z0-9_+\-]*(\/[A-Za-z0-9_+\-]+)+$|^UTC$/i.test(name)) return false;
  // Every instant shown on a page asks this of the same zone name; building an Intl formatter
  // each time cost more than the rest of the formatting. The answer for a name never changes
  // while the process runs, so it is kept (for a bounded number of names: they come from input too).
  const known = zoneNameAnswers.get(name);
  if (known !== undefined) return known;
  let answer: boolean;
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: name });
    answer = true;
  } catch {
    answer = false;
  }
  if (zoneNameAnswers.size >= ZONE_NAME_ANSWERS_MAX) zoneNameAnswers.clear();
  zoneNameAnswers.set(name, answer);
  return answer;
}

const ZONE_NAME_ANSWERS_MAX = 1000;
const zoneNameAnswers = new Map<string, boolean>();

/** The zone name as the runtime spells it canonically ("utc" → "UTC", "europe/berlin" → "Europe/Berlin"). */
export function canonicalTimeZone(name: string): string {
  if (!isTimeZone(name)) throw new DomainError('invalid-input', `Time zone "${name}" is not a time zone of the IANA time zone database.`);
  return new Intl.DateTimeFormat('en-US', { timeZone: name }).resolvedOptions().timeZone;
}


/**
 * The zone names to offer: the runtime's list (Intl.supportedValuesOf, the IANA database's
 * canonical names) with "UTC" first and `current` kept even if the list lacks it.
 */
export function timeZoneChoices(supported: readonly string[], current?: string): string[] {
  const names = new Set<string>([UTC_ZONE, ...supported]);
  if (current) names.add(current);
  return [UTC_ZONE, ...[...names].filter((n) => n !== UTC_ZONE).sort()];
}

/** The server's zone when it is a real one, else UTC (the fallback when nothing is set). */
export function defaultTimeZone(serverZone: string | undefined | null): string {
  return serverZone && isTimeZone(serverZone) ? canonicalTimeZone(serverZone) : UTC_ZONE;
}

function inZone(instant: Date | string | number, zone: string): TZDate {
  const ms = new Date(instant).getTime();
  if (!Number.isFinite(ms)) throw new DomainError('invalid-input', `Not an instant: ${String(instant)}`);
  if (!isTimeZone(zone)) throw new DomainError('invalid-input', `Time zone "${zone}" is not a time zone of the IANA time zone database.`);
  return new TZDate(ms, zone);
}

const pad = (n: number, width = 2) => String(Math.abs(n)).padStart(width, '0');

/** UTC offset of `zone` at `instant`, in minutes east of Greenwich (Chicago in winter: −360). */
export function offsetMinutes(instant: Date | string | number, zone: string): number {
  // TZDate.getTimezoneOffset follows Date's sign convention (minutes west), so negate it.
  const minutes = -inZone(instant, zone).getTimezoneOffset();
  return minutes === 0 ? 0 : minutes;
}

/** The offset as ISO 8601 writes it, "+01:00", "−05:00" (U+2212), "+00:00" for UTC. */
export function offsetText(instant: Date | string | number, zone: string): string {
  const minutes = offsetMinutes(instant, zone);
  return `${minutes < 0 ? MINUS : '+'}${pad(Math.trunc(minutes / 60))}:${pad(minutes % 60)}`;
}

/** The local calendar date of `instant` in `zone`, 'YYYY-MM-DD'. */
export function isoDateIn(instant: Date | string | number, zone: string): string {
  const d = inZone(instant, zone);
  return `${pad(d.getFullYear(), 4)}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
}

/** How much of an instant to show. */
export type ZonedPrecision = 'date' | 'minute' | 'second';

/**
 * `instant` as local time in `zone`: "2026-03-08" (date), "2026-03-08 01:30" (minute) or
 * "2026-03-08 01:30:05" (second), with " −06:00" after a time when `withOffset`
 * (ISO 8601-1:2019 §5.4.2 local time with its difference from UTC, a space for the "T").
 * Truncates, never rounds.
 */
export function formatZoned(instant: Date | string | number, zone: string, precision: ZonedPrecision = 'minute', withOffset = true): string {
  const d = inZone(instant, zone);
  const date = `${pad(d.getFullYear(), 4)}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}`;
  if (precision === 'date') return date;
  const time = `${pad(d.getHours())}:${pad(d.getMinutes())}${precision === 'second' ? `:${pad(d.getSeconds())}` : ''}`;
  if (!withOffset) return `${date} ${time}`;
  // The offset of the same zoned date (offsetText would convert the instant a second time).
  const minutes = -d.getTimezoneOffset() || 0;
  return `${date} ${time} ${minutes < 0 ? MINUS : '+'}${pad(Math.trunc(minutes / 60))}:${pad(minutes % 60)}`;
}

/** `instant` in UTC, "2026-03-08 07:30:05" (the UTC column of exports), ISO 8601 with a space. */
export function formatUtcInstant(instant: Date | string | number, precision: ZonedPrecision = 'second'): string {
  const iso = new Date(instant).toISOString();
  if (precision === 'date') return iso.slice(0, 10);
  return `${iso.slice(0, 10)} ${iso.slice(11, precision === 'minute' ? 16 : 19)}`;
}

/**
 * The first instant of local day `day` ('YYYY-MM-DD') in `zone` and the first instant of
 * the next local day: the day is [start, nextStart). A day with a daylight-saving change
 * is 23 or 25 hours long; a day whose midnight is skipped starts at the first local time
 * that exists. Throws DomainError for a malformed day or an unknown zone.
 */
export function localDayRange(day: string, zone: string): { start: Date; nextStart: Date } {
  const { year, month, day: dom } = parseIsoDate(day, 'Day');
  if (!isTimeZone(zone)) throw new DomainError('invalid-input', `Time zone "${zone}" is not a time zone of the IANA time zone database.`);
  // TZDate built from wall-clock parts resolves them in the zone (a skipped midnight moves forward).
  const start = new TZDate(year, month - 1, dom, zone);
  const next = new TZDate(year, month - 1, dom + 1, zone);
  return { start: new Date(start.getTime()), nextStart: new Date(next.getTime()) };
}

/**
 * The instant the wall clock in `zone` reads `hour`:00 on local day `day` (a time skipped by
 * a daylight-saving change moves forward to the first time that exists).
 */
export function localHourOn(day: string, hour: number, zone: string): Date {
  const { year, month, day: dom } = parseIsoDate(day, 'Day');
  if (!isTimeZone(zone)) throw new DomainError('invalid-input', `Time zone "${zone}" is not a time zone of the IANA time zone database.`);
  return new Date(new TZDate(year, month - 1, dom, hour, 0, 0, zone).getTime());
}

/**
 * The local weeks (ISO 8601: Monday first) that cover [from, to) in `zone`: each week's
 * Monday as 'YYYY-MM-DD' and the instant its local midnight falls on, oldest first.
 */
export function localWeeks(from: Date, to: Date, zone: string): { weekStart: string; start: Date }[] {
  const first = isoDateIn(from, zone);
  const { year, month, day } = parseIsoDate(first, 'Day');
  // Day of the week of a civil date (0 = Sunday), from the proleptic Gregorian calendar.
  const dow = new Date(Date.UTC(year, month - 1, day)).getUTCDay();
  let monday = addDays(first, -((dow + 6) % 7));
  const weeks: { weekStart: string; start: Date }[] = [];
  for (let start = localDayRange(monday, zone).start; start.getTime() < to.getTime() && weeks.length < 1000; start = localDayRange(monday, zone).start) {
    weeks.push({ weekStart: monday, start });
    monday = addDays(monday, 7);
  }
  return weeks;
}

/** Length of local day `day` in `zone`, in hours (24, or 23/25 on a daylight-saving change). */
export function localDayHours(day: string, zone: string): number {
  const { start, nextStart } = localDayRange(day, zone);
  return (nextStart.getTime() - start.getTime()) / 3_600_000;
}

/** The zone's name for people: "America/Chicago" → "America/Chicago"; used in headers and labels. */
export function zoneLabel(zone: string): string {
  return zone.replace(/_/g, ' ');
}

/**
 * The header of a local-time column: "Made at (America/Chicago)". In an organisation on UTC
 * it would read like the UTC instant column beside it, so it says "(local, UTC)".
 */
export function localTimeHeader(title: string, timeZone: string): string {
  return timeZone === 'UTC' ? `${title} (local, UTC)` : `${title} (${timeZone})`;
}
