// Round axis ticks for the charts ("nice numbers"): Paul Heckbert, "Nice Numbers for Graph
// Labels", in Graphics Gems, ed. A. S. Glassner (Academic Press, 1990), gem II.2 — his "loose" labelling:
// the range is rounded up to 1, 2, 5 or 10 × 10^n, the step to the nearest of those, and the
// axis runs from the step multiple at or below the least value to the one at or above the
// greatest. Ticks are computed in whatever unit the caller shows (MPa or psi, °C or °F), so
// they are round in the unit on screen. Pure: no framework, no clock.

/** Ticks for one axis: the axis ends (first and last tick), the step and the decimals that print every tick exactly. */
export type NiceTicks = { ticks: number[]; min: number; max: number; step: number; decimals: number };

/**
 * Heckbert's nicenum: a "nice" number (1, 2, 5 or 10 × 10^n) near x > 0. Rounded: the nearest
 * by his thresholds (< 1.5 → 1, < 3 → 2, < 7 → 5, else 10); not rounded: the least nice number ≥ x.
 */
export function niceNumber(x: number, round: boolean): number {
  if (!(x > 0) || !Number.isFinite(x)) throw new RangeError(`niceNumber needs a positive finite number, got ${x}`);
  const exponent = Math.floor(Math.log10(x));
  const power = 10 ** exponent;
  const fraction = x / power;
  let nice: number;
  if (round) nice = fraction < 1.5 ? 1 : fraction < 3 ? 2 : fraction < 7 ? 5 : 10;
  else nice = fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10;
  // Multiply by the power, or divide by its inverse for negative exponents: 5 / 10 reads 0.5, 5 * 0.1 reads 0.5000000000000001.
  return exponent >= 0 ? nice * power : nice / 10 ** -exponent;
}

/**
 * Round ticks covering [lo, hi] (any order, any sign) with about `target` ticks (at least 2).
 * A zero span (lo = hi) is widened to ±10 % of the value, or ±1 around zero, so one reading
 * still gets an axis (Heckbert's algorithm needs a span). `minStep` sets a least step, e.g. 1
 * for counts of joints. Each tick is an integer multiple of the step, rounded to `decimals`
 * places, so no 0.30000000000000004 reaches the screen.
 */
export function niceTicks(lo: number, hi: number, target = 5, { minStep = 0 }: { minStep?: number } = {}): NiceTicks {
  if (!Number.isFinite(lo) || !Number.isFinite(hi)) throw new RangeError(`niceTicks needs finite ends, got ${lo} and ${hi}`);
  let min = Math.min(lo, hi);
  let max = Math.max(lo, hi);
  if (max === min) {
    const half = min === 0 ? 1 : Math.abs(min) * 0.1;
    min -= half;
    max += half;
  }
  const count = Math.max(2, Math.round(target));
  const range = niceNumber(max - min, false);
  let step = niceNumber(range / (count - 1), true);
  if (step < minStep) step = niceNumber(minStep, false);
  const decimals = Math.max(0, -Math.floor(Math.log10(step)));
  const first = Math.floor(min / step + 1e-9);
  const last = Math.ceil(max / step - 1e-9);
  const ticks: number[] = [];
  for (let k = first; k <= last; k += 1) ticks.push(fix(k * step, decimals));
  return { ticks, min: ticks[0]!, max: ticks[ticks.length - 1]!, step, decimals };
}

/** Round to `decimals` places and turn -0 into 0. */
function fix(value: number, decimals: number): number {
  const rounded = Number(value.toFixed(decimals));
  return rounded === 0 ? 0 : rounded;
}

/** A tick as text with the axis's decimals (0.2 → "0.2", 100 → "100"). */
export function formatTick(value: number, decimals: number): string {
  return value.toFixed(decimals);
}
