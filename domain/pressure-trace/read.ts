// Reading a butt-fusion pressure–time trace: find bead-up, heat soak, changeover and
// fusion (with cooling), their durations, and the gauge pressures held. The phase model
// is the trade's description of a hydraulic butt-fusion cycle (bead-up at pressure, heat
// soak at drag only, heater removal, fusion pressure held while cooling; PPI generic
// procedure, PPI TR-33; ASTM F2620) — the detection method itself is our own.
//
// Method: a 3-sample running median removes single-sample spikes (a wider one would also
// erase a changeover of a few samples); levels
// are medians of the samples inside a phase; phase edges are where the smoothed pressure
// crosses the midpoint between the two levels on either side, interpolated between
// samples, so a missing sample only widens the uncertainty to its gap. The start of the
// fusion build-up is the ramp (through its 25 % and 75 % points) extended back to the
// changeover level, and its end the ramp extended to the fusion level.
//
// Read against the joint's plan, cooling is the time the joint was held at or above the
// plan's minimum (fusion gauge minimum; ISO 21307 dual low-pressure: its reduced cooling
// pressure), because the procedures require cooling under pressure (ASTM F2620; PPI generic
// procedure "Hold"; ISO 21307:2017) — a hold that leaks down to drag is not cooling under
// pressure. "Held" is the running median over HOLD_WINDOW_S, so a sample's noise neither
// ends nor extends the hold; the minimum is taken as it is (no instrument tolerance: the
// plan carries none).

import type { PressureSample } from '@/domain/pressure-trace/parse';
import { coolingHoldMinimumGaugePressureMpa, type JointMeasurements } from '@/domain/fusion/check';
import type { FusionPlan } from '@/domain/fusion/plan';

export interface TracePhase {
  startS: number;
  endS: number;
  durationS: number;
}

export interface PressureTraceReading {
  phases: { beadUp: TracePhase; heatSoak: TracePhase; changeover: TracePhase; fusion: TracePhase };
  heatSoakS: number;
  changeoverS: number;
  pressureBuildUpS: number;
  /**
   * Time held under pressure after build-up, s: without a plan until release; with a plan
   * until the held pressure first falls below `coolingHoldMinimumGaugePressureMpa`.
   */
  coolingS: number;
  /** With a plan: the minimum the hold was counted against, MPa; null without a plan. */
  coolingHoldMinimumGaugePressureMpa: number | null;
  /**
   * With a plan: lowest pressure held (HOLD_WINDOW_S running median) from the end of the
   * build-up through the plan's minimum cooling time (or to the release when the plan has
   * none), MPa; an early release reads as the pressure after it. Null without a plan.
   */
  lowestCoolingGaugePressureMpa: number | null;
  /** Median gauge pressure during heat soak, MPa. */
  heatSoakGaugePressureMpa: number;
  /** High-pressure stretches before the heat soak: 2 or more when bead-up was done again. */
  beadUpCount: number;
  /** Median gauge pressure while held at fusion pressure, MPa. */
  fusionGaugePressureMpa: number;
  beadUpGaugePressureMpa: number;
  /** Drag pressure used to tell heat soak from changeover (given, or read from the heat soak), MPa. */
  dragPressureMpa: number;
  /** Median heater temperature during heat soak, °C; null when the trace has none. */
  heaterTemperatureC: number | null;
  /** False when the record ends before the pressure is released (cooling is then a lower bound). */
  released: boolean;
}

export type ReadPressureTraceResult = { ok: true; reading: PressureTraceReading } | { ok: false; error: string };

export interface ReadPressureTraceOptions {
  /** Measured drag pressure, MPa; read from the trace when absent. */
  dragPressureMpa?: number;
  /** The joint's plan: cooling is then counted only while its minimum pressure is held. */
  plan?: FusionPlan;
}

/** Fewest samples the reader accepts. */
export const MIN_TRACE_SAMPLES = 12;
/** High stretches closer than this are one stretch (a brief dip is not a phase), s. */
const MERGE_GAP_S = 3;
/** Window of the running median that says what pressure was held, s (centred). */
export const HOLD_WINDOW_S = 5;

function median(values: readonly number[]): number {
  if (values.length === 0) return Number.NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? (sorted[mid] as number) : ((sorted[mid - 1] as number) + (sorted[mid] as number)) / 2;
}

