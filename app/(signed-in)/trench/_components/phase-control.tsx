"use client";
// Step 3 of the Trench form: one large button walks the fusion cycle — start heat soak,
// heater out (changeover starts at once), pressure reached (cooling starts), cooling done —
// so a gloved hand pulling the heater plate taps one place. The changeover counts down
// against the plan's maximum in huge figures; the phone vibrates and beeps at each change
// and when a limit is reached (hooks/use-phase-timers). Each duration stays a field that
// can be corrected by hand, marked "timed" or "typed", and judged against the plan.
import { useEffect, useState } from "react";
import { useWatch } from "react-hook-form";
import { Button } from "@/components/ui/button";
import type { FusionPlan } from "@/domain/fusion/plan";
import { PHASE_LABELS, type TimedPhase } from "@/domain/joints/record-words";
import { phaseView, type PhaseLimits, type PhaseStep } from "@/domain/joints/timer";
import type { UnitSystem } from "@/domain/units/format";
import { RecordedValueField } from "./recorded-value-field";
import { TIMED_VALUES } from "./hooks/use-phase-timers";
import { useJudgeOptions } from "./hooks/use-judge-options";
import type { PhaseTimings, TrenchForm } from "./hooks/use-trench-draft";

const TONES = {
  none: "border-slate-400 bg-slate-50 text-ink",
  under: "border-caution bg-caution-light text-caution",
  reached: "border-pass bg-pass-light text-pass",
  within: "border-brand bg-brand-light text-brand-dark",
  over: "border-fail bg-fail-light text-fail",
} as const;

/** What the one button does next, in the words of the moment at the machine. */
function buttonLabel(step: PhaseStep): string | null {
  if (step.running === "heatSoak") return "Heater out: start changeover";
  if (step.running === "changeover") return "Pressure reached: start cooling";
  if (step.running === "cooling") return "Cooling done";
  if (step.next) return `Start ${PHASE_LABELS[step.next].toLowerCase()}`;
  return null;
}

/** The headline of the stage and what to do at the machine. */
function stageWords(step: PhaseStep): { title: string; todo: string } {
  switch (step.running) {
    case "heatSoak":
      return { title: "Heat soak running", todo: "Tap the moment the heater plate comes out." };
    case "changeover":
      return { title: "Changeover: heater out", todo: "Tap when the ends are together at fusion pressure." };
    case "cooling":
      return { title: "Cooling under pressure", todo: "Tap when the joint has cooled under pressure." };
  }
  if (step.isDone) return { title: "All three phases timed", todo: "The times are filled in below; type over any to correct it." };
  if (step.next === "heatSoak") return { title: "Ready to time heat soak", todo: "Tap when the bead is up and the pressure is down to drag." };
  return { title: `Ready to time ${PHASE_LABELS[step.next as TimedPhase].toLowerCase()}`, todo: "Tap to start it." };
}

/** The phase's limits as a sentence ("Limit: at most 8 s."). */
function limitText(described: string): string {
  return described.startsWith("No time limit") ? `${described}.` : `Limit: ${described.charAt(0).toLowerCase()}${described.slice(1)}.`;
}

function clock(seconds: number): string {
  const m = Math.floor(seconds / 60);
  const s = seconds % 60;
  return `${m}:${String(s).padStart(2, "0")}`;
}

