"use client";
// The phase timer behind the one phase control: a single action walks heat soak →
// changeover → cooling → done (ending a phase starts the next at the same instant), an
// ended phase fills its duration field (seconds) and is marked "timed", and the fuser is
// signalled (vibration, beep) at each change and when a running phase reaches its limit.
// The start and end instants live in the draft, so the count survives a locked screen or
// a reload; the clock only redraws.
import { useEffect, useRef, useState, type Dispatch, type SetStateAction } from "react";
import { TIMED_PHASES, type TimedPhase } from "@/domain/joints/record-words";
import { phaseAlertAtS, phaseStep, timedDurationS, type PhaseLimits, type PhaseTiming } from "@/domain/joints/timer";
import { QUANTITY_VALUES, type RECORDED_VALUES } from "@/domain/joints/values";
import { prepareCues, signal } from "../../_client/cues";
import type { PhaseTimings, TrenchForm } from "./use-trench-draft";

type TimedValueKey = Extract<(typeof RECORDED_VALUES)[number], { entry: "timed" }>["key"];

/** The values the timer fills (domain/joints/values, entry "timed"), with their phase, in the table's order. */
export const TIMED_VALUES = QUANTITY_VALUES.flatMap((d) => (d.entry === "timed" && d.phase ? [{ phase: d.phase, definition: d }] : []));

/** Each timed phase's duration field (seconds). */
export const DURATION_FIELD = Object.fromEntries(TIMED_VALUES.map(({ phase, definition }) => [phase, definition.key])) as Record<TimedPhase, TimedValueKey>;

/** A second tap this soon after a phase change is a gloved double tap, not the next phase (ms). */
const DOUBLE_TAP_MS = 800;

/** A signal fired late (the screen was locked past the moment) is not worth a buzz. */
const ALERT_GRACE_S = 3;

export function usePhaseTimers(form: TrenchForm, timers: PhaseTimings, setTimers: Dispatch<SetStateAction<PhaseTimings>>, limits: Record<TimedPhase, PhaseLimits>) {
  const { getValues, setValue } = form;
  const [now, setNow] = useState(0);
  const step = phaseStep(timers);

  useEffect(() => {
    const tick = () => setNow(Date.now());
    tick();
    document.addEventListener("visibilitychange", tick);
    // The changeover counts down in seconds against a short maximum: redraw it more often.
    const running = TIMED_PHASES.find((p) => timers[p].startedAt !== null && timers[p].endedAt === null);
    const id = running ? window.setInterval(tick, running === "changeover" ? 200 : 500) : undefined;
    return () => {
      document.removeEventListener("visibilitychange", tick);
      if (id) window.clearInterval(id);
    };
  }, [timers]);

  // Signal once when the running phase reaches its limit (changeover maximum, cooling minimum, heat-soak target).
  const alerted = useRef<string | null>(null);
  const lastAdvance = useRef(0);
  useEffect(() => {
    const phase = step.running;
    if (!phase || now === 0) return;
    const startedAt = timers[phase].startedAt as number;
    const at = phaseAlertAtS(phase, limits[phase]);
    const key = `${phase}:${startedAt}`;
    if (at === null || alerted.current === key) return;
    const elapsedS = (now - startedAt) / 1000;
    if (elapsedS >= at) {
      alerted.current = key;
      if (elapsedS - at < ALERT_GRACE_S) signal("limit");
    }
  }, [now, step.running, timers, limits]);

  const markTimed = (phase: TimedPhase, timing: PhaseTiming) => {
    const seconds = timedDurationS(timing);
    if (seconds === null) return;
    setValue(DURATION_FIELD[phase], seconds, { shouldValidate: true, shouldDirty: true });
    setValue("timedFields", [...new Set([...(getValues("timedFields") ?? []), phase])], { shouldDirty: true });
  };

  /** The one button: end the running phase and start the next at the same instant, or start the next. */
  const advance = () => {
    prepareCues();
    const at = Date.now();
    if (at - lastAdvance.current < DOUBLE_TAP_MS) return;
    const next: Partial<PhaseTimings> = {};
    if (step.running) {
      const ended = { ...timers[step.running], endedAt: at };
      next[step.running] = ended;
      markTimed(step.running, ended);
    }
    if (step.next) next[step.next] = { startedAt: at, endedAt: null };
    if (!step.running && !step.next) return;
    lastAdvance.current = at;
    setTimers((t) => ({ ...t, ...next }));
    setNow(at);
    signal(step.next ? "phase" : "done");
  };

  /** Forget every timing; durations the timer filled are emptied, typed ones are kept. */
  const clearAll = () => {
    setTimers(Object.fromEntries(TIMED_PHASES.map((p) => [p, { startedAt: null, endedAt: null }])) as PhaseTimings);
    const timed = getValues("timedFields") ?? [];
    for (const phase of timed) setValue(DURATION_FIELD[phase], undefined as unknown as number, { shouldDirty: true });
    setValue("timedFields", [], { shouldDirty: true });
  };

  /** A typed duration replaces the timed one: the phase is no longer marked "timed". */
  const untime = (phase: TimedPhase) => {
    if ((getValues("timedFields") ?? []).includes(phase)) setValue("timedFields", (getValues("timedFields") ?? []).filter((p) => p !== phase));
  };

  return { now, step, advance, clearAll, untime };
}
