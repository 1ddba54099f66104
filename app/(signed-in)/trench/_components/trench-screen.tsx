"use client";
// The Trench screen: set up (job, machine, heater plate, the two sides), the pressure
// plan, the phase timer, the recorded values, then "Record joint". The form is
// react-hook-form with the domain's zod schema; every keystroke is kept in the draft on
// the device; a recorded joint goes to the device's outbox and is sent when it can be.
// Values are typed in the user's units and held in SI. State and effects live in the
// hooks beside it (hooks/): the draft, the phase timers, the plan preview, what blocks
// recording, and recording itself; this file is the layout.
import dynamic from "next/dynamic";
import { useRouter } from "next/navigation";
import { useCallback, useTransition } from "react";
import { useWatch } from "react-hook-form";
import { Field, FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { Cautions } from "@/components/ui/caution";
import { JOINT_KIND_LABELS, JOINT_KINDS, type TimedPhase } from "@/domain/joints/record-words";
import type { TrenchCoil, TrenchSetup } from "@/app/_server/trench/setup-types";
import { useOutbox } from "../_client/use-outbox";
import { BlocksPanel } from "./blocks-panel";
import { CoilPicker } from "./coil-picker";
import { OutboxPanel } from "./outbox-panel";
import { ResultPanel } from "./result-panel";
import { PhaseTimer } from "./phase-timer";
import { SelectField } from "@/components/form/controls";
import { UnitController } from "./unit-controller";
import { quantitiesAskedIn, RecordedValueField } from "./recorded-value-field";
import { ValuesSection } from "./values-section";
import { useFusionPlanPreview } from "./hooks/use-fusion-plan-preview";
import { TIMED_VALUES, usePhaseTimers } from "./hooks/use-phase-timers";
import { useRecordBlocks } from "./hooks/use-record-blocks";
import { useRecordJoint } from "./hooks/use-record-joint";
import { useTrenchDraft } from "./hooks/use-trench-draft";

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

export function TrenchScreen({ setup }: { setup: TrenchSetup }) {
  const system = setup.user.unitSystem;
  const userId = setup.user.id;
  const router = useRouter();
  // A joint that reached the server changes the lists this page came with (latest joints,
  // joints waiting for a remake): reload them from the server, keeping the form as it is.
  const outbox = useOutbox(userId, useCallback(() => router.refresh(), [router]));
  const [checking, startChecking] = useTransition();

  const { form, timers, setTimers, coils, setCoils, photos, setPhotos, restored, startNewDraft } = useTrenchDraft(setup);
  const { register, control, handleSubmit, setValue, formState } = form;
  const errors = formState.errors as Record<string, { message?: string } | undefined>;
  const err = (name: string) => errors[name]?.message;
  const { now, startPhase, endPhase, clearPhase, untime } = usePhaseTimers(form, timers, setTimers);

  const [jobId, machineId, heaterId, kind, coilAText, coilBText, drag, timedFields] = useWatch({
    control,
    name: ["jobId", "machineId", "heaterId", "kind", "coilA", "coilB", "dragPressureMpa", "timedFields"],
  });
  const { job, machine, heater, plan, planProblem, limits } = useFusionPlanPreview(setup, { jobId, machineId, heaterId, drag, coilA: coils.A });
  const { blocks, mismatch, sameCoil, odOutsideMachine, cannotRecord } = useRecordBlocks(setup, { job, machine, heater }, coils, kind, now);
  const { onValid, onInvalid, remake, shown, dismissResult, formMessage, resultRef, remakeOptions } = useRecordJoint({ setup, outbox, jobId, job, plan, cannotRecord, photos, setCoils, startNewDraft });

  const onCoilA = useCallback((c: TrenchCoil | null) => setCoils((s) => ({ ...s, A: c })), [setCoils]);
  const onCoilB = useCallback((c: TrenchCoil | null) => setCoils((s) => ({ ...s, B: c })), [setCoils]);
  const onTextA = useCallback((t: string) => setValue("coilA", t, { shouldDirty: true }), [setValue]);
  const onTextB = useCallback((t: string) => setValue("coilB", t, { shouldDirty: true }), [setValue]);

  const timedBadge = (phase: TimedPhase, value: unknown) =>
    (timedFields ?? []).includes(phase) ? <span className="rounded bg-pass-light px-2 py-0.5 text-xs font-bold text-pass">timed</span> : value !== undefined && value !== null && value !== "" ? <span className="rounded bg-slate-200 px-2 py-0.5 text-xs font-bold text-ink">typed</span> : null;

  const unitField = (name: "lengthAM" | "lengthBM", label: string, opts: { hint?: string } = {}) => <UnitController control={control} name={name} label={label} kind="length-m" system={system} error={err(name)} hint={opts.hint} />;

  if (setup.jobs.length === 0) {
    return <p className="rounded-md border-2 border-caution bg-caution-light p-3 font-semibold text-caution">No open job is assigned to your crew. Ask an administrator to open a job for your crew.</p>;
  }

  return (
    <div className="flex flex-col gap-6">
      <div ref={resultRef}>{shown ? <ResultPanel entry={shown} onRemake={remake} onDismiss={dismissResult} /> : null}</div>

      <form onSubmit={handleSubmit(onValid, onInvalid)} noValidate className="flex flex-col gap-6" aria-label="Record a joint">
        <input type="hidden" {...register("clientId")} />

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
                {h.assetTag} · {h.lastCheck ? (h.lastCheck.passed ? `check due ${h.lastCheck.nextDueOn}` : "last check FAILED") : "never checked"}
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
          <Cautions kinds={["coil", "static"]} title="Before cutting bands or pipe" />
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
          <BlocksPanel open={blocks.open} covered={blocks.covered} overrides={setup.overrides} checking={checking} onCheckAgain={() => startChecking(() => router.refresh())} />
        </fieldset>

        <fieldset className="flex flex-col gap-4">
          <legend className="mb-2 text-xl font-bold">2. Pressure plan</legend>
          {quantitiesAskedIn("machine").map((d) => (
            <RecordedValueField key={d.key} definition={d} control={control} system={system} error={err(d.key)} />
          ))}
          {plan && job?.procedure ? <PlanPanel plan={plan} system={system} procedure={`${job.procedure.code} v${job.procedure.versionNo}`} sources="details" /> : <p className="rounded-md border-2 border-slate-300 bg-white p-3 text-ink">{planProblem}</p>}
        </fieldset>

        <fieldset className="flex flex-col gap-4">
          <legend className="mb-2 text-xl font-bold">3. Phase timer</legend>
          <Cautions kinds={["heater", "pinch"]} title="While fusing" />
          {TIMED_VALUES.map(({ phase, definition }) => (
            <div key={phase} className="flex flex-col gap-2">
              <PhaseTimer phase={phase} timing={timers[phase]} limits={limits[phase]} now={now} onStart={() => startPhase(phase)} onEnd={() => endPhase(phase)} onClear={() => clearPhase(phase)} />
              <RecordedValueField
                definition={definition}
                control={control}
                system={system}
                error={err(definition.key)}
                hint={phase === "heatSoak" && plan && plan.heatSoakTargetS === null && !plan.heatSoakS ? "This procedure ends heat soak by bead size; time it for the record." : "Filled by the timer, or type it."}
                badge={(value) => timedBadge(phase, value)}
                onTyped={() => untime(phase)}
              />
            </div>
          ))}
        </fieldset>

        <ValuesSection form={form} system={system} photos={photos} onPhotos={setPhotos} />

        <FormMessage message={formMessage} tone={formMessage?.startsWith("Recording the remake") ? "info" : "error"} />
        <Button type="submit" className="min-h-16 text-xl" disabled={!restored || cannotRecord}>
          Record joint
        </Button>
        {cannotRecord ? <p className="text-sm font-semibold text-fail">Recording is blocked: see the warnings in Set up.</p> : null}
        <p className="text-sm text-slate-700">Your entries are kept on this device as you type. A joint you record is checked at once and sent when there is signal.</p>
      </form>

      <OutboxPanel entries={outbox.entries} online={outbox.online} onRetry={outbox.retry} onRemove={outbox.remove} onSendNow={() => void outbox.sendNow()} />
    </div>
  );
}
