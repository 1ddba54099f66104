// Local days and local times in the organisation's zone (domain/dates/zone.ts).
// Every expected instant below is worked out by hand from the published offsets and
// daylight-saving dates of the IANA time zone database (tzdata "northamerica" and "europe"
// files), not from the code:
// - America/Chicago: CST is UTC−6, CDT is UTC−5. US rule (Energy Policy Act of 2005,
//   15 U.S.C. 260a): DST starts the second Sunday of March at 02:00 local (2026-03-08:
//   02:00 CST → 03:00 CDT) and ends the first Sunday of November at 02:00 local
//   (2026-11-01: 02:00 CDT → 01:00 CST).
// - Europe/Berlin: CET is UTC+1, CEST is UTC+2. EU rule (Directive 2000/84/EC, arts. 2–3):
//   summer time starts the last Sunday of March at 01:00 UTC (2026-03-29) and ends the last
//   Sunday of October at 01:00 UTC (2026-10-25).
// - America/Havana: Cuba's rule in tzdata: DST starts the second Sunday of March at 00:00
//   local (2026-03-08: 00:00 CST −05:00 → 01:00 CDT −04:00), so that local midnight does not exist.
import { describe, expect, it } from "vitest";
import {
  defaultTimeZone,
  formatUtcInstant,
  formatZoned,
  isoDateIn,
  isTimeZone,
  localWeeks,
  localDayHours,
  localDayRange,
  offsetText,
  timeZoneChoices,
} from "@/domain/dates/zone";
import { organisationSettingsSchema } from "@/domain/dates/zone-schema";
import { describeFilter } from "@/domain/register/describe";
import { registerDayBounds } from "@/domain/register/filter";
import { latestDigestCutoff } from "@/domain/mail/digest";

const at = (iso: string) => new Date(iso);

describe("local day boundaries (IANA tz database offsets, worked by hand)", () => {
  it.each([
    // zone, day, first instant (UTC), first instant of the next day (UTC), hours
    // Chicago, an ordinary winter day: 00:00 CST = 06:00Z; next 00:00 CST = 06:00Z.
    ["America/Chicago", "2026-01-15", "2026-01-15T06:00:00.000Z", "2026-01-16T06:00:00.000Z", 24],
    // Chicago, spring forward: 00:00 CST = 06:00Z; 2026-03-09 00:00 CDT (−05:00) = 05:00Z; 23 h.
    ["America/Chicago", "2026-03-08", "2026-03-08T06:00:00.000Z", "2026-03-09T05:00:00.000Z", 23],
    // Chicago, fall back: 00:00 CDT = 05:00Z; 2026-11-02 00:00 CST (−06:00) = 06:00Z; 25 h.
    ["America/Chicago", "2026-11-01", "2026-11-01T05:00:00.000Z", "2026-11-02T06:00:00.000Z", 25],
    // Berlin, summer time starts: 00:00 CET (+01:00) = 2026-03-28T23:00Z; 2026-03-30 00:00 CEST (+02:00) = 2026-03-29T22:00Z; 23 h.
    ["Europe/Berlin", "2026-03-29", "2026-03-28T23:00:00.000Z", "2026-03-29T22:00:00.000Z", 23],
    // Berlin, summer time ends: 00:00 CEST = 2026-10-24T22:00Z; 2026-10-26 00:00 CET = 2026-10-25T23:00Z; 25 h.
    ["Europe/Berlin", "2026-10-25", "2026-10-24T22:00:00.000Z", "2026-10-25T23:00:00.000Z", 25],
    // UTC: the day is the UTC day.
    ["UTC", "2026-03-08", "2026-03-08T00:00:00.000Z", "2026-03-09T00:00:00.000Z", 24],
    // Havana: midnight is skipped; the day starts at 01:00 CDT (−04:00) = 05:00Z; next 00:00 CDT = 04:00Z; 23 h.
    ["America/Havana", "2026-03-08", "2026-03-08T05:00:00.000Z", "2026-03-09T04:00:00.000Z", 23],
  ] as const)("%s %s runs from %s to %s (%i h)", (zone, day, start, nextStart, hours) => {
    const range = localDayRange(day, zone);
    expect(range.start.toISOString()).toBe(start);
    expect(range.nextStart.toISOString()).toBe(nextStart);
    expect(localDayHours(day, zone)).toBe(hours);
  });

  it("puts an instant on the local day it falls on in the zone, not the UTC day", () => {
    // 2026-03-08T05:59Z is 23:59 CST on 2026-03-07 in Chicago (−06:00).
    expect(isoDateIn(at("2026-03-08T05:59:00Z"), "America/Chicago")).toBe("2026-03-07");
    // 06:00Z is 00:00 CST on 2026-03-08.
    expect(isoDateIn(at("2026-03-08T06:00:00Z"), "America/Chicago")).toBe("2026-03-08");
    // 2026-03-09T04:59Z is 23:59 CDT on 2026-03-08 (−05:00); its UTC day is already the 9th.
    expect(isoDateIn(at("2026-03-09T04:59:00Z"), "America/Chicago")).toBe("2026-03-08");
    // 2026-03-28T23:30Z is 00:30 CET on 2026-03-29 in Berlin (+01:00).
    expect(isoDateIn(at("2026-03-28T23:30:00Z"), "Europe/Berlin")).toBe("2026-03-29");
  });
});