const round1 = (value: number) => Math.round(value * 10) / 10;
const phase = (startS: number, endS: number): TracePhase => ({ startS: round1(startS), endS: round1(endS), durationS: round1(endS - startS) });

/**
 * Read a trace (samples in time order, pressures MPa gauge). Durations in s rounded to
 * 0.1 s, pressures in MPa not rounded. Assumes, as on any working machine, that drag is
 * well under half the bead-up and fusion gauge pressures. Returns an error in words when the trace does not
 * show a bead-up and a fusion stretch separated by a heat soak, or when heat soak and
 * changeover cannot be told apart (no drag pressure to see).
 */
export function readPressureTrace(samples: readonly PressureSample[], options: ReadPressureTraceOptions = {}): ReadPressureTraceResult {
  if (samples.length < MIN_TRACE_SAMPLES) {
    return { ok: false, error: `The trace has ${samples.length} samples; at least ${MIN_TRACE_SAMPLES} are needed to find the phases` };
  }
  const t = samples.map((sample) => sample.seconds);
  const raw = samples.map((sample) => sample.gaugePressureMpa);
  const n = raw.length;
  const s = raw.map((_, i) => median(raw.slice(Math.max(0, i - 1), Math.min(n, i + 2))));
  const peak = Math.max(...s);
  if (!(peak > 0)) return { ok: false, error: 'The trace shows no pressure' };

  // Stretches above half the peak: the first is bead-up, the next is fusion.
  const runs: { start: number; end: number }[] = [];
  for (let i = 0; i < n; i += 1) {
    if ((s[i] as number) <= peak / 2) continue;
    const last = runs[runs.length - 1];
    if (last && (t[i] as number) - (t[last.end] as number) < MERGE_GAP_S) last.end = i;
    else runs.push({ start: i, end: i });
  }
  if (runs.length < 2) {
    return { ok: false, error: 'The trace shows only one pressure stretch; a bead-up and a fusion stretch separated by a heat soak are needed' };
  }
  // Heat soak and changeover lie in the first gap between stretches that falls close to
  // zero from a level it mostly holds (the soak at drag, then the carriage open); a brief
  // dip between two bead-ups, or a leak-down in the hold, holds no level above its lowest.
  // Without such a gap, the first gap (as for two stretches).
  const gapIsSoak = (g: number): boolean => {
    const gap = s.slice((runs[g] as { end: number }).end + 1, (runs[g + 1] as { start: number }).start);
    return gap.length > 0 && Math.min(...gap) < median(gap) / 4;
  };
  let split = 0;
  while (split < runs.length - 1 && !gapIsSoak(split)) split += 1;
  if (split === runs.length - 1) split = 0;
  const beadRun = runs[split] as { start: number; end: number };
  const fusionRun = runs[split + 1] as { start: number; end: number };

  const crossing = (i: number, level: number): number => {
    // Interpolated time where the smoothed pressure crosses `level` between samples i and i + 1.
    const a = s[i] as number;
    const b = s[i + 1] as number;
    const ta = t[i] as number;
    const tb = t[i + 1] as number;
    if (a === b) return (ta + tb) / 2;
    return ta + ((level - a) / (b - a)) * (tb - ta);
  };

  const beadLevel = median(raw.slice(beadRun.start, beadRun.end + 1));
  const lowSlice = s.slice(beadRun.end + 1, fusionRun.start);
  const drag = options.dragPressureMpa ?? median(lowSlice);
  // The heat-soak level must stand out of the noise (robust σ from the median absolute
  // deviation of the low stretch about its smoothed values) to split it from changeover.
  const lowRaw = raw.slice(beadRun.end + 1, fusionRun.start);
  const sigma = 1.4826 * median(lowRaw.map((value, k) => Math.abs(value - (lowSlice[k] as number))));
  if (!Number.isFinite(drag) || !(drag > Math.max(3 * (Number.isFinite(sigma) ? sigma : 0), 0.005 * peak))) {
    return { ok: false, error: 'Heat soak and changeover cannot be told apart: the pressure during heat soak is no higher than during changeover. Give the measured drag pressure.' };
  }
  const changeoverLevel = drag / 2;

  // Bead-up start: last rise through half the bead-up level before the bead-up stretch.
  let i = beadRun.start - 1;
  while (i >= 0 && (s[i] as number) >= beadLevel / 2) i -= 1;
  const beadUpStart = i >= 0 ? crossing(i, beadLevel / 2) : (t[0] as number);
  // Bead-up end: first fall through the midpoint between bead-up level and drag.
  const beadEndLevel = (beadLevel + drag) / 2;
  i = beadRun.start;
  while (i < n - 1 && (s[i + 1] as number) >= beadEndLevel) i += 1;
  const beadUpEnd = crossing(i, beadEndLevel);

  // Changeover: the stretch below half the drag just before the fusion rise.
  let rise = fusionRun.start - 1;
  while (rise > beadRun.end && (s[rise] as number) >= changeoverLevel) rise -= 1;
  if (rise <= beadRun.end) return { ok: false, error: 'No changeover found: the pressure never drops below the drag pressure between heat soak and fusion' };
  let open = rise;
  while (open - 1 > beadRun.end && (s[open - 1] as number) < changeoverLevel) open -= 1;
  const changeoverStart = crossing(open - 1, changeoverLevel);
  const lowLevel = median(s.slice(open, rise + 1));

  // Fusion level and the build-up ramp.
  const fusionLevel = median(raw.slice(fusionRun.start, fusionRun.end + 1));
  const levelTime = (fraction: number): number => {
    const level = lowLevel + fraction * (fusionLevel - lowLevel);
    let k = rise;
    while (k < n - 1 && (s[k + 1] as number) < level) k += 1;
    return crossing(k, level);
  };
  const t25 = levelTime(0.25);
  const t75 = levelTime(0.75);
  // The ramp line: least squares through the raw samples between 10 % and 90 % of the
  // rise (noise averages out on slow ramps); on a ramp too quick for that, the line
  // through the 25 % and 75 % crossings.
  const rampLow = lowLevel + 0.1 * (fusionLevel - lowLevel);
  const rampHigh = lowLevel + 0.9 * (fusionLevel - lowLevel);
  const ramp: [number, number][] = [];
  for (let k = rise; k <= fusionRun.end && (t[k] as number) <= t75 + 2 * (t75 - t25); k += 1) {
    if ((s[k] as number) >= rampLow && (s[k] as number) <= rampHigh && (t[k] as number) >= t25 - 2 * (t75 - t25)) ramp.push([t[k] as number, raw[k] as number]);
  }
  let slope = (0.5 * (fusionLevel - lowLevel)) / Math.max(t75 - t25, 1e-9);
  let intercept = lowLevel + 0.25 * (fusionLevel - lowLevel) - slope * t25;
  if (ramp.length >= 4) {
    const meanT = ramp.reduce((sum, [x]) => sum + x, 0) / ramp.length;
    const meanP = ramp.reduce((sum, [, y]) => sum + y, 0) / ramp.length;
    const sxx = ramp.reduce((sum, [x]) => sum + (x - meanT) ** 2, 0);
    const sxy = ramp.reduce((sum, [x, y]) => sum + (x - meanT) * (y - meanP), 0);
    if (sxx > 0 && sxy > 0) {
      slope = sxy / sxx;
      intercept = meanP - slope * meanT;
    }
  }
  const fusionStart = Math.min(Math.max((lowLevel - intercept) / slope, changeoverStart), t25);
  const buildUpEnd = Math.max((fusionLevel - intercept) / slope, t75);

  // Release: the last fall to near zero, at half the final hold level.
  let last = n - 1;
  while (last > fusionRun.start && (s[last] as number) < changeoverLevel) last -= 1;
  const released = last < n - 1;
  const holdLevel = median(s.slice(Math.max(fusionRun.start, last - 4), last + 1));
  let fall = last;
  while (fall > fusionRun.start && (s[fall] as number) < holdLevel / 2) fall -= 1;
  const fusionEnd = released ? crossing(fall, holdLevel / 2) : (t[n - 1] as number);

  const holdSamples = raw.filter((_, k) => (t[k] as number) >= buildUpEnd && k <= fusionRun.end);
  const soakSamples = raw.filter((_, k) => (t[k] as number) >= beadUpEnd && (t[k] as number) <= changeoverStart);

  // Against a plan: the held level (centred running median) from the end of the build-up.
  let coolingEnd = fusionEnd;
  let holdMinimum: number | null = null;
  let lowestHeld: number | null = null;
  if (options.plan) {
    const plan = options.plan;
    const minimum = coolingHoldMinimumGaugePressureMpa(plan);
    holdMinimum = minimum;
    const half = HOLD_WINDOW_S / 2;
    const held = (k: number): number => {
      let a = k;
      let b = k;
      while (a > 0 && (t[k] as number) - (t[a - 1] as number) <= half) a -= 1;
      while (b < n - 1 && (t[b + 1] as number) - (t[k] as number) <= half) b += 1;
      return median(raw.slice(a, b + 1));
    };
    let k = 0;
    while (k < n && (t[k] as number) < buildUpEnd) k += 1;
    const windowEnd = plan.minCoolingS !== null ? buildUpEnd + plan.minCoolingS : released ? fusionEnd - half : (t[n - 1] as number);
    // Never lost before the record ends: held to the end (fusionEnd), a lower bound.
    let previous: { time: number; level: number } | null = null;
    let lost = false;
    for (; k < n; k += 1) {
      const time = t[k] as number;
      const level = held(k);
      if (time <= windowEnd || lowestHeld === null) lowestHeld = lowestHeld === null ? level : Math.min(lowestHeld, level);
      if (!lost && level < minimum) {
        lost = true;
        // Interpolated between the last held sample and this one; at once when never held.
        const fraction = previous ? Math.min(Math.max((previous.level - minimum) / (previous.level - level), 0), 1) : 0;
        coolingEnd = previous ? previous.time + fraction * (time - previous.time) : buildUpEnd;
      }
      if (lost && time > windowEnd) break;
      previous = { time, level };
    }
    coolingEnd = Math.min(Math.max(coolingEnd, buildUpEnd), fusionEnd);
  }
  const temperatures = samples
    .filter((sample) => sample.seconds >= beadUpEnd && sample.seconds <= changeoverStart && sample.heaterTemperatureC !== undefined)
    .map((sample) => sample.heaterTemperatureC as number);

  const phases = {
    beadUp: phase(beadUpStart, beadUpEnd),
    heatSoak: phase(beadUpEnd, changeoverStart),
    changeover: phase(changeoverStart, fusionStart),
    fusion: phase(fusionStart, fusionEnd),
  };
  return {
    ok: true,
    reading: {
      phases,
      heatSoakS: phases.heatSoak.durationS,
      changeoverS: phases.changeover.durationS,
      pressureBuildUpS: round1(buildUpEnd - fusionStart),
      coolingS: round1(coolingEnd - buildUpEnd),
      coolingHoldMinimumGaugePressureMpa: holdMinimum,
      lowestCoolingGaugePressureMpa: lowestHeld,
      heatSoakGaugePressureMpa: soakSamples.length > 0 ? median(soakSamples) : drag,
      beadUpCount: split + 1,
      fusionGaugePressureMpa: holdSamples.length > 0 ? median(holdSamples) : fusionLevel,
      beadUpGaugePressureMpa: beadLevel,
      dragPressureMpa: drag,
      heaterTemperatureC: temperatures.length > 0 ? median(temperatures) : null,
      released,
    },
  };
}

/**
 * The values of a reading that the joint check takes (canonical SI), to check a trace
 * "like typed values". Heater temperature only when the trace had that column.
 */
export function measurementsFromTraceReading(reading: PressureTraceReading): Partial<JointMeasurements> {
  const values: Partial<JointMeasurements> = {
    heatSoakS: reading.heatSoakS,
    changeoverS: reading.changeoverS,
    pressureBuildUpS: reading.pressureBuildUpS,
    coolingS: reading.coolingS,
    fusionGaugePressureMpa: reading.fusionGaugePressureMpa,
    beadUpGaugePressureMpa: reading.beadUpGaugePressureMpa,
    heatSoakGaugePressureMpa: reading.heatSoakGaugePressureMpa,
  };
  if (reading.lowestCoolingGaugePressureMpa !== null) values.lowestCoolingGaugePressureMpa = reading.lowestCoolingGaugePressureMpa;
  if (reading.heaterTemperatureC !== null) values.heaterTemperatureC = reading.heaterTemperatureC;
  return values;
}
