// The Trench phase timer: the device stores when each phase started and ended (epoch
// milliseconds, in the draft), never a running count, so the timer survives a locked
// screen or a reload. This module turns those instants and the plan's limits into what
// the screen shows. Pure: `now` is passed in.

import type { FusionPlan } from '@/domain/fusion/plan';
import { formatDuration } from '@/domain/units/format';
import { TIMED_PHASES, type TimedPhase } from '@/domain/joints/record-words';

export interface PhaseTiming {
  startedAt: number | null;
  endedAt: number | null;
}

export interface PhaseLimits {
  /** Aim for this (heat-soak target). */
  targetS: number | null;
  minS: number | null;
  maxS: number | null;
}

/** The limits of each timed phase from a plan (s; null where the procedure gives none). */
export function phaseLimits(plan: FusionPlan | null): Record<TimedPhase, PhaseLimits> {
  return {
    heatSoak: { targetS: plan?.heatSoakTargetS ?? null, minS: plan?.heatSoakS?.min ?? null, maxS: plan?.heatSoakS?.max ?? null },
    changeover: { targetS: null, minS: null, maxS: plan?.maxChangeoverS ?? null },
    cooling: { targetS: null, minS: plan?.minCoolingS ?? null, maxS: null },
  };
}

export type PhaseRun = 'idle' | 'running' | 'ended';

/**
 * `under`: the minimum or target is not yet reached (caution colour); `reached`: it is
 * (pass colour); `within`: under a maximum (neutral); `over`: past the maximum (fail
 * colour); `none`: the procedure gives no limit for this phase.
 */
export type PhaseTone = 'none' | 'under' | 'reached' | 'within' | 'over';

export interface PhaseView {
  run: PhaseRun;
  /** Whole seconds since the start (to the end once ended). */
  elapsedS: number;
  tone: PhaseTone;
  /** Plain words: how far from the limit. */
  message: string;
}

/** Duration of an ended phase, whole seconds (stopwatch resolution); null unless ended. */
export function timedDurationS(timing: PhaseTiming): number | null {
  if (timing.startedAt === null || timing.endedAt === null) return null;
  return Math.max(0, Math.round((timing.endedAt - timing.startedAt) / 1000));
}

/**
 * What the timer shows at `now` (epoch ms). While running the count is floored to the
 * whole second; once ended it is the rounded duration. A limit exactly reached counts as
 * reached (maximum: not over until it is passed).
 */
export function phaseView(timing: PhaseTiming, limits: PhaseLimits, now: number): PhaseView {
  if (timing.startedAt === null) {
    return { run: 'idle', elapsedS: 0, tone: 'none', message: describeLimits(limits) };
  }
  const run: PhaseRun = timing.endedAt === null ? 'running' : 'ended';
  const elapsedS = run === 'ended' ? (timedDurationS(timing) as number) : Math.max(0, Math.floor((now - timing.startedAt) / 1000));
  const floor = limits.minS ?? limits.targetS;
  if (limits.maxS !== null && elapsedS > limits.maxS) {
    return { run, elapsedS, tone: 'over', message: `Over the ${formatDuration(limits.maxS)} maximum by ${formatDuration(elapsedS - limits.maxS)}` };
  }
  if (floor !== null) {
    const word = limits.minS !== null ? 'minimum' : 'target';
    if (elapsedS < floor) return { run, elapsedS, tone: 'under', message: `${formatDuration(floor - elapsedS)} to the ${formatDuration(floor)} ${word}` };
    return { run, elapsedS, tone: 'reached', message: `${capital(word)} of ${formatDuration(floor)} reached${limits.maxS !== null ? `; ${formatDuration(limits.maxS - elapsedS)} left to the maximum` : ''}` };
  }
  if (limits.maxS !== null) {
    return { run, elapsedS, tone: 'within', message: `${formatDuration(limits.maxS - elapsedS)} left of the ${formatDuration(limits.maxS)} maximum` };
  }
  return { run, elapsedS, tone: 'none', message: 'No time limit in this procedure for this phase' };
}

/**
 * Where the one phase control stands: the phase running (if any), the phase its button
 * starts next, and whether the sequence is through. The phases follow each other in the
 * order of a butt-fusion cycle — heat soak, changeover (heater out, ends brought together
 * at fusion pressure), cooling under pressure (ASTM F2620 procedure, PPI "Melt Procedure"
 * page) — so ending one starts the next at the same instant. With none running, the next
 * is the phase after the last one started (heat soak when none was).
 */
export interface PhaseStep {
  running: TimedPhase | null;
  next: TimedPhase | null;
  isDone: boolean;
}

export function phaseStep(timings: Record<TimedPhase, PhaseTiming>): PhaseStep {
  const runningIndex = TIMED_PHASES.findIndex((p) => timings[p].startedAt !== null && timings[p].endedAt === null);
  if (runningIndex >= 0) return { running: TIMED_PHASES[runningIndex]!, next: TIMED_PHASES[runningIndex + 1] ?? null, isDone: false };
  let lastStarted = -1;
  TIMED_PHASES.forEach((p, i) => {
    if (timings[p].startedAt !== null) lastStarted = i;
  });
  const next = TIMED_PHASES[lastStarted + 1] ?? null;
  return { running: null, next, isDone: next === null };
}

/**
 * The moment in a running phase worth a signal to the fuser, s from its start: the
 * changeover maximum (the heater must be out and the ends together by then), the heat-soak
 * target (or minimum), the cooling minimum. Null where the plan gives none.
 */
export function phaseAlertAtS(phase: TimedPhase, limits: PhaseLimits): number | null {
  if (phase === 'changeover') return limits.maxS;
  if (phase === 'heatSoak') return limits.targetS ?? limits.minS;
  return limits.minS;
}

function describeLimits(limits: PhaseLimits): string {
  const parts: string[] = [];
  if (limits.targetS !== null) parts.push(`target ${formatDuration(limits.targetS)}`);
  if (limits.minS !== null) parts.push(`at least ${formatDuration(limits.minS)}`);
  if (limits.maxS !== null) parts.push(`at most ${formatDuration(limits.maxS)}`);
  return parts.length ? capital(parts.join(', ')) : 'No time limit in this procedure for this phase';
}

function capital(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}