describe("the register's day filter follows the organisation's local day", () => {
  it("made on 2026-03-08 in America/Chicago covers 06:00Z up to, not including, 2026-03-09T05:00Z", () => {
    const { start, nextStart } = registerDayBounds({ from: "2026-03-08", to: "2026-03-08" }, "America/Chicago");
    const inDay = (iso: string) => {
      const t = Date.parse(iso);
      return t >= start!.getTime() && t < nextStart!.getTime();
    };
    expect(inDay("2026-03-08T05:59:00Z")).toBe(false); // 23:59 CST on the 7th
    expect(inDay("2026-03-08T06:00:00Z")).toBe(true); // 00:00 CST on the 8th
    expect(inDay("2026-03-08T07:59:00Z")).toBe(true); // 01:59 CST, the last minute before the change
    expect(inDay("2026-03-08T08:00:00Z")).toBe(true); // 03:00 CDT, right after the change
    expect(inDay("2026-03-09T04:59:00Z")).toBe(true); // 23:59 CDT on the 8th
    expect(inDay("2026-03-09T05:00:00Z")).toBe(false); // 00:00 CDT on the 9th
  });

  it("names the zone in the filter's words", () => {
    const lines = describeFilter({ from: "2026-03-08", to: "2026-03-09" }, { job: null, fuser: null, machine: null }, "America/Chicago");
    expect(lines).toContainEqual({ label: "Made on or after (local day, America/Chicago)", value: "2026-03-08" });
    expect(lines).toContainEqual({ label: "Made on or before (local day, America/Chicago)", value: "2026-03-09" });
  });
});

describe("local time with its offset (ISO 8601-1:2019 §5.4.2; offsets from the IANA tz database)", () => {
  it.each([
    // 07:30Z − 6 h = 01:30 CST (before the 02:00 change).
    ["2026-03-08T07:30:00Z", "America/Chicago", "2026-03-08 01:30 \u221206:00"],
    // 08:30Z − 5 h = 03:30 CDT (02:00–02:59 do not exist that night).
    ["2026-03-08T08:30:00Z", "America/Chicago", "2026-03-08 03:30 \u221205:00"],
    // Fall back: 06:30Z is 01:30 CDT, 07:30Z is 01:30 CST: the same wall time twice, told apart by the offset.
    ["2026-11-01T06:30:00Z", "America/Chicago", "2026-11-01 01:30 \u221205:00"],
    ["2026-11-01T07:30:00Z", "America/Chicago", "2026-11-01 01:30 \u221206:00"],
    // 00:59Z + 1 h = 01:59 CET; 01:00Z + 2 h = 03:00 CEST (Berlin's change at 01:00 UTC).
    ["2026-03-29T00:59:00Z", "Europe/Berlin", "2026-03-29 01:59 +01:00"],
    ["2026-03-29T01:00:00Z", "Europe/Berlin", "2026-03-29 03:00 +02:00"],
    ["2026-03-08T07:30:00Z", "UTC", "2026-03-08 07:30 +00:00"],
    // India has no DST: +05:30 all year (IANA Asia/Kolkata).
    ["2026-03-08T07:30:00Z", "Asia/Kolkata", "2026-03-08 13:00 +05:30"],
  ] as const)("%s in %s reads %s", (instant, zone, text) => {
    expect(formatZoned(at(instant), zone, "minute")).toBe(text);
  });

  it("shows seconds and the date alone, truncating", () => {
    expect(formatZoned(at("2026-03-08T07:30:59.900Z"), "America/Chicago", "second")).toBe("2026-03-08 01:30:59 \u221206:00");
    expect(formatZoned(at("2026-03-08T05:59:00Z"), "America/Chicago", "date")).toBe("2026-03-07");
    expect(offsetText(at("2026-07-01T12:00:00Z"), "America/Chicago")).toBe("\u221205:00");
    expect(formatUtcInstant(at("2026-03-08T07:30:59.900Z"))).toBe("2026-03-08 07:30:59");
  });
});

