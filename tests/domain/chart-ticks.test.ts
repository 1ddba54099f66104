// Axis ticks against Paul Heckbert, "Nice Numbers for Graph Labels", Graphics Gems (1990),
// gem II.2. The first two cases are the gem's own worked examples (its text: data 105 to 543
// plots 100 to 600 with ticks every 100; data 2.04 to 2.16 plots 2.00 to 2.20 every 0.05).
// The others are worked by hand from the gem's description of loose labelling with 5 ticks:
// range = nicenum(max − min, ceiling); step = nicenum(range / (5 − 1), rounded: <1.5→1,
// <3→2, <7→5, else 10); axis = floor(min / step)·step … ceil(max / step)·step.
import { describe, expect, it } from "vitest";
import { formatTick, niceNumber, niceTicks } from "@/domain/charts/ticks";

describe("niceNumber (Heckbert's nicenum)", () => {
  it.each([
    // source: Heckbert 1990, nicenum thresholds, by hand
    { x: 438, round: false, nice: 500 }, // 4.38 × 10² → ceiling 5 × 10²
    { x: 125, round: true, nice: 100 }, // 1.25 < 1.5 → 1 × 10²
    { x: 0.12, round: false, nice: 0.2 }, // 1.2 × 10⁻¹ → ceiling 2 × 10⁻¹
    { x: 0.05, round: true, nice: 0.05 }, // 5 × 10⁻² → 5 (< 7)
    { x: 2.9, round: true, nice: 2 }, // < 3 → 2
    { x: 7, round: true, nice: 10 }, // ≥ 7 → 10
    { x: 1, round: false, nice: 1 }, // ≤ 1 → 1
    { x: 2.01, round: false, nice: 5 }, // > 2 → 5
  ])("nicenum($x, $round) = $nice", ({ x, round, nice }) => {
    expect(niceNumber(x, round)).toBe(nice);
  });

  it("refuses zero and negative spans (the gem's nicenum needs x > 0)", () => {
    expect(() => niceNumber(0, true)).toThrow(RangeError);
    expect(() => niceNumber(-3, false)).toThrow(RangeError);
  });
});

describe("niceTicks (Heckbert's loose labelling, 5 ticks)", () => {
  it.each([
    // source: Heckbert 1990, worked example in the gem's text: 105–543 → 100…600 by 100
    { lo: 105, hi: 543, ticks: [100, 200, 300, 400, 500, 600], step: 100, decimals: 0 },
    // source: Heckbert 1990, worked example in the gem's text: 2.04–2.16 → 2.00…2.20 by 0.05
    { lo: 2.04, hi: 2.16, ticks: [2, 2.05, 2.1, 2.15, 2.2], step: 0.05, decimals: 2 },
    // by hand: range nicenum(367) = 500, step nicenum(125) = 100 → 0…400 (not 95/190/285/367)
    { lo: 0, hi: 367, ticks: [0, 100, 200, 300, 400], step: 100, decimals: 0 },
    // by hand, negative: range nicenum(16.1) = 20, step nicenum(5) = 5, floor(−0.74) = −1 → −5…15
    { lo: -3.7, hi: 12.4, ticks: [-5, 0, 5, 10, 15], step: 5, decimals: 0 },
    // by hand, all negative: range nicenum(30) = 50, step nicenum(12.5) = 10 → −50…−10
    { lo: -42, hi: -12, ticks: [-50, -40, -30, -20, -10], step: 10, decimals: 0 },
    // by hand, tiny: range nicenum(0.00035) = 0.0005, step nicenum(0.000125) = 0.0001 → 0.0001…0.0005, 4 decimals
    { lo: 0.00012, hi: 0.00047, ticks: [0.0001, 0.0002, 0.0003, 0.0004, 0.0005], step: 0.0001, decimals: 4 },
    // by hand, a gauge in MPa: range nicenum(0.53) = 1, step nicenum(0.25) = 0.2 → 0…0.6
    { lo: 0, hi: 0.53, ticks: [0, 0.2, 0.4, 0.6], step: 0.2, decimals: 1 },
    // by hand, the same gauge in psi (0.53 MPa ≈ 76.9 psi): range 100, step nicenum(25) = 20 → 0…80
    { lo: 0, hi: 76.9, ticks: [0, 20, 40, 60, 80], step: 20, decimals: 0 },
    // by hand, heater window in °F (400–450 with a reading of 378): range nicenum(72) = 100, step nicenum(25) = 20 → 360…460
    { lo: 378, hi: 450, ticks: [360, 380, 400, 420, 440, 460], step: 20, decimals: 0 },
    // by hand, ends given high first: the same as 105–543
    { lo: 543, hi: 105, ticks: [100, 200, 300, 400, 500, 600], step: 100, decimals: 0 },
  ])("$lo to $hi", ({ lo, hi, ticks, step, decimals }) => {
    const r = niceTicks(lo, hi, 5);
    expect(r.ticks).toEqual(ticks);
    expect(r.step).toBe(step);
    expect(r.decimals).toBe(decimals);
    expect(r.min).toBe(ticks[0]);
    expect(r.max).toBe(ticks[ticks.length - 1]);
  });

  it.each([
    // Zero span: the gem's nicenum(0) is undefined; we widen by ±10 % (±1 at zero) — our own rule.
    // by hand: 204 → 183.6–224.4, range nicenum(40.8) = 50, step nicenum(12.5) = 10 → 180…230
    { lo: 204, hi: 204, ticks: [180, 190, 200, 210, 220, 230] },
    // by hand: 0 → −1–1, range nicenum(2) = 2, step nicenum(0.5) = 0.5 → −1…1
    { lo: 0, hi: 0, ticks: [-1, -0.5, 0, 0.5, 1] },
    // by hand: −0.3 → −0.33–−0.27, range nicenum(0.06) = 0.1, step nicenum(0.025) = 0.02 → −0.34…−0.26
    { lo: -0.3, hi: -0.3, ticks: [-0.34, -0.32, -0.3, -0.28, -0.26] },
  ])("zero span at $lo", ({ lo, hi, ticks }) => {
    expect(niceTicks(lo, hi, 5).ticks).toEqual(ticks);
  });

  it("keeps a least step for counts: 0–3 joints steps by 1, not 0.5", () => {
    // by hand: range nicenum(3) = 5, step nicenum(1.25) = 1 — already 1; 0–2: step nicenum(0.5) = 0.5 → raised to 1
    expect(niceTicks(0, 2, 5, { minStep: 1 }).ticks).toEqual([0, 1, 2]);
    expect(niceTicks(0, 2, 5).ticks).toEqual([0, 0.5, 1, 1.5, 2]);
  });

  it("other tick counts: 105–543 with 10 ticks steps by 50 (range 500, nicenum(55.6) = 50)", () => {
    // by hand from the gem: floor(2.1) = 2 → 100, ceil(10.86) = 11 → 550
    expect(niceTicks(105, 543, 10).ticks).toEqual([100, 150, 200, 250, 300, 350, 400, 450, 500, 550]);
  });

  it("prints ticks with the axis's decimals", () => {
    const r = niceTicks(2.04, 2.16, 5);
    expect(r.ticks.map((t) => formatTick(t, r.decimals))).toEqual(["2.00", "2.05", "2.10", "2.15", "2.20"]);
  });

  it("refuses ends that are not numbers", () => {
    expect(() => niceTicks(Number.NaN, 3)).toThrow(RangeError);
    expect(() => niceTicks(0, Number.POSITIVE_INFINITY)).toThrow(RangeError);
  });
});
