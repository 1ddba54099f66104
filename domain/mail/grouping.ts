// How a person's alerts are grouped into mail: each person chooses "immediate", "hourly" or
// "daily" (users.mail_grouping). A waiting alert opens a window; when the window closes, the
// alerts that fell into it go out as one mail. Immediate: the window is a short burst
// window from the first waiting alert, so 28 joints recorded in a rush make one mail, not
// 28. Hourly: the local clock hour in the organisation's time zone. Daily: the local day,
// turning at DEFAULT_DIGEST_HOUR (domain/mail/digest). Pure: the time zone and `now` are
// parameters, so every instance of the app makes the same groups.
import { addDays } from "@/domain/dates/civil";
import { formatZoned, isoDateIn, localHourOn } from "@/domain/dates/zone";
import { DEFAULT_DIGEST_HOUR, DIGEST_SECTIONS, latestDigestCutoff } from "@/domain/mail/digest";

export const MAIL_GROUPINGS = ["immediate", "hourly", "daily"] as const;
export type MailGrouping = (typeof MAIL_GROUPINGS)[number];

export function isMailGrouping(value: unknown): value is MailGrouping {
  return typeof value === "string" && (MAIL_GROUPINGS as readonly string[]).includes(value);
}

/**
 * Burst window of "immediate", s: alerts within this time of the first waiting one come as
 * one mail. common practice (no published source): a couple of minutes, long enough for a
 * crew's rush of records to land, short enough that an alert is still news.
 */
export const BURST_WINDOW_S = 120;

export type GroupingOptions = { timeZone: string; burstWindowS?: number; dailyHour?: number };

/** The words for each choice, as the Notifications screen offers them. */
export function mailGroupingLabel(grouping: MailGrouping, { timeZone, burstWindowS = BURST_WINDOW_S, dailyHour = DEFAULT_DIGEST_HOUR }: GroupingOptions): string {
  switch (grouping) {
    case "immediate":
      return `As they happen (alerts within ${burstWindowS >= 60 && burstWindowS % 60 === 0 ? `${burstWindowS / 60} min` : `${burstWindowS} s`} of each other come as one mail)`;
    case "hourly":
      return `One mail an hour, on the hour (${timeZone} time)`;
    case "daily":
      return `One mail a day, at ${String(dailyHour).padStart(2, "0")}:00 ${timeZone} time`;
  }
}

/** When the window opened by an alert at `opensAt` closes (the mail is made then). */
export function windowClosesAt(grouping: MailGrouping, opensAt: Date, { timeZone, burstWindowS = BURST_WINDOW_S, dailyHour = DEFAULT_DIGEST_HOUR }: GroupingOptions): Date {
  switch (grouping) {
    case "immediate":
      return new Date(opensAt.getTime() + burstWindowS * 1000);
    case "hourly": {
      // The next local full hour: offsets are whole or half hours, so the local minutes and
      // seconds say how far into the local hour the alert is (a daylight-saving change
      // keeps hours an hour long).
      const local = formatZoned(opensAt, timeZone, "second", false); // "YYYY-MM-DD HH:MM:SS"
      const into = Number(local.slice(14, 16)) * 60_000 + Number(local.slice(17, 19)) * 1000 + (opensAt.getTime() % 1000);
      return new Date(opensAt.getTime() - into + 3_600_000);
    }
    case "daily": {
      const cutoff = latestDigestCutoff(opensAt, dailyHour, timeZone);
      return localHourOn(addDays(isoDateIn(cutoff, timeZone), 1), dailyHour, timeZone);
    }
  }
}

export type MailGroup<T> = { closesAt: Date; items: T[] };

/**
 * A person's waiting alerts in their groups, oldest first: the first waiting alert opens a
 * window; every alert created before it closes is in that group; the next alert opens the
 * next. A group is due once `closesAt` ≤ now (see dueGroups).
 */
export function groupWaiting<T extends { createdAt: Date; id: number }>(waiting: readonly T[], grouping: MailGrouping, options: GroupingOptions): MailGroup<T>[] {
  const sorted = [...waiting].sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime() || a.id - b.id);
  const groups: MailGroup<T>[] = [];
  let i = 0;
  while (i < sorted.length) {
    const closesAt = windowClosesAt(grouping, sorted[i]!.createdAt, options);
    const items: T[] = [];
    while (i < sorted.length && sorted[i]!.createdAt.getTime() < closesAt.getTime()) items.push(sorted[i++]!);
    groups.push({ closesAt, items });
  }
  return groups;
}

/** The groups whose window has closed at `now`: each becomes one mail. */
export function dueGroups<T extends { createdAt: Date; id: number }>(waiting: readonly T[], grouping: MailGrouping, now: Date, options: GroupingOptions): MailGroup<T>[] {
  return groupWaiting(waiting, grouping, options).filter((g) => g.closesAt.getTime() <= now.getTime());
}

export type GroupedAlert = { kind: string; subject: string; bodyText: string; link: string | null; createdAt: Date };

const GROUP_WORDS: Record<MailGrouping, string> = {
  immediate: "These alerts came within a few minutes of each other, so they come together in one mail.",
  hourly: "You get one mail an hour because you chose hourly mail on the Notifications screen.",
  daily: "You get one mail a day because you chose daily mail on the Notifications screen.",
};

/**
 * The mail for one group. A group of one is that alert's own mail. More: a subject with
 * the count, the list of alerts, each with its link, then each alert's full text.
 * `at` formats an instant for the reader (organisation time zone).
 */
export function composeGroupMail(alerts: readonly GroupedAlert[], grouping: MailGrouping, at: (instant: Date) => string): { kind: string; subject: string; bodyText: string } {
  const sorted = [...alerts].sort((a, b) => a.createdAt.getTime() - b.createdAt.getTime());
  if (sorted.length === 1) return { kind: sorted[0]!.kind, subject: sorted[0]!.subject, bodyText: sorted[0]!.bodyText };
  const n = sorted.length;
  const first = at(sorted[0]!.createdAt);
  const lines = [`Beadline: ${n} alerts since ${first}.`, ""];
  sorted.forEach((a, i) => {
    lines.push(`${i + 1}. ${a.subject}`);
    if (a.link) lines.push(`   ${a.link}`);
  });
  lines.push("");
  sorted.forEach((a, i) => {
    lines.push("-".repeat(40), `${i + 1}. ${a.subject} (${at(a.createdAt)})`, "", a.bodyText.trim(), "");
  });
  lines.push(GROUP_WORDS[grouping]);
  const kinds = [...new Set(sorted.map((a) => a.kind))];
  const heading = kinds.length === 1 ? DIGEST_SECTIONS.find((s) => s.kind === kinds[0])?.heading : undefined;
  return { kind: "alert-summary", subject: heading ? `Beadline: ${n} alerts — ${heading.toLowerCase()}` : `Beadline: ${n} alerts`, bodyText: lines.join("\n") };
}

/** Words for an outbox mail's kind (the alert headings, plus the grouped mails). */
export function mailKindLabel(kind: string): string {
  if (kind === "daily-digest") return "Daily summary";
  if (kind === "alert-summary") return "Several alerts";
  return DIGEST_SECTIONS.find((s) => s.kind === kind)?.heading ?? kind;
}