export function PhaseControl({
  form,
  system,
  timers,
  limits,
  now,
  step,
  onAdvance,
  onClearAll,
  onTyped,
  plan,
}: {
  form: TrenchForm;
  system: UnitSystem;
  timers: PhaseTimings;
  limits: Record<TimedPhase, PhaseLimits>;
  now: number;
  step: PhaseStep;
  onAdvance: () => void;
  onClearAll: () => void;
  onTyped: (phase: TimedPhase) => void;
  /** The plan the times are held to (it needs the job, machine and coil A, not the drag); null until then. */
  plan: FusionPlan | null;
}) {
  const { control, formState } = form;
  const errors = formState.errors as Record<string, { message?: string } | undefined>;
  const timedFields = useWatch({ control, name: "timedFields" });
  const judgeOptions = useJudgeOptions(form, system);
  const [confirmClear, setConfirmClear] = useState(false);
  useEffect(() => {
    if (!confirmClear) return;
    const id = window.setTimeout(() => setConfirmClear(false), 5000);
    return () => window.clearTimeout(id);
  }, [confirmClear]);

  const current = step.running;
  const view = current ? phaseView(timers[current], limits[current], now) : null;
  const words = stageWords(step);
  const label = buttonLabel(step);
  const anyStarted = TIMED_VALUES.some(({ phase }) => timers[phase].startedAt !== null);
  const changeoverMaxS = limits.changeover.maxS;

  const timedBadge = (phase: TimedPhase, value: unknown) =>
    (timedFields ?? []).includes(phase) ? (
      <span className="rounded bg-pass-light px-2 py-0.5 text-xs font-bold text-pass">timed</span>
    ) : value !== undefined && value !== null && value !== "" ? (
      <span className="rounded bg-slate-200 px-2 py-0.5 text-xs font-bold text-ink">typed</span>
    ) : null;

  return (
    <div className="flex flex-col gap-4">
      {plan ? null : <p className="rounded-md border-2 border-slate-300 bg-white p-3 text-ink">Choose job, machine and coils to get the time limits. The timer runs without them.</p>}

      <div className={`flex flex-col gap-3 rounded-md border-2 p-3 ${view && plan ? TONES[view.tone] : TONES.none}`} role="timer" aria-label="Phase timer">
        <div aria-live="polite" className="min-h-[4.5rem]">
          <p className="text-xl font-bold">{words.title}</p>
          <p className="text-sm font-semibold">{words.todo}</p>
        </div>

        {/* A fixed height, so the button below stays where the gloved thumb left it from phase to phase. */}
        {step.isDone ? null : (
          <div className="flex h-40 items-center justify-center overflow-hidden">
            {current === "changeover" && changeoverMaxS !== null && view ? (
              <p className="flex flex-wrap items-baseline justify-center gap-x-3 font-mono font-bold tabular-nums" data-testid="changeover-countdown">
                {view.elapsedS <= changeoverMaxS ? (
                  <>
                    <span className="text-[9rem] leading-none">{changeoverMaxS - view.elapsedS}</span>
                    <span className="text-2xl">s left</span>
                  </>
                ) : (
                  <>
                    <span aria-hidden="true" className="text-5xl">
                      ▲
                    </span>
                    <span className="text-[6rem] leading-none">+{view.elapsedS - changeoverMaxS}</span>
                    <span className="text-2xl">s over</span>
                  </>
                )}
              </p>
            ) : (
              <p className="text-center font-mono text-7xl font-bold tabular-nums">{clock(view?.elapsedS ?? 0)}</p>
            )}
          </div>
        )}

        {step.isDone ? null : <p className="min-h-12 text-base font-semibold">{view && plan ? `${PHASE_LABELS[current as TimedPhase]}: ${view.message}` : null}</p>}
        {/* Said once when a running phase reaches its limit (the figures above change every second). */}
        <p className="sr-only" aria-live="assertive">
          {view && plan && (view.tone === "over" || view.tone === "reached") ? `${PHASE_LABELS[current as TimedPhase]}: ${view.tone === "over" ? "maximum passed" : view.message.split(";")[0]}` : ""}
        </p>

        {label ? (
          <Button type="button" onClick={onAdvance} variant={current === "changeover" ? "danger" : "primary"} className="w-full text-2xl" style={{ minHeight: "6rem" }}>
            {label}
          </Button>
        ) : null}
        {anyStarted ? (
          <Button
            type="button"
            variant="secondary"
            onClick={() => {
              if (!confirmClear) return setConfirmClear(true);
              setConfirmClear(false);
              onClearAll();
            }}
          >
            {confirmClear ? "Tap again to clear the phase times" : "Clear the phase times and start again"}
          </Button>
        ) : null}
      </div>

      <ul className="flex flex-col gap-3" aria-label="Phase times">
        {TIMED_VALUES.map(({ phase, definition }) => {
          const timing = timers[phase];
          const run = timing.startedAt === null ? null : timing.endedAt === null ? "Running now" : null;
          const limitWords = plan ? phaseView({ startedAt: null, endedAt: null }, limits[phase], 0).message : null;
          const byBead = phase === "heatSoak" && plan && plan.heatSoakTargetS === null && !plan.heatSoakS;
          return (
            <li key={phase} className="flex flex-col gap-1 rounded-md border-2 border-slate-300 bg-white p-3">
              <RecordedValueField
                definition={definition}
                control={control}
                system={system}
                error={errors[definition.key]?.message}
                hint={[byBead ? "This procedure ends heat soak by bead size; time it for the record." : "Filled by the timer, or type it.", limitWords && !byBead ? limitText(limitWords) : null].filter(Boolean).join(" ")}
                badge={(value) => timedBadge(phase, value)}
                onTyped={() => onTyped(phase)}
                plan={plan}
                judgeOptions={judgeOptions}
              />
              {run ? <p className="text-sm font-semibold text-brand-dark">{run}</p> : null}
            </li>
          );
        })}
      </ul>
    </div>
  );
}
