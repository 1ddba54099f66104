// Deterministic generator of butt-fusion pressure traces with known phase durations,
// for tests and demo fixtures. The shape is our own model of a hydraulic machine's gauge
// (common practice, no published source): idle at 0, bead-up at bead-up pressure, heat
// soak at drag pressure, changeover near 0 (carriage open), a linear build-up to fusion
// pressure, the fusion/cooling hold (optionally dropping to a reduced cooling pressure),
// release to 0. Noise comes from a seeded generator, so the same input gives the same trace.

import { DomainError } from '@/domain/errors';
import type { PressureSample } from '@/domain/pressure-trace/parse';

export interface TracePhaseSpan {
  startS: number;
  endS: number;
  durationS: number;
}

export interface SyntheticTraceInput {
  /** Time between samples, s. */
  sampleIntervalS: number;
  /** Idle time at 0 before bead-up, s (default 5). */
  leadInS?: number;
  beadUpS: number;
  heatSoakS: number;
  changeoverS: number;
  pressureBuildUpS: number;
  /** Hold at fusion pressure after build-up, s (includes any reduced-pressure hold). */
  coolingS: number;
  /** Idle time at 0 after release, s (default 5). */
  tailS?: number;
  beadUpGaugePressureMpa: number;
  dragPressureMpa: number;
  fusionGaugePressureMpa: number;
  /** Dual low-pressure: after `reducedAfterS` of the hold, drop to this gauge pressure. */
  reducedCoolingGaugePressureMpa?: number;
  reducedAfterS?: number;
  /** Heater temperature column, °C (omitted when undefined). */
  heaterTemperatureC?: number;
  /** Noise amplitude: each pressure gets a uniform error in ±noiseMpa (clamped at 0). */
  noiseMpa?: number;
  /** Seed of the built-in generator (default 1); ignored when `random` is given. */
  seed?: number;
  /** A generator of numbers in [0, 1) to use instead of the seeded one. */
  random?: () => number;
  /** Times (s) whose nearest sample is left out, to model a dropped sample. */
  dropSamplesAtS?: number[];
  /** Single-sample spikes added to the pressure, MPa. */
  spikes?: { atS: number; mpa: number }[];
}

export interface SyntheticTrace {
  samples: PressureSample[];
  /** The true phase spans the trace was made from. */
  phases: { beadUp: TracePhaseSpan; heatSoak: TracePhaseSpan; changeover: TracePhaseSpan; fusion: TracePhaseSpan };
  /** End of the build-up (start of the hold), s. */
  buildUpEndS: number;
}

/**
 * A 32-bit linear congruential generator (multiplier 1664525, increment 1013904223, the
 * "Numerical Recipes" constants) returning numbers in [0, 1). Deterministic per seed.
 */
export function createLcg(seed: number): () => number {
  let state = (Math.floor(seed) >>> 0) || 1;
  return () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state / 4294967296;
  };
}

const span = (startS: number, endS: number): TracePhaseSpan => ({ startS, endS, durationS: endS - startS });

/**
 * Generate a trace. Times in s, pressures in MPa gauge. Deterministic: same input, same
 * samples. Sample times are k × sampleIntervalS (rounded to 1 µs).
 */
export function synthesizePressureTrace(input: SyntheticTraceInput): SyntheticTrace {
  const dt = input.sampleIntervalS;
  if (!(dt > 0)) throw new DomainError('invalid-input', 'The sample interval must be more than 0 s');
  const t0 = input.leadInS ?? 5;
  const t1 = t0 + input.beadUpS;
  const t2 = t1 + input.heatSoakS;
  const t3 = t2 + input.changeoverS;
  const t4 = t3 + input.pressureBuildUpS;
  const t5 = t4 + input.coolingS;
  const end = t5 + (input.tailS ?? 5);
  const random = input.random ?? createLcg(input.seed ?? 1);
  const noise = input.noiseMpa ?? 0;
  const reducedAt = input.reducedCoolingGaugePressureMpa !== undefined ? t4 + (input.reducedAfterS ?? 10) : Number.POSITIVE_INFINITY;

  const pressureAt = (t: number): number => {
    if (t < t0) return 0;
    if (t < t1) return input.beadUpGaugePressureMpa;
    if (t < t2) return input.dragPressureMpa;
    if (t < t3) return 0;
    if (t < t4) return (input.fusionGaugePressureMpa * (t - t3)) / Math.max(input.pressureBuildUpS, 1e-9);
    if (t < t5) return t >= reducedAt ? (input.reducedCoolingGaugePressureMpa as number) : input.fusionGaugePressureMpa;
    return 0;
  };

  const count = Math.floor(end / dt + 1e-9) + 1;
  const dropped = new Set((input.dropSamplesAtS ?? []).map((t) => Math.round(t / dt)));
  const spikes = new Map((input.spikes ?? []).map((spike) => [Math.round(spike.atS / dt), spike.mpa]));
  const samples: PressureSample[] = [];
  for (let k = 0; k < count; k += 1) {
    const t = Math.round(k * dt * 1e6) / 1e6;
    // Draw noise for every sample, dropped or not, so dropping one does not shift the rest.
    const error = noise === 0 ? 0 : (random() * 2 - 1) * noise;
    if (dropped.has(k)) continue;
    const pressure = Math.max(0, pressureAt(t) + error + (spikes.get(k) ?? 0));
    const sample: PressureSample = { seconds: t, gaugePressureMpa: pressure };
    if (input.heaterTemperatureC !== undefined) sample.heaterTemperatureC = input.heaterTemperatureC;
    samples.push(sample);
  }
  return {
    samples,
    phases: { beadUp: span(t0, t1), heatSoak: span(t1, t2), changeover: span(t2, t3), fusion: span(t3, t5) },
    buildUpEndS: t4,
  };
}
