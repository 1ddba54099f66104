// Whether a charted value lies inside the window drawn for it: the chart marks points
// outside by shape (not colour alone). Judged against the drawn limits exactly; the joint's
// verdict stays the check's (domain/fusion/check.ts), which allows half an instrument step.

/** Where a point lies against its window; "none" when no window applies to it. */
export type WindowState = "inside" | "outside" | "none";

/** A value against [min, max]; a null end is open, both null is "none". Units: the caller's, the same for all three. */
export function windowState(value: number, min: number | null, max: number | null): WindowState {
  if (min === null && max === null) return "none";
  if (min !== null && value < min) return "outside";
  if (max !== null && value > max) return "outside";
  return "inside";
}

/** A pressure window over a stretch of time (s, MPa), as the trace chart draws it. */
export type TimeBand = { key: string; x1: number; x2: number; y1: number; y2: number };

/**
 * Each trace point against the band covering its time (the first that does): "none" for
 * points outside every band's time span. Times s, pressures MPa (any one unit for both).
 */
export function traceWindowStates(points: readonly { t: number; p: number }[], bands: readonly TimeBand[]): WindowState[] {
  return points.map(({ t, p }) => {
    const band = bands.find((b) => t >= Math.min(b.x1, b.x2) && t <= Math.max(b.x1, b.x2));
    return band ? windowState(p, Math.min(band.y1, band.y2), Math.max(band.y1, band.y2)) : "none";
  });
}

/** Per band: how many points fall in its time span and how many of those lie outside its pressure window. */
export function outsideCounts(points: readonly { t: number; p: number }[], bands: readonly TimeBand[]): { key: string; inSpan: number; outside: number }[] {
  const states = traceWindowStates(points, bands);
  return bands.map((b) => {
    let inSpan = 0;
    let outside = 0;
    points.forEach((pt, i) => {
      const first = bands.find((c) => pt.t >= Math.min(c.x1, c.x2) && pt.t <= Math.max(c.x1, c.x2));
      if (first?.key !== b.key) return;
      inSpan += 1;
      if (states[i] === "outside") outside += 1;
    });
    return { key: b.key, inSpan, outside };
  });
}

/**
 * Which of the flagged points get a marker, so a run of them stays separate marks: the
 * first flagged point, then each flagged one at least `gap` after the last marked (same
 * unit as `t`, e.g. seconds). Points must be in time order.
 */
export function spacedMarks(points: readonly { t: number }[], flagged: readonly boolean[], gap: number): boolean[] {
  let last = Number.NEGATIVE_INFINITY;
  return points.map((pt, i) => {
    if (!flagged[i] || pt.t - last < gap) return false;
    last = pt.t;
    return true;
  });
}
