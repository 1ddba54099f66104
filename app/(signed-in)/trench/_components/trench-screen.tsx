"use client";
// The Trench screen: set up (job, machine, heater plate, the two sides), the pressure
// plan, the phase timer, the recorded values, then "Record joint". The form is
// react-hook-form with the domain's zod schema; every keystroke is kept in the draft on
// the device; a recorded joint goes to the device's outbox and is sent when it can be.
// Values are typed in the user's units and held in SI. State and effects live in the
// hooks beside it (hooks/): the draft, the phase timers, the plan preview, what blocks
// recording, and recording itself; this file is the layout: the plan's key limits stay
// at the top while scrolling, blocks come first, one safety box, and each step folds away.
import dynamic from "next/dynamic";
import { useRouter } from "next/navigation";
import { useCallback, useTransition } from "react";
import { useWatch } from "react-hook-form";
import { Field, FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { JOINT_KIND_LABELS, JOINT_KINDS } from "@/domain/joints/record-words";
import type { TrenchCoil, TrenchSetup } from "@/app/_server/trench/setup-types";
import { heaterCheckPhrase } from "@/domain/equipment/rules";
import { isoDateOf } from "@/domain/dates/civil";
import { PHASE_LABELS } from "@/domain/joints/record-words";
import { timedDurationS } from "@/domain/joints/timer";
import { formatQuantity } from "@/domain/units/format";
import { useOutbox } from "../_client/use-outbox";
import { BlocksPanel } from "./blocks-panel";
import { CoilPicker } from "./coil-picker";
import { OutboxPanel } from "./outbox-panel";
import { PhaseControl } from "./phase-control";
import { ResultPanel } from "./result-panel";
import { SelectField } from "@/components/form/controls";
import { UnitController } from "./unit-controller";
import { quantitiesAskedIn, RecordedValueField } from "./recorded-value-field";
import { ValuesSection } from "./values-section";
import { useFusionPlanPreview } from "./hooks/use-fusion-plan-preview";
import { TIMED_VALUES, usePhaseTimers } from "./hooks/use-phase-timers";
import { useRecordBlocks } from "./hooks/use-record-blocks";
import { useRecordJoint } from "./hooks/use-record-joint";
import { useTrenchDraft, type SidePrefill } from "./hooks/use-trench-draft";
import { useScreenPrefs } from "./hooks/use-screen-prefs";
import { PlanSummary } from "./plan-summary";
import { SafetyBox } from "./safety-box";
import { SameCoilsQuestion } from "./same-coils-question";
import { TrenchSection } from "./trench-section";

// Shown only once there is a plan: loaded then, not with the page (without signal and not
// yet on the device, a line says so instead).
const PlanPanel = dynamic(
  () =>
    import("@/components/fusion/plan-panel").then(
      (m) => m.PlanPanel,
      () =>
        function PlanPanelUnavailable() {
          return <p className="rounded-md border-2 border-caution bg-caution-light p-3 font-semibold text-caution">The plan table could not be loaded on this device (no signal). The joint can still be recorded; reload the page when the signal is back.</p>;
        },
    ),
  { ssr: false },
);

export function TrenchScreen({ setup, prefill }: { setup: TrenchSetup; prefill?: SidePrefill }) {
  const system = setup.user.unitSystem;
  const userId = setup.user.id;
  const router = useRouter();
  // A joint that reached the server changes the lists this page came with (latest joints,
  // joints waiting for a remake): reload them from the server, keeping the form as it is.
  const outbox = useOutbox(userId, useCallback(() => router.refresh(), [router]));
  const [checking, startChecking] = useTransition();

  const { form, timers, setTimers, coils, setCoils, photos, setPhotos, restored, startNewDraft } = useTrenchDraft(setup, prefill);
  const sections = useScreenPrefs(userId);
  const { register, control, handleSubmit, setValue, formState } = form;
  const errors = formState.errors as Record<string, { message?: string } | undefined>;
  const err = (name: string) => errors[name]?.message;

  const [jobId, machineId, heaterId, kind, coilAText, coilBText, drag] = useWatch({
    control,
    name: ["jobId", "machineId", "heaterId", "kind", "coilA", "coilB", "dragPressureMpa"],
  });
  const { job, machine, heater, plan, timingPlan, planProblem, limits } = useFusionPlanPreview(setup, { jobId, machineId, heaterId, drag, coilA: coils.A });
  const { now, step, advance, clearAll, untime } = usePhaseTimers(form, timers, setTimers, limits);
  const { blocks, mismatch, sameCoil, odOutsideMachine, cannotRecord } = useRecordBlocks(setup, { job, machine, heater }, coils, kind, now);
  const { onValid, onInvalid, remake, shown, dismissResult, formMessage, resultRef, remakeOptions, question, answerSameCoils } = useRecordJoint({ setup, outbox, jobId, job, plan, cannotRecord, photos, coils, setCoils, startNewDraft });
  // A marked field must be in sight: open every step, then say what is wrong.
  const onInvalidOpen = () => {
    sections.openAll();
    onInvalid();
  };
  const onSameCoils = (answer: "remake" | "anyway" | "change") => {
    answerSameCoils(answer);
    if (answer === "change") {
      sections.setOpen("setup", true);
      window.setTimeout(() => document.getElementById(kind === "coil-to-coil" ? "coilB" : "coilA")?.focus(), 50);
    }
  };
  const today = isoDateOf(new Date(now || Date.parse(setup.loadedAt)));

  const onCoilA = useCallback((c: TrenchCoil | null) => setCoils((s) => ({ ...s, A: c })), [setCoils]);
  const onCoilB = useCallback((c: TrenchCoil | null) => setCoils((s) => ({ ...s, B: c })), [setCoils]);
  const onTextA = useCallback((t: string) => setValue("coilA", t, { shouldDirty: true }), [setValue]);
  const onTextB = useCallback((t: string) => setValue("coilB", t, { shouldDirty: true }), [setValue]);

  const unitField = (name: "lengthAM" | "lengthBM", label: string, opts: { hint?: string } = {}) => <UnitController control={control} name={name} label={label} kind="length-m" system={system} error={err(name)} hint={opts.hint} />;

  // What each folded step holds, in one line.
  const sideBText = kind === "coil-to-coil" ? (coils.B?.code ?? "coil B?") : kind === "fitting" ? "fitting" : "pipe in the ground";
  const setupStatus = [job?.code ?? "job?", machine?.assetTag ?? "machine?", heater?.assetTag ?? "heater?", `${coils.A?.code ?? "coil A?"} + ${sideBText}`].join(" · ");
  const planStatus = plan ? `Drag ${formatQuantity(plan.dragPressureMpa, "pressure", system)} · the limits to set` : (planProblem ?? "");
  const timerStatus =
    TIMED_VALUES.map(({ phase }) => {
      const t = timers[phase];
      const s = t.startedAt !== null && t.endedAt === null ? "running" : timedDurationS(t) !== null ? formatQuantity(timedDurationS(t)!, "duration", system) : "not timed";
      return `${PHASE_LABELS[phase]} ${s}`;
    }).join(" · ");

  if (setup.jobs.length === 0) {
    return <p className="rounded-md border-2 border-caution bg-caution-light p-3 font-semibold text-caution">No open job is assigned to your crew. Ask an administrator to open a job for your crew.</p>;
  }

  return (
    <div className="flex flex-col gap-4">
      <PlanSummary plan={plan} system={system} problem={planProblem} blocked={cannotRecord && blocks.open.length > 0} />
      <BlocksPanel open={blocks.open} covered={blocks.covered} overrides={setup.overrides} checking={checking} onCheckAgain={() => startChecking(() => router.refresh())} />
      <SafetyBox readToday={sections.safetyReadToday} onRead={sections.acknowledgeSafety} />
      <div ref={resultRef} className="empty:hidden">{shown ? <ResultPanel entry={shown} onRemake={remake} onDismiss={dismissResult} onSendAsNew={outbox.sendAsNew} onRemove={outbox.remove} /> : null}</div>

      <form onSubmit={handleSubmit(onValid, onInvalidOpen)} noValidate className="flex flex-col gap-4" aria-label="Record a joint">
        <input type="hidden" {...register("clientId")} />

        <TrenchSection id="setup" title="1. Set up" status={setupStatus} open={sections.isOpen("setup")} onToggle={(o) => sections.setOpen("setup", o)}>
        <fieldset className="flex flex-col gap-4">
          <legend className="mb-2 text-xl font-bold">1. Set up</legend>
          <SelectField id="jobId" label="Job" error={err("jobId")} {...register("jobId", { setValueAs: (v) => (v === "" || v == null ? undefined : Number(v)) })}>
            <option value="">Choose the job …</option>
            {setup.jobs.map((j) => (
              <option key={j.id} value={j.id}>
                {j.code} · {j.name}
              </option>
            ))}
          </SelectField>
          {job?.procedure ? (
            <p className="text-sm text-ink">
              Procedure from the job: <span className="font-semibold">{job.procedure.code} v{job.procedure.versionNo}</span> · {job.procedure.name}
            </p>
          ) : null}
          <SelectField id="machineId" label="Fusion machine" error={err("machineId")} {...register("machineId", { setValueAs: (v) => (v === "" || v == null ? undefined : Number(v)) })}>
            <option value="">Choose the machine …</option>
            {setup.machines.map((m) => (
              <option key={m.id} value={m.id} disabled={!m.isUsable}>
                {m.assetTag} · {m.description ?? ""}
                {m.isUsable ? "" : " (cannot be used: no piston area)"}
              </option>
            ))}
          </SelectField>
          {odOutsideMachine && machine ? <p className="text-sm font-semibold text-fail">Machine {machine.assetTag} does not take this pipe size; choose another machine.</p> : null}
          <SelectField id="heaterId" label="Heater plate" error={err("heaterId")} {...register("heaterId", { setValueAs: (v) => (v === "" || v == null ? undefined : Number(v)) })}>
            <option value="">Choose the heater plate …</option>
            {setup.heaters.map((h) => (
              <option key={h.id} value={h.id}>
                {h.assetTag} · {heaterCheckPhrase(h, today)}
              </option>
            ))}
          </SelectField>
          <SelectField id="kind" label="What is joined" error={err("kind")} {...register("kind")}>
            {JOINT_KINDS.map((k) => (
              <option key={k} value={k}>
                {JOINT_KIND_LABELS[k]}
              </option>
            ))}
          </SelectField>
          <CoilPicker side="A" value={coilAText ?? ""} coil={coils.A} coils={setup.coils} preferCrewId={setup.user.crewId} system={system} error={err("coilA")} onText={onTextA} onCoil={onCoilA} />
          {unitField("lengthAM", "Pipe laid from coil A with this joint", { hint: "Drawn off the coil's length left. Leave empty if none was pulled." })}
          {kind === "coil-to-coil" ? (
            <>
              <CoilPicker side="B" value={(coilBText as string | null) ?? ""} coil={coils.B} coils={setup.coils} preferCrewId={setup.user.crewId} system={system} error={err("coilB")} onText={onTextB} onCoil={onCoilB} />
              {unitField("lengthBM", "Pipe laid from coil B with this joint")}
            </>
          ) : (
            <Field id="componentBText" label={kind === "fitting" ? "Fitting on side B (type and size)" : "Pipe in the ground on side B (what and where)"} error={err("componentBText")} {...register("componentBText")} />
          )}
          {mismatch.length || sameCoil ? (
            <div role="alert" className="rounded-md border-2 border-fail bg-fail-light p-3 font-semibold text-fail">
              {sameCoil ? <p>{sameCoil.message}</p> : null}
              {mismatch.map((m) => (
                <p key={m.field}>{m.message}</p>
              ))}
            </div>
          ) : null}
          {remakeOptions.length ? (
            <SelectField id="replacesJointId" label="Is this the remake of a cut-out joint?" error={err("replacesJointId")} {...register("replacesJointId", { setValueAs: (v) => (v === "" || v == null ? null : Number(v)) })}>
              <option value="">No, a new joint</option>
              {remakeOptions.map((o) => (
                <option key={o.id} value={o.id}>
                  Yes: remakes {o.text}
                </option>
              ))}
            </SelectField>
          ) : null}
          {blocks.open.length ? <p className="text-sm font-semibold text-fail">Recording is blocked: see the top of the page.</p> : null}
        </fieldset>
        </TrenchSection>

        <TrenchSection id="plan" title="2. Pressure plan" status={planStatus} open={sections.isOpen("plan")} onToggle={(o) => sections.setOpen("plan", o)}>
        <fieldset className="flex flex-col gap-4">
          <legend className="mb-2 text-xl font-bold">2. Pressure plan</legend>
          {quantitiesAskedIn("machine").map((d) => (
            <RecordedValueField key={d.key} definition={d} control={control} system={system} error={err(d.key)} />
          ))}
          {plan && job?.procedure ? <PlanPanel plan={plan} system={system} procedure={`${job.procedure.code} v${job.procedure.versionNo}`} sources="details" /> : <p className="rounded-md border-2 border-slate-300 bg-white p-3 text-ink">{planProblem}</p>}
        </fieldset>
        </TrenchSection>

        <TrenchSection id="timer" title="3. Phase timer" status={timerStatus} open={sections.isOpen("timer")} onToggle={(o) => sections.setOpen("timer", o)}>
        <fieldset className="flex flex-col gap-4">
          <legend className="mb-2 text-xl font-bold">3. Phase timer</legend>
          <PhaseControl form={form} system={system} timers={timers} limits={limits} now={now} step={step} onAdvance={advance} onClearAll={clearAll} onTyped={untime} plan={timingPlan} />
        </fieldset>
        </TrenchSection>

        <TrenchSection id="values" title="4. Record the values" status="Measured values, bead checks, place and photos" open={sections.isOpen("values")} onToggle={(o) => sections.setOpen("values", o)}>
        <ValuesSection form={form} system={system} photos={photos} onPhotos={setPhotos} plan={plan} />
        </TrenchSection>

        {question ? <SameCoilsQuestion question={question} onAnswer={onSameCoils} /> : null}
        <FormMessage message={formMessage} tone={formMessage?.startsWith("Recording the remake") ? "info" : "error"} />
        <Button type="submit" className="min-h-16 text-xl" disabled={!restored || cannotRecord}>
          Record joint
        </Button>
        {cannotRecord ? <p className="text-sm font-semibold text-fail">{blocks.open.length ? "Recording is blocked: see the top of the page." : "Recording is blocked: see the warnings in Set up."}</p> : null}
        <p className="text-sm text-slate-700">Your entries are kept on this device as you type. A joint you record is checked at once and sent when there is signal.</p>
      </form>

      <OutboxPanel entries={outbox.entries} online={outbox.online} onRetry={outbox.retry} onSendAsNew={outbox.sendAsNew} onRemove={outbox.remove} onSendNow={() => void outbox.sendNow()} />
    </div>
  );
}
