// The grouping rule (domain/mail/grouping), the links mail carries (domain/mail/links) checked
// against the guard each linked page really calls, and mail text turned into in-app links.
import { readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { BURST_WINDOW_S, composeGroupMail, dueGroups, groupWaiting } from "@/domain/mail/grouping";
import { mailLinkPath, textWithLinks, type MailAbout } from "@/domain/mail/links";
import { allows, ROLES, type Permission, type Role } from "@/domain/roles";

const at = (iso: string, id = 0) => ({ id, createdAt: new Date(iso) });

describe("grouping alerts into mail", () => {
  it("immediate: a burst within the window from the first waiting alert is one group; the next alert opens the next", () => {
    const t = "2026-11-24T10:00:";
    const items = [at(`${t}00Z`, 1), at(`${t}30Z`, 2), at("2026-11-24T10:01:59Z", 3), at("2026-11-24T10:02:00Z", 4), at("2026-11-24T10:05:00Z", 5)];
    const groups = groupWaiting(items, "immediate", { timeZone: "UTC", burstWindowS: 120 });
    expect(groups.map((g) => g.items.map((i) => i.id))).toEqual([[1, 2, 3], [4], [5]]);
    expect(groups.map((g) => g.closesAt.toISOString())).toEqual(["2026-11-24T10:02:00.000Z", "2026-11-24T10:04:00.000Z", "2026-11-24T10:07:00.000Z"]);
    expect(dueGroups(items, "immediate", new Date("2026-11-24T10:01:59Z"), { timeZone: "UTC", burstWindowS: 120 })).toEqual([]);
    expect(dueGroups(items, "immediate", new Date("2026-11-24T10:04:00Z"), { timeZone: "UTC", burstWindowS: 120 }).map((g) => g.items.length)).toEqual([3, 1]);
    // common practice (no published source): a couple of minutes.
    expect(BURST_WINDOW_S).toBe(120);
  });

  it("hourly: the local clock hour, also in a zone half an hour off UTC", () => {
    // source: IANA tz database — Asia/Kolkata is UTC+05:30 all year (no daylight saving), so
    // the local hour 16:00–17:00 IST runs 10:30–11:30 UTC.
    const items = [at("2026-11-24T10:40:00Z", 1), at("2026-11-24T11:29:59Z", 2), at("2026-11-24T11:30:00Z", 3)];
    const groups = groupWaiting(items, "hourly", { timeZone: "Asia/Kolkata" });
    expect(groups.map((g) => [g.items.map((i) => i.id), g.closesAt.toISOString()])).toEqual([
      [[1, 2], "2026-11-24T11:30:00.000Z"],
      [[3], "2026-11-24T12:30:00.000Z"],
    ]);
    expect(groupWaiting(items, "hourly", { timeZone: "UTC" }).map((g) => g.items.map((i) => i.id))).toEqual([[1], [2, 3]]);
  });

  it("hourly across the autumn daylight-saving change: each repeated local hour is its own hour", () => {
    // source: IANA tz database — America/Chicago leaves CDT (UTC−5) for CST (UTC−6) at
    // 02:00 local on 2026-11-01, so 01:00–02:00 local happens twice: 06:00–07:00 and 07:00–08:00 UTC.
    const groups = groupWaiting([at("2026-11-01T06:10:00Z", 1), at("2026-11-01T07:10:00Z", 2)], "hourly", { timeZone: "America/Chicago" });
    expect(groups.map((g) => g.closesAt.toISOString())).toEqual(["2026-11-01T07:00:00.000Z", "2026-11-01T08:00:00.000Z"]);
  });

  it("daily: the day turns at 06:00 in the organisation's zone", () => {
    // source: IANA tz database — Europe/Berlin is CET (UTC+1) in November: 06:00 local = 05:00 UTC.
    const items = [at("2026-11-24T04:59:00Z", 1), at("2026-11-24T05:00:00Z", 2), at("2026-11-24T22:00:00Z", 3)];
    const groups = groupWaiting(items, "daily", { timeZone: "Europe/Berlin" });
    expect(groups.map((g) => [g.items.map((i) => i.id), g.closesAt.toISOString()])).toEqual([
      [[1], "2026-11-24T05:00:00.000Z"],
      [[2, 3], "2026-11-25T05:00:00.000Z"],
    ]);
  });

  it("a group of one is that alert's own mail; several are listed, each with its link, then in full", () => {
    const one = { kind: "joint-cut-out", subject: "Cut out: WO-1 joint 3 must be remade", bodyText: "Body", link: "https://b.example/joints/3", createdAt: new Date("2026-11-24T10:00:00Z") };
    expect(composeGroupMail([one], "hourly", (d) => d.toISOString())).toEqual({ kind: "joint-cut-out", subject: one.subject, bodyText: "Body" });
    const two = { ...one, kind: "joint-out-of-limits", subject: "Out of limits: WO-1 joint 4 (1 finding)", bodyText: "Second body", link: "https://b.example/review?joint=4", createdAt: new Date("2026-11-24T10:00:30Z") };
    const mail = composeGroupMail([two, one], "hourly", (d) => d.toISOString().slice(11, 16));
    expect(mail.subject).toBe("Beadline: 2 alerts");
    expect(mail.kind).toBe("alert-summary");
    expect(mail.bodyText).toContain("1. Cut out: WO-1 joint 3 must be remade\n   https://b.example/joints/3\n2. Out of limits: WO-1 joint 4 (1 finding)\n   https://b.example/review?joint=4");
    expect(mail.bodyText).toContain("Second body");
    expect(mail.bodyText).toContain("one mail an hour");
  });
});

/** The permission the page at `link` asks for, read from its own requireUser call ("signed-in" when none). */
function pagePermission(link: string): Permission | "signed-in" {
  const segments = link.split("?")[0]!.split("/").filter(Boolean).map((s) => (/^\d+$/.test(s) ? "[id]" : s));
  const file = path.join(process.cwd(), "app/(signed-in)", ...segments, "page.tsx");
  const source = readFileSync(file, "utf8");
  const m = /requireUser\(\s*(?:"([A-Za-z]+)")?\s*\)/.exec(source);
  if (!m) throw new Error(`no requireUser in ${file}`);
  return (m[1] as Permission | undefined) ?? "signed-in";
}

describe("every mail links to a page its reader may open", () => {
  const abouts: MailAbout[] = [
    { kind: "joint", jointId: 35 },
    { kind: "cut-out", jointId: 35 },
    { kind: "qualification", userId: 7 },
    { kind: "heater", heaterId: 4 },
  ];
  it.each(ROLES.map((r) => [r]))("for a %s", (role) => {
    for (const about of abouts) {
      const link = mailLinkPath(about, { roles: [role as Role] });
      expect(allows({ roles: [role as Role] }, pagePermission(link)), `${about.kind} → ${link}`).toBe(true);
    }
  });

  it("an inspector's joint alert opens Review at the joint; the fuser's cut-out notice opens the joint's page", () => {
    expect(mailLinkPath({ kind: "joint", jointId: 35 }, { roles: ["inspector"] })).toBe("/review?joint=35");
    expect(mailLinkPath({ kind: "cut-out", jointId: 35 }, { roles: ["fuser"] })).toBe("/joints/35");
    expect(pagePermission("/review?joint=35")).toBe("viewReview");
    expect(allows({ roles: ["fuser"] }, pagePermission("/review?joint=35"))).toBe(false);
  });
});

describe("mail text with links", () => {
  it("turns the app's own addresses into in-app paths and leaves others, without trailing punctuation", () => {
    expect(textWithLinks("See https://b.example/joints/3. Or http://other.example/x, then.", "https://b.example")).toEqual([
      { text: "See " },
      { text: "https://b.example/joints/3", href: "/joints/3" },
      { text: ". Or " },
      { text: "http://other.example/x", href: "http://other.example/x" },
      { text: ", then." },
    ]);
    expect(textWithLinks("Review it: https://b.example/review?joint=4", "https://b.example/")).toEqual([{ text: "Review it: " }, { text: "https://b.example/review?joint=4", href: "/review?joint=4" }]);
    expect(textWithLinks("https://b.example.evil/x", "https://b.example")).toEqual([{ text: "https://b.example.evil/x", href: "https://b.example.evil/x" }]);
  });
});
