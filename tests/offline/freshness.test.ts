// The Trench screen's freshness line: when its data was read, how long ago, and the signal.
// Times are UTC wall-clock times written hh:mm (ISO 8601-1:2019 §5.3.1.2, basic precision
// to the minute, extended format) as every Beadline screen writes instants today; ages are
// whole units, truncated (common practice: "3 h ago" until a full 4 h have passed).
import { describe, expect, it } from "vitest";
import { describeAge, describeFreshness } from "@/components/offline/freshness";

const MIN = 60_000;
const H = 60 * MIN;

describe("describeAge", () => {
  it.each([
    [0, "just now"],
    [59_999, "just now"], // under one minute
    [MIN, "1 min ago"],
    [59 * MIN + 59_000, "59 min ago"], // truncated, not rounded up to an hour
    [H, "1 h ago"],
    [3 * H + 59 * MIN, "3 h ago"],
    [47 * H + 59 * MIN, "47 h ago"],
    [48 * H, "2 days ago"],
    [-5 * MIN, "just now"], // a device clock behind the server's: never a negative age
  ])("%d ms → %s", (ms, words) => {
    expect(describeAge(ms)).toBe(words);
  });
});

describe("describeFreshness", () => {
  // 2026-12-02T09:42:30Z read, seen at 12:50:00Z the same UTC day: 3 h 7 min 30 s later.
  const loadedAt = "2026-12-02T09:42:30.000Z";
  const now = Date.UTC(2026, 11, 2, 12, 50, 0);

  it("without signal: time of the data, its age, and no signal", () => {
    expect(describeFreshness({ loadedAt, now, online: false })).toBe("Data from 09:42 UTC, 3 h ago; no signal");
  });

  it("with signal: no signal words", () => {
    expect(describeFreshness({ loadedAt, now: Date.UTC(2026, 11, 2, 9, 42, 50), online: true })).toBe("Data from 09:42 UTC, just now");
  });

  it("data from another UTC day carries its date", () => {
    // 2026-12-01T22:10Z seen 2026-12-02T06:00Z: 7 h 50 min later, across midnight UTC.
    expect(describeFreshness({ loadedAt: "2026-12-01T22:10:00Z", now: Date.UTC(2026, 11, 2, 6, 0, 0), online: false })).toBe("Data from 2026-12-01 22:10 UTC, 7 h ago; no signal");
  });

  it("before the page is on the device (server render): the time alone", () => {
    expect(describeFreshness({ loadedAt, now: null, online: true })).toBe("Data from 09:42 UTC");
  });
});
