"use client";
// One phase of the timer (heat soak, changeover, cooling). The start and end instants
// live in the draft, so the count survives a locked screen or a reload; the colour turns
// at the limit (caution → pass when a minimum is reached, → fail past a maximum).
import { Button } from "@/components/ui/button";
import { PHASE_LABELS, type TimedPhase } from "@/domain/joints/record-words";
import { phaseView, type PhaseLimits, type PhaseTiming } from "@/domain/joints/timer";

const TONES = {
  none: "border-slate-400 bg-slate-50 text-ink",
  under: "border-caution bg-caution-light text-caution",
  reached: "border-pass bg-pass-light text-pass",
  within: "border-brand bg-brand-light text-brand-dark",
  over: "border-fail bg-fail-light text-fail",
} as const;

function clock(seconds: number): string {
  const m = Math.floor(seconds / 60);
  const s = seconds % 60;
  return `${m}:${String(s).padStart(2, "0")}`;
}

export function PhaseTimer({ phase, timing, limits, now, onStart, onEnd, onClear }: { phase: TimedPhase; timing: PhaseTiming; limits: PhaseLimits; now: number; onStart: () => void; onEnd: () => void; onClear: () => void }) {
  const view = phaseView(timing, limits, now);
  const name = PHASE_LABELS[phase];
  return (
    <div className={`flex flex-col gap-2 rounded-md border-2 p-3 ${TONES[view.tone]}`} role="timer" aria-label={`${name} timer`}>
      <div className="flex items-baseline justify-between gap-2">
        <h4 className="text-lg font-bold">{name}</h4>
        <span className="font-mono text-4xl font-bold tabular-nums" aria-live="off">
          {clock(view.elapsedS)}
        </span>
      </div>
      <p className="text-sm font-semibold" aria-live="polite">
        {view.run === "ended" ? `Ended at ${clock(view.elapsedS)}. ` : view.run === "running" ? "Running. " : ""}
        {view.message}
      </p>
      <div className="flex flex-wrap gap-2">
        {view.run === "idle" ? (
          <Button type="button" onClick={onStart} className="flex-1">
            Start {name.toLowerCase()}
          </Button>
        ) : null}
        {view.run === "running" ? (
          <Button type="button" variant="danger" onClick={onEnd} className="flex-1">
            End {name.toLowerCase()}
          </Button>
        ) : null}
        {view.run !== "idle" ? (
          <Button type="button" variant="secondary" onClick={onClear}>
            Clear {name.toLowerCase()} timer
          </Button>
        ) : null}
      </div>
    </div>
  );
}
