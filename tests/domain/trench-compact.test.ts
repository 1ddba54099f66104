// The Trench screen's short words and its same-coils question, table-driven: a date as
// "30 Nov" (checked against ECMA-402 Intl.DateTimeFormat, en-GB), a heater plate's check in
// words (overdue said as overdue), the earlier joint between the same two coils and whether
// the new one may be recorded as its remake, and which jobs a fuser may record on.
import { describe, expect, it } from "vitest";
import { formatDayMonth } from "@/domain/dates/civil";
import { heaterCheckPhrase } from "@/domain/equipment/rules";
import { earlierJointOfCoils, whyNotRemakeOf, type CoilPairJoint } from "@/domain/joints/same-coils";
import { jobsQualifiedFor } from "@/domain/qualifications/overview";
import { qualificationStatus } from "@/domain/qualifications/status";

const intlDayMonth = (iso: string) => new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", timeZone: "UTC" }).format(new Date(`${iso}T12:00:00Z`));

describe("formatDayMonth agrees with ECMA-402 Intl.DateTimeFormat (en-GB, day numeric, month short)", () => {
  const everyMonth = Array.from({ length: 12 }, (_, m) => `2026-${String(m + 1).padStart(2, "0")}-05`);
  it.each([...everyMonth, "2026-11-30", "2026-12-01", "2028-02-29"])("%s", (iso) => {
    expect(formatDayMonth(iso)).toBe(intlDayMonth(iso));
  });
});

describe("heaterCheckPhrase: the check state in words, overdue from the due day (the check is due that morning)", () => {
  const on = "2026-12-02";
  const cases: [string, Parameters<typeof heaterCheckPhrase>[0], string][] = [
    ["due two days ago", { isActive: true, lastCheck: { passed: true, nextDueOn: "2026-11-30" } }, `check overdue since ${intlDayMonth("2026-11-30")}`],
    ["due today", { isActive: true, lastCheck: { passed: true, nextDueOn: on } }, `check overdue since ${intlDayMonth(on)}`],
    ["due tomorrow", { isActive: true, lastCheck: { passed: true, nextDueOn: "2026-12-03" } }, `check due ${intlDayMonth("2026-12-03")}`],
    ["last check failed", { isActive: true, lastCheck: { passed: false, nextDueOn: "2026-12-03" } }, "last check failed"],
    ["never checked", { isActive: true, lastCheck: null }, "never checked"],
  ];
  it.each(cases)("%s", (_name, heater, words) => {
    expect(heaterCheckPhrase(heater, on)).toBe(words);
  });
});

// A coil's end is joined to the next coil's start once; a second joint between the same two
// coils is a remake or a mistake. Common practice (no published source).
const joint = (over: Partial<CoilPairJoint>): CoilPairJoint => ({ id: 1, jointNo: 1, jobId: 7, coilACode: "LV-C0001", coilBCode: "LV-C0002", madeAt: "2026-12-01T09:00:00.000Z", outcome: "within-limits", reviewState: "pending-review", replacedByJointId: null, ...over });

describe("earlierJointOfCoils", () => {
  const known = [joint({ id: 1, jointNo: 4, madeAt: "2026-11-28T09:00:00.000Z" }), joint({ id: 2, jointNo: 9, madeAt: "2026-11-30T09:00:00.000Z" }), joint({ id: 3, jointNo: 5, coilBCode: "LV-C0003" })];
  const cases: [string, string, string, number | null][] = [
    ["same order: the latest of two", "LV-C0001", "LV-C0002", 9],
    ["sides swapped", "LV-C0002", "LV-C0001", 9],
    ["case and spaces do not matter", " lv-c0002", "LV-C0001 ", 9],
    ["a pair never joined", "LV-C0002", "LV-C0003", null],
    ["one side empty", "LV-C0001", "", null],
    ["the same coil on both sides (a different refusal)", "LV-C0001", "LV-C0001", null],
  ];
  it.each(cases)("%s", (_name, a, b, jointNo) => {
    expect(earlierJointOfCoils(known, a, b)?.jointNo ?? null).toBe(jointNo);
  });
});

describe("whyNotRemakeOf: a remake replaces an out-of-limits or cut-out joint on the same job, not yet replaced", () => {
  const cases: [string, CoilPairJoint, RegExp | null][] = [
    ["out of limits", joint({ outcome: "out-of-limits" }), null],
    ["within limits but cut out", joint({ reviewState: "cut-out" }), null],
    ["within limits, not cut out", joint({}), /within limits and was not cut out/],
    ["already remade", joint({ outcome: "out-of-limits", replacedByJointId: 12 }), /already been remade/],
    ["on another job", joint({ outcome: "out-of-limits", jobId: 8 }), /another job/],
    ["still waiting on the device", joint({ id: null, jointNo: null, outcome: "out-of-limits" }), /waiting on this device/],
  ];
  it.each(cases)("%s", (_name, j, why) => {
    const answer = whyNotRemakeOf(j, 7);
    if (why === null) expect(answer).toBeNull();
    else expect(answer).toMatch(why);
  });
});

describe("jobsQualifiedFor (49 CFR 192.285(c): requalify at intervals not exceeding 15 months)", () => {
  const on = "2026-12-02";
  const jobs = [
    { id: 1, procedureId: 10 },
    { id: 2, procedureId: 20 },
  ];
  it("a qualification 60 days old covers its procedure's job only", () => {
    const statuses = [{ procedureId: 10, status: qualificationStatus({ qualifiedOn: ["2026-10-03"], on }) }];
    expect(jobsQualifiedFor(jobs, statuses).map((j) => j.id)).toEqual([1]);
  });
  it("a qualification 520 days old (over 15 months) covers none", () => {
    const statuses = [{ procedureId: 10, status: qualificationStatus({ qualifiedOn: ["2025-06-30"], on }) }];
    expect(jobsQualifiedFor(jobs, statuses)).toEqual([]);
  });
});
