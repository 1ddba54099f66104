"use client";
// The Trench screen: set up (job, machine, heater plate, the two sides), the pressure
// plan, the phase timer, the recorded values, then "Record joint". The form is
// react-hook-form with the domain's zod schema; every keystroke is kept in the draft on
// the device; a recorded joint goes to the device's outbox and is sent when it can be.
// Values are typed in the user's units and held in SI.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useCallback, useEffect, useMemo, useRef, useState, useTransition } from "react";
import { Controller, useForm, useWatch } from "react-hook-form";
import { FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { Cautions } from "@/components/ui/caution";
import { checkJoint } from "@/domain/fusion/check";
import { planButtFusion, type FusionPlan } from "@/domain/fusion/plan";
import { jointMeasurements } from "@/domain/joints/measurements";
import { buttFusionPlanInput, noPublishedVersionMessage, preRecordProblems } from "@/domain/joints/pre-record";
import { applyOverrides, blockReasons } from "@/domain/joints/rules";
import { JOINT_KIND_LABELS, JOINT_KINDS, PHASE_LABELS, recordJointFormSchema, TIMED_PHASES, type RecordJointFormInput, type RecordJointFormValues, type TimedPhase } from "@/domain/joints/schemas";
import { phaseLimits, timedDurationS, type PhaseTiming } from "@/domain/joints/timer";
import { qualificationStatus } from "@/domain/qualifications/status";
import { clearDraft, emptyTimers, loadDraft, loadRemembered, saveDraft, saveRemembered, type OutboxEntry, type PhotoRef, type Remembered } from "../_client/device-store";
import { findLocalCoil } from "../_client/find-coil";
import type { TrenchCoil, TrenchSetup } from "@/app/_server/trench/setup-types";
import { useOutbox } from "../_client/use-outbox";
import { BlocksPanel } from "./blocks-panel";
import { CoilPicker } from "./coil-picker";
import { OutboxPanel } from "./outbox-panel";
import { PhaseTimer } from "./phase-timer";
import { PlanPanel } from "@/components/fusion/plan-panel";
import { ResultPanel } from "./result-panel";
import { SelectField } from "@/components/form/controls";
import { UnitController } from "./unit-controller";
import { UnitInput } from "./unit-input";
import { ValuesSection } from "./values-section";

type FormIn = RecordJointFormInput;
type FormOut = RecordJointFormValues;

const DURATION_FIELD: Record<TimedPhase, "heatSoakS" | "changeoverS" | "coolingS"> = { heatSoak: "heatSoakS", changeover: "changeoverS", cooling: "coolingS" };

function blankValues(remembered: Remembered, clientId: string, setup: TrenchSetup): FormIn {
  const jobId = setup.jobs.some((j) => j.id === remembered.jobId) ? remembered.jobId : setup.jobs.length === 1 ? setup.jobs[0]!.id : undefined;
  const machineId = setup.machines.some((m) => m.id === remembered.machineId) ? remembered.machineId : undefined;
  const heaterId = setup.heaters.some((h) => h.id === remembered.heaterId) ? remembered.heaterId : undefined;
  return {
    clientId,
    jobId: jobId as number,
    kind: "coil-to-coil",
    coilA: "",
    coilB: "",
    componentBText: "",
    machineId: machineId as number,
    heaterId: heaterId as number,
    timedFields: [],
    station: "",
    latitude: null,
    longitude: null,
    replacesJointId: null,
  } as unknown as FormIn;
}

const isoToday = (ms: number) => new Date(ms).toISOString().slice(0, 10);

export function TrenchScreen({ setup }: { setup: TrenchSetup }) {
  const system = setup.user.unitSystem;
  const userId = setup.user.id;
  const router = useRouter();
  // A joint that reached the server changes the lists this page came with (latest joints,
  // joints waiting for a remake): reload them from the server, keeping the form as it is.
  const outbox = useOutbox(userId, useCallback(() => router.refresh(), [router]));
  const [timers, setTimers] = useState<Record<TimedPhase, PhaseTiming>>(emptyTimers);
  const [coils, setCoils] = useState<{ A: TrenchCoil | null; B: TrenchCoil | null }>({ A: null, B: null });
  const [photos, setPhotos] = useState<PhotoRef[]>([]);
  const [now, setNow] = useState(0);
  const [restored, setRestored] = useState(false);
  const [shownResult, setShownResult] = useState<string | null>(null);
  const [formMessage, setFormMessage] = useState<string | null>(null);
  const [checking, startChecking] = useTransition();
  const resultRef = useRef<HTMLDivElement>(null);

  const form = useForm<FormIn, unknown, FormOut>({
    resolver: zodResolver(recordJointFormSchema),
    defaultValues: blankValues({}, "", setup),
    mode: "onTouched",
  });
  const { register, control, handleSubmit, setValue, getValues, reset, watch, formState } = form;
  const errors = formState.errors as Record<string, { message?: string } | undefined>;
  const err = (name: string) => errors[name]?.message;

  // Restore the draft (or start one) once on the device.
  useEffect(() => {
    const draft = loadDraft(userId);
    if (draft?.version === 1 && draft.values?.clientId) {
      reset(draft.values);
      setTimers({ ...emptyTimers(), ...draft.timers });
      setCoils(draft.coils ?? { A: null, B: null });
      setPhotos(draft.photos ?? []);
    } else {
      reset(blankValues(loadRemembered(userId), crypto.randomUUID(), setup));
    }
    setNow(Date.now());
    setRestored(true);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [userId]);

  // Keep the draft from the first keystroke.
  useEffect(() => {
    if (!restored) return;
    const save = () => saveDraft(userId, { version: 1, values: getValues(), timers, coils, photos, savedAt: new Date().toISOString() });
    save();
    const sub = watch(() => save());
    return () => sub.unsubscribe();
  }, [restored, timers, coils, photos, userId, getValues, watch]);

  // The clock only redraws; the durations come from the stored instants.
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

  const [jobId, machineId, heaterId, kind, coilAText, coilBText, drag, timedFields] = useWatch({
    control,
    name: ["jobId", "machineId", "heaterId", "kind", "coilA", "coilB", "dragPressureMpa", "timedFields"],
  });
  const job = setup.jobs.find((j) => j.id === jobId) ?? null;
  const machine = setup.machines.find((m) => m.id === machineId) ?? null;
  const heater = setup.heaters.find((h) => h.id === heaterId) ?? null;
  const sideB = kind === "coil-to-coil" ? coils.B : null;

  const { plan, planProblem } = useMemo((): { plan: FusionPlan | null; planProblem: string | null } => {
    if (!job) return { plan: null, planProblem: "Choose the job: its procedure sets the limits." };
    if (!job.procedure) return { plan: null, planProblem: noPublishedVersionMessage(job.code) };
    if (!machine) return { plan: null, planProblem: "Choose the fusion machine: its piston area turns pressures into gauge readings." };
    if (!machine.isUsable || machine.pistonAreaMm2 === null) return { plan: null, planProblem: machine.problems.join(" ") };
    if (!coils.A) return { plan: null, planProblem: "Scan or type coil A: its size sets the plan." };
    if (typeof drag !== "number") return { plan: null, planProblem: "Enter the drag pressure you measured to see the gauge pressures to set." };
    try {
      return { plan: planButtFusion(buttFusionPlanInput({ procedure: job.procedure.definition, pipe: coils.A, machine: { pistonAreaMm2: machine.pistonAreaMm2 }, dragPressureMpa: drag })), planProblem: null };
    } catch (error) {
      return { plan: null, planProblem: (error as Error).message };
    }
  }, [job, machine, coils.A, drag]);
  const limits = phaseLimits(plan);

  const today = isoToday(now || Date.parse(setup.loadedAt));
  const blocks = useMemo(() => {
    if (!job) return { open: [], covered: [] };
    const qualification = qualificationStatus({ qualifiedOn: job.qualifiedOn, failedTestsOn: job.failedOn, on: today });
    const reasons = blockReasons({
      qualification,
      procedureLabel: job.procedure ? `${job.procedure.code} (${job.procedure.name})` : job.code,
      heater: heater ? { id: heater.id, assetTag: heater.assetTag, isActive: heater.isActive, lastCheck: heater.lastCheck } : null,
      coils: [coils.A, sideB].filter((c): c is TrenchCoil => c !== null).map((c) => ({ id: c.id, code: c.code, status: c.status, statusReason: c.statusReason, remainingM: c.remainingM })),
      on: today,
      admins: setup.admins,
      inspectors: setup.inspectors.length ? setup.inspectors : setup.admins,
    });
    const grants = setup.overrides.filter((o) => o.grantedById !== userId).map((o) => ({ id: o.id, jobId: o.jobId, subjectType: o.subjectType, subjectId: o.subjectId, grantedAt: new Date(o.grantedAt), expiresAt: new Date(o.expiresAt) }));
    return applyOverrides(reasons, grants, { jobId: job.id, madeAt: new Date(now || Date.parse(setup.loadedAt)) });
  }, [job, heater, coils.A, sideB, today, now, setup, userId]);

  // The same checks, in the same order, as the server's record-joint (domain/joints/pre-record.ts).
  const problems = preRecordProblems({ sideA: coils.A, sideB, machine }, system);
  const mismatch = problems.flatMap((p) => (p.kind === "size-mismatch" ? p.mismatches : []));
  const sameCoil = problems.find((p) => p.kind === "same-coil") ?? null;
  const odOutsideMachine = problems.some((p) => p.kind === "machine-size");
  const cannotRecord = blocks.open.length > 0 || problems.length > 0;

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

  const onCoilA = useCallback((c: TrenchCoil | null) => setCoils((s) => ({ ...s, A: c })), []);
  const onCoilB = useCallback((c: TrenchCoil | null) => setCoils((s) => ({ ...s, B: c })), []);
  const onTextA = useCallback((t: string) => setValue("coilA", t, { shouldDirty: true }), [setValue]);
  const onTextB = useCallback((t: string) => setValue("coilB", t, { shouldDirty: true }), [setValue]);

  const remakeOptions = useMemo(() => {
    const fromServer = setup.remakes.filter((r) => r.jobId === jobId).map((r) => ({ id: r.id, text: `Joint ${r.jointNo} (${r.reviewState === "cut-out" ? "cut out" : "out of limits"}${r.coilACode ? `, ${r.coilACode}` : ""})` }));
    const fromDevice = outbox.entries
      .filter((e) => e.result && e.result.outcome === "out-of-limits" && e.result.jobId === jobId && !fromServer.some((f) => f.id === e.result!.id))
      .map((e) => ({ id: e.result!.id, text: `Joint ${e.result!.jointNo} (out of limits, just recorded)` }));
    return [...fromDevice, ...fromServer];
  }, [setup.remakes, outbox.entries, jobId]);

  const startNewDraft = (keep: Remembered, extra: Partial<FormIn> = {}) => {
    clearDraft(userId);
    reset({ ...blankValues(keep, crypto.randomUUID(), setup), ...extra });
    setTimers(emptyTimers());
    setPhotos([]);
  };

  const onValid = (v: FormOut) => {
    setFormMessage(null);
    if (cannotRecord) {
      setFormMessage("This joint cannot be recorded yet: see the warnings in Set up.");
      return;
    }
    const madeAt = new Date().toISOString();
    let preliminary: OutboxEntry["preliminary"] = null;
    if (plan) {
      const check = checkJoint(plan, jointMeasurements({ ...v, beadUpGaugeMpa: v.beadUpGaugeMpa ?? null, heatSoakS: v.heatSoakS ?? null }), { system });
      preliminary = { outcome: check.outcome, findings: check.findings.map((f) => f.message) };
    }
    const label = `${v.coilA} + ${v.kind === "coil-to-coil" ? v.coilB : v.componentBText}`;
    const entry: OutboxEntry = {
      clientId: v.clientId,
      createdAt: madeAt,
      jobCode: job?.code ?? `job ${v.jobId}`,
      label,
      payload: { ...v, madeAt },
      photos,
      state: "waiting",
      attempts: 0,
      lastTriedAt: null,
      message: navigator.onLine ? "Sending …" : "No signal: waiting to send. It goes as soon as the connection is back.",
      preliminary,
    };
    outbox.enqueue(entry);
    const keep = { jobId: v.jobId, machineId: v.machineId, heaterId: v.heaterId };
    saveRemembered(userId, keep);
    setShownResult(v.clientId);
    setCoils({ A: null, B: null });
    startNewDraft(keep);
    window.setTimeout(() => resultRef.current?.scrollIntoView({ behavior: "smooth", block: "start" }), 50);
  };

  const onInvalid = () => setFormMessage("Some values are missing or not valid: see the fields marked in red.");

  const remake = (entry: OutboxEntry) => {
    const p = entry.payload;
    const keep = { jobId: p.jobId as number, machineId: p.machineId as number, heaterId: p.heaterId as number };
    const a = findLocalCoil(setup.coils, String(p.coilA ?? ""), setup.user.crewId);
    const b = p.coilB ? findLocalCoil(setup.coils, String(p.coilB), setup.user.crewId) : null;
    startNewDraft(keep, { kind: p.kind as FormIn["kind"], coilA: String(p.coilA ?? ""), coilB: (p.coilB as string | null) ?? "", componentBText: (p.componentBText as string | null) ?? "", replacesJointId: entry.result!.id, station: (p.station as string | null) ?? "" });
    setCoils({ A: a, B: b });
    setShownResult(null);
    setFormMessage(`Recording the remake of joint ${entry.result!.jointNo}: it will link to the joint it replaces.`);
    window.scrollTo({ top: 0, behavior: "smooth" });
  };

  const shown = outbox.entries.find((e) => e.clientId === shownResult) ?? null;
  const timedBadge = (phase: TimedPhase, value: unknown) =>
    (timedFields ?? []).includes(phase) ? <span className="rounded bg-pass-light px-2 py-0.5 text-xs font-bold text-pass">timed</span> : value !== undefined && value !== null && value !== "" ? <span className="rounded bg-slate-200 px-2 py-0.5 text-xs font-bold text-ink">typed</span> : null;

  const durationField = (phase: TimedPhase, label: string, hint?: string) => (
    <Controller
      control={control}
      name={DURATION_FIELD[phase]}
      render={({ field }) => (
        <UnitInput
          id={DURATION_FIELD[phase]}
          label={label}
          kind="duration"
          system={system}
          value={field.value as number | string | undefined}
          onChange={(v) => {
            field.onChange(v);
            if ((getValues("timedFields") ?? []).includes(phase)) setValue("timedFields", (getValues("timedFields") ?? []).filter((p) => p !== phase));
          }}
          onBlur={field.onBlur}
          error={err(DURATION_FIELD[phase])}
          hint={hint}
          badge={timedBadge(phase, field.value)}
        />
      )}
    />
  );

  const unitField = (name: "lengthAM" | "lengthBM" | "dragPressureMpa", label: string, kind: "length-m" | "pressure", opts: { hint?: string } = {}) => (
    <UnitController control={control} name={name} label={label} kind={kind} system={system} error={err(name)} hint={opts.hint} />
  );

  if (setup.jobs.length === 0) {
    return <p className="rounded-md border-2 border-caution bg-caution-light p-3 font-semibold text-caution">No open job is assigned to your crew. Ask an administrator to open a job for your crew.</p>;
  }

  return (
    <div className="flex flex-col gap-6">
      <div ref={resultRef}>{shown ? <ResultPanel entry={shown} onRemake={remake} onDismiss={() => setShownResult(null)} /> : null}</div>

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
          {unitField("lengthAM", "Pipe laid from coil A with this joint", "length-m", { hint: "Drawn off the coil's length left. Leave empty if none was pulled." })}
          {kind === "coil-to-coil" ? (
            <>
              <CoilPicker side="B" value={(coilBText as string | null) ?? ""} coil={coils.B} coils={setup.coils} preferCrewId={setup.user.crewId} system={system} error={err("coilB")} onText={onTextB} onCoil={onCoilB} />
              {unitField("lengthBM", "Pipe laid from coil B with this joint", "length-m")}
            </>
          ) : (
            <div className="flex flex-col gap-1">
              <label htmlFor="componentBText" className="text-sm font-semibold text-ink">
                {kind === "fitting" ? "Fitting on side B (type and size)" : "Pipe in the ground on side B (what and where)"}
              </label>
              <input id="componentBText" {...register("componentBText")} aria-invalid={err("componentBText") ? true : undefined} aria-describedby={err("componentBText") ? "componentBText-error" : undefined} className="min-h-touch rounded-md border-2 border-slate-400 bg-white px-3 py-2 text-base" />
              {err("componentBText") ? (
                <p id="componentBText-error" className="text-sm font-semibold text-fail">
                  {err("componentBText")}
                </p>
              ) : null}
            </div>
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
          {unitField("dragPressureMpa", "Drag pressure measured", "pressure", { hint: "The gauge reading just to move the carriage." })}
          {plan && job?.procedure ? <PlanPanel plan={plan} system={system} procedure={`${job.procedure.code} v${job.procedure.versionNo}`} /> : <p className="rounded-md border-2 border-slate-300 bg-white p-3 text-ink">{planProblem}</p>}
        </fieldset>

        <fieldset className="flex flex-col gap-4">
          <legend className="mb-2 text-xl font-bold">3. Phase timer</legend>
          <Cautions kinds={["heater", "pinch"]} title="While fusing" />
          {TIMED_PHASES.map((phase) => (
            <div key={phase} className="flex flex-col gap-2">
              <PhaseTimer phase={phase} timing={timers[phase]} limits={limits[phase]} now={now} onStart={() => startPhase(phase)} onEnd={() => endPhase(phase)} onClear={() => clearPhase(phase)} />
              {durationField(phase, `${PHASE_LABELS[phase]} time`, phase === "heatSoak" && plan && plan.heatSoakTargetS === null && !plan.heatSoakS ? "This procedure ends heat soak by bead size; time it for the record." : "Filled by the timer, or type it.")}
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
