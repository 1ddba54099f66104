"use client";
// The phase timer: start, end and clear each timed phase; an ended phase fills its
// duration field (seconds) and is marked "timed". The clock only redraws; the durations
// come from the stored instants.
import { useEffect, useState, type Dispatch, type SetStateAction } from "react";
import { TIMED_PHASES, type TimedPhase } from "@/domain/joints/record-words";
import { timedDurationS } from "@/domain/joints/timer";
import { QUANTITY_VALUES, type RECORDED_VALUES } from "@/domain/joints/values";
import type { PhaseTimings, TrenchForm } from "./use-trench-draft";

type TimedValueKey = Extract<(typeof RECORDED_VALUES)[number], { entry: "timed" }>["key"];

/** The values the timer fills (domain/joints/values, entry "timed"), with their phase, in the table's order. */
export const TIMED_VALUES = QUANTITY_VALUES.flatMap((d) => (d.entry === "timed" && d.phase ? [{ phase: d.phase, definition: d }] : []));

/** Each timed phase's duration field (seconds). */
export const DURATION_FIELD = Object.fromEntries(TIMED_VALUES.map(({ phase, definition }) => [phase, definition.key])) as Record<TimedPhase, TimedValueKey>;

export function usePhaseTimers(form: TrenchForm, timers: PhaseTimings, setTimers: Dispatch<SetStateAction<PhaseTimings>>) {
  const { getValues, setValue } = form;
  const [now, setNow] = useState(0);

  useEffect(() => {
    const tick = () => setNow(Date.now());
    tick();
    document.addEventListener("visibilitychange", tick);
    const running = TIMED_PHASES.some((p) => timers[p].startedAt !== null && timers[p].endedAt === null);
    const id = running ? window.setInterval(tick, 500) : undefined;
    return () => {
      document.removeEventListener("visibilitychange", tick);
      if (id) window.clearInterval(id);
    };
  }, [timers]);

  const startPhase = (phase: TimedPhase) => setTimers((t) => ({ ...t, [phase]: { startedAt: Date.now(), endedAt: null } }));
  const endPhase = (phase: TimedPhase) => {
    const ended = { ...timers[phase], endedAt: Date.now() };
    setTimers((t) => ({ ...t, [phase]: ended }));
    const seconds = timedDurationS(ended);
    if (seconds !== null) {
      setValue(DURATION_FIELD[phase], seconds, { shouldValidate: true, shouldDirty: true });
      setValue("timedFields", [...new Set([...(getValues("timedFields") ?? []), phase])], { shouldDirty: true });
    }
  };
  const clearPhase = (phase: TimedPhase) => {
    setTimers((t) => ({ ...t, [phase]: { startedAt: null, endedAt: null } }));
    if ((getValues("timedFields") ?? []).includes(phase)) {
      setValue(DURATION_FIELD[phase], undefined as unknown as number, { shouldDirty: true });
      setValue("timedFields", (getValues("timedFields") ?? []).filter((p) => p !== phase), { shouldDirty: true });
    }
  };
  /** A typed duration replaces the timed one: the phase is no longer marked "timed". */
  const untime = (phase: TimedPhase) => {
    if ((getValues("timedFields") ?? []).includes(phase)) setValue("timedFields", (getValues("timedFields") ?? []).filter((p) => p !== phase));
  };

  return { now, startPhase, endPhase, clearPhase, untime };
}
