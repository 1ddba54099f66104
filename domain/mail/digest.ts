// The mail day: people who chose daily mail (domain/mail/grouping) get their waiting alerts
// folded into one message per day. The day turns at a fixed local hour in the
// organisation's time zone (passed in), so every instance of the app agrees on which day an
// alert belongs to without any shared clock state. Also the headings of the alert kinds.
import { addDays } from '@/domain/dates/civil';
import { isoDateIn, localHourOn, UTC_ZONE } from '@/domain/dates/zone';

/** Local hour at which each day's digest is made. common practice (no published source): early morning. */
export const DEFAULT_DIGEST_HOUR = 6;

/**
 * The most recent digest cut-off at or before `now`: today at `hour`:00 local time in
 * `timeZone` when that has passed, else yesterday's. Events created before the cut-off
 * belong in its digest (wall-clock time: 06:00 stays 06:00 across daylight-saving changes).
 */
export function latestDigestCutoff(now: Date, hour = DEFAULT_DIGEST_HOUR, timeZone = UTC_ZONE): Date {
  const today = isoDateIn(now, timeZone);
  const at = (day: string) => localHourOn(day, hour, timeZone);
  const cutoff = at(today);
  return cutoff.getTime() > now.getTime() ? at(addDays(today, -1)) : cutoff;
}

/** Plain-language heading per alert kind, in the order the digest lists them. */
export const DIGEST_SECTIONS: readonly { kind: string; heading: string }[] = [
  { kind: "joint-out-of-limits", heading: "Joints out of limits" },
  { kind: "joint-cut-out", heading: "Joints cut out, to be remade" },
  { kind: "qualification-lapsing", heading: "Qualifications lapsing within 30 days" },
  { kind: "qualification-lapsed", heading: "Qualifications lapsed" },
  { kind: "heater-check-overdue", heading: "Heater plate checks overdue" },
];
