// Daily digest: people who chose one mail a day get their waiting events folded into one
// message per day. The day turns at a fixed local hour in the organisation's time zone
// (passed in), so every instance of the app agrees on which day an event belongs to
// without any shared clock state.
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

export type DigestEvent = { kind: string; subject: string; bodyText: string; createdAt: Date };

/** Plain-language heading per alert kind, in the order the digest lists them. */
export const DIGEST_SECTIONS: readonly { kind: string; heading: string }[] = [
  { kind: "joint-out-of-limits", heading: "Joints out of limits" },
  { kind: "joint-cut-out", heading: "Joints cut out, to be remade" },
  { kind: "qualification-lapsing", heading: "Qualifications lapsing within 30 days" },
  { kind: "qualification-lapsed", heading: "Qualifications lapsed" },
  { kind: "heater-check-overdue", heading: "Heater plate checks overdue" },
];

/**
 * One digest mail from a person's waiting events: subject with the count and the day,
 * body grouped by kind (known kinds first, in DIGEST_SECTIONS order, then others by name),
 * events in time order within a group. `day` is the cut-off date shown (YYYY-MM-DD).
 */
export function composeDigest(events: readonly DigestEvent[], day: string): { subject: string; bodyText: string } {
  const groups = new Map<string, DigestEvent[]>();
  for (const event of [...events].sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime())) {
    const list = groups.get(event.kind) ?? [];
    list.push(event);
    groups.set(event.kind, list);
  }
  const known = DIGEST_SECTIONS.map((s) => s.kind);
  const kinds = [...known.filter((k) => groups.has(k)), ...[...groups.keys()].filter((k) => !known.includes(k)).sort()];
  const lines: string[] = [`Beadline daily summary for ${day}: ${events.length} ${events.length === 1 ? "event" : "events"}.`, ""];
  for (const kind of kinds) {
    const list = groups.get(kind) as DigestEvent[];
    const heading = DIGEST_SECTIONS.find((s) => s.kind === kind)?.heading ?? kind;
    lines.push(`${heading} (${list.length})`, "-".repeat(heading.length + String(list.length).length + 3));
    for (const event of list) {
      lines.push(`* ${event.subject}`);
      for (const bodyLine of event.bodyText.trim().split("\n")) lines.push(`  ${bodyLine}`);
      lines.push("");
    }
  }
  lines.push("You get one summary a day because daily digest is on for your account.");
  return { subject: `Beadline daily summary ${day}: ${events.length} ${events.length === 1 ? "event" : "events"}`, bodyText: lines.join("\n") };
}

/** Words for an outbox mail's kind (the digest headings, plus the digest itself). */
export function mailKindLabel(kind: string): string {
  if (kind === "daily-digest") return "Daily summary";
  return DIGEST_SECTIONS.find((s) => s.kind === kind)?.heading ?? kind;
}