describe("the organisation's zone setting", () => {
  it("accepts IANA names and refuses anything else with a message naming the field", () => {
    expect(organisationSettingsSchema.parse({ timeZone: "America/Chicago" })).toEqual({ timeZone: "America/Chicago" });
    expect(organisationSettingsSchema.parse({ timeZone: " Europe/Berlin " })).toEqual({ timeZone: "Europe/Berlin" });
    for (const bad of ["Mars/Olympus_Mons", "CST", "+02:00", "", "America/Chicago; DROP TABLE"]) {
      const result = organisationSettingsSchema.safeParse({ timeZone: bad });
      expect(result.success, bad).toBe(false);
      expect(result.error?.issues[0]?.message).toMatch(/^Time zone /);
    }
    expect(isTimeZone("Europe/Berlin")).toBe(true);
    expect(isTimeZone("Nowhere/Town")).toBe(false);
  });

  it("falls back to UTC when the server's zone is missing or unknown", () => {
    expect(defaultTimeZone(undefined)).toBe("UTC");
    expect(defaultTimeZone("Not/AZone")).toBe("UTC");
    expect(defaultTimeZone("America/Chicago")).toBe("America/Chicago");
  });

  it("offers UTC first and keeps the current zone in the list", () => {
    const choices = timeZoneChoices(["Europe/Berlin", "America/Chicago"], "Etc/GMT+6");
    expect(choices[0]).toBe("UTC");
    expect(choices).toEqual(["UTC", "America/Chicago", "Etc/GMT+6", "Europe/Berlin"]);
  });
});

describe("the daily digest turns at a local hour (06:00 in the organisation's zone)", () => {
  it.each([
    // 2026-03-08 in Chicago: after 02:00 CST clocks read CDT (−05:00), so 06:00 CDT = 11:00Z.
    ["2026-03-08T12:00:00Z", "America/Chicago", "2026-03-08T11:00:00.000Z"],
    // 10:30Z is 05:30 CDT: the latest cut-off is the day before, 06:00 CST (−06:00) = 12:00Z.
    ["2026-03-08T10:30:00Z", "America/Chicago", "2026-03-07T12:00:00.000Z"],
    // Berlin in winter (CET, +01:00): 06:00 local = 05:00Z.
    ["2026-12-02T05:30:00Z", "Europe/Berlin", "2026-12-02T05:00:00.000Z"],
    ["2026-12-02T05:30:00Z", "UTC", "2026-12-01T06:00:00.000Z"],
  ] as const)("at %s in %s the latest cut-off is %s", (now, zone, cutoff) => {
    expect(latestDigestCutoff(new Date(now), 6, zone).toISOString()).toBe(cutoff);
  });
});

describe("local weeks for the Insights chart (ISO 8601 weeks start on Monday)", () => {
  it("starts each week at local midnight on Monday, 23-hour day or not", () => {
    // 2026-03-08 is the second Sunday of March (US DST starts), so 2026-03-04 is a Wednesday
    // and its week starts Monday 2026-03-02 at 00:00 CST (−06:00) = 06:00Z; the next two
    // Mondays are after the change, 00:00 CDT (−05:00) = 05:00Z.
    const weeks = localWeeks(at("2026-03-04T12:00:00Z"), at("2026-03-17T00:00:00Z"), "America/Chicago");
    expect(weeks.map((w) => [w.weekStart, w.start.toISOString()])).toEqual([
      ["2026-03-02", "2026-03-02T06:00:00.000Z"],
      ["2026-03-09", "2026-03-09T05:00:00.000Z"],
      ["2026-03-16", "2026-03-16T05:00:00.000Z"],
    ]);
  });
});
