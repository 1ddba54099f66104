// Which charted points lie outside the window drawn for them (the charts mark those by
// shape). Expected states worked by hand from the limits given here — common practice
// (a value below the lower or above the upper limit is outside; on the limit is inside).
import { describe, expect, it } from "vitest";
import { outsideCounts, spacedMarks, traceWindowStates, windowState } from "@/domain/charts/windows";

describe("windowState", () => {
  it.each([
    { value: 204, min: 204, max: 232, state: "inside" }, // on the lower limit
    { value: 232, min: 204, max: 232, state: "inside" }, // on the upper limit
    { value: 203.9, min: 204, max: 232, state: "outside" },
    { value: 232.1, min: 204, max: 232, state: "outside" },
    { value: 190, min: null, max: 232, state: "inside" }, // open below
    { value: 250, min: 204, max: null, state: "inside" }, // open above
    { value: 250, min: null, max: null, state: "none" },
  ] as const)("$value against $min–$max is $state", ({ value, min, max, state }) => {
    expect(windowState(value, min, max)).toBe(state);
  });
});

describe("traceWindowStates", () => {
  // Two bands: 10–20 s at 0.30–0.40 MPa, 50–100 s at 0.20–0.25 MPa.
  const bands = [
    { key: "beadUp", x1: 10, x2: 20, y1: 0.3, y2: 0.4 },
    { key: "fusion", x1: 50, x2: 100, y1: 0.2, y2: 0.25 },
  ];
  const points = [
    { t: 5, p: 0.9 }, // before any band: none
    { t: 10, p: 0.35 }, // inside bead-up
    { t: 15, p: 0.45 }, // above bead-up: outside
    { t: 30, p: 0.01 }, // between bands: none
    { t: 60, p: 0.22 }, // inside fusion
    { t: 80, p: 0.15 }, // below fusion: outside
    { t: 100, p: 0.25 }, // on the band's end and upper limit: inside
    { t: 101, p: 0.0 }, // after: none
  ];

  it("judges each point against the band over its time", () => {
    expect(traceWindowStates(points, bands)).toEqual(["none", "inside", "outside", "none", "inside", "outside", "inside", "none"]);
  });

  it("counts per band the points in its span and those outside", () => {
    expect(outsideCounts(points, bands)).toEqual([
      { key: "beadUp", inSpan: 2, outside: 1 },
      { key: "fusion", inSpan: 3, outside: 1 },
    ]);
  });

  it("without bands every point is none", () => {
    expect(traceWindowStates(points, [])).toEqual(points.map(() => "none"));
  });
});

describe("spacedMarks", () => {
  it("marks the first flagged point, then one at least the gap after the last marked", () => {
    // t = 0…10 s every second, 2–9 flagged, gap 3 s: marks at 2, 5, 8 (worked by hand)
    const points = Array.from({ length: 11 }, (_, t) => ({ t }));
    const flagged = points.map(({ t }) => t >= 2 && t <= 9);
    const marks = spacedMarks(points, flagged, 3);
    expect(points.filter((_, i) => marks[i]).map((p) => p.t)).toEqual([2, 5, 8]);
  });
});
