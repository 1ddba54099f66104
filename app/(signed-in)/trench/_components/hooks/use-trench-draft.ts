"use client";
// The form of the Trench screen and its draft on the device: react-hook-form with the
// domain's zod schema, restored once from the device, saved on every keystroke and on
// every timer, coil or photo change once the fuser has entered something, and started
// afresh after a joint is recorded.
import { useEffect, useRef, useState } from "react";
import { useForm, type Resolver, type UseFormReturn } from "react-hook-form";
import type { RecordJointFormInput, RecordJointFormValues } from "@/domain/joints/schemas";
import { TIMED_PHASES, type TimedPhase } from "@/domain/joints/record-words";
import type { PhaseTiming } from "@/domain/joints/timer";
import { clearDraft, emptyTimers, loadDraft, loadRemembered, saveDraft, type PhotoRef, type Remembered } from "../../_client/device-store";
import type { TrenchCoil, TrenchSetup } from "@/app/_server/trench/setup-types";

export type FormIn = RecordJointFormInput;
export type FormOut = RecordJointFormValues;
export type TrenchForm = UseFormReturn<FormIn, unknown, FormOut>;
export type SideCoils = { A: TrenchCoil | null; B: TrenchCoil | null };
export type PhaseTimings = Record<TimedPhase, PhaseTiming>;

let loadingResolver: Promise<Resolver<FormIn, unknown, FormOut>> | null = null;

/**
 * The domain's zod schema as the form's resolver, loaded on first use rather than with the
 * page (zod and the schema are about 30 kB gzip); a failed load is tried again next time.
 */
function loadSchemaResolver(): Promise<Resolver<FormIn, unknown, FormOut>> {
  loadingResolver ??= Promise.all([import("@hookform/resolvers/zod"), import("@/domain/joints/schemas")]).then(
    ([{ zodResolver }, { recordJointFormSchema }]) => zodResolver(recordJointFormSchema),
    (error: unknown) => {
      loadingResolver = null;
      throw error;
    },
  );
  return loadingResolver;
}

const schemaResolver: Resolver<FormIn, unknown, FormOut> = async (values, context, options) => (await loadSchemaResolver())(values, context, options);

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

/** Empty for the draft's purpose: nothing typed, chosen or ticked. */
const isEmpty = (v: unknown) => v === undefined || v === null || v === "" || (Array.isArray(v) && v.length === 0);

/**
 * Whether the fuser has entered anything beyond the blank start (the remembered job,
 * machine and heater and the generated client id are not entries): only then is a draft
 * kept on the device, so opening Trench and leaving leaves no "joint in progress".
 */
function hasEntries(values: FormIn, blank: FormIn | null, timers: PhaseTimings, coils: SideCoils, photos: PhotoRef[]): boolean {
  if (coils.A || coils.B || photos.length) return true;
  if (TIMED_PHASES.some((p) => timers[p].startedAt !== null)) return true;
  const now = values as Record<string, unknown>;
  const start = (blank ?? {}) as Record<string, unknown>;
  return Object.keys({ ...now, ...start }).some((k) => {
    if (k === "clientId") return false;
    const a = now[k];
    const b = start[k];
    if (isEmpty(a) && isEmpty(b)) return false;
    return JSON.stringify(a) !== JSON.stringify(b);
  });
}

/** Coils to put on the sides when the page opens (from a coil page's "Use as side A/B"). */
export type SidePrefill = { A?: TrenchCoil | null; B?: TrenchCoil | null };

export function useTrenchDraft(setup: TrenchSetup, prefill?: SidePrefill) {
  const userId = setup.user.id;
  const blankRef = useRef<FormIn | null>(null);
  const [timers, setTimers] = useState<PhaseTimings>(emptyTimers);
  const [coils, setCoils] = useState<SideCoils>({ A: null, B: null });
  const [photos, setPhotos] = useState<PhotoRef[]>([]);
  const [restored, setRestored] = useState(false);

  const form: TrenchForm = useForm<FormIn, unknown, FormOut>({
    resolver: schemaResolver,
    defaultValues: blankValues({}, "", setup),
    mode: "onTouched",
  });
  const { getValues, reset, setValue, watch } = form;

  // Restore the draft (or start one) once on the device.
  useEffect(() => {
    const draft = loadDraft(userId);
    let sides: SideCoils = { A: null, B: null };
    if (draft?.version === 1 && draft.values?.clientId) {
      blankRef.current = blankValues(loadRemembered(userId), draft.values.clientId, setup);
      reset(draft.values);
      setTimers({ ...emptyTimers(), ...draft.timers });
      sides = draft.coils ?? sides;
      setPhotos(draft.photos ?? []);
    } else {
      blankRef.current = blankValues(loadRemembered(userId), crypto.randomUUID(), setup);
      reset(blankRef.current);
    }
    // A coil chosen on its own page ("Use as side A/B") takes that side; the address is
    // then cleaned so a reload does not choose it again over a later change.
    for (const side of ["A", "B"] as const) {
      const coil = prefill?.[side];
      if (!coil) continue;
      sides = { ...sides, [side]: coil };
      setValue(side === "A" ? "coilA" : "coilB", coil.code, { shouldDirty: true });
      if (side === "B") setValue("kind", "coil-to-coil", { shouldDirty: true });
    }
    if (prefill?.A || prefill?.B) window.history.replaceState(window.history.state, "", window.location.pathname);
    setCoils(sides);
    setRestored(true);
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [userId]);

  // Keep the draft from the first keystroke (and not before: an untouched form is no draft).
  useEffect(() => {
    if (!restored) return;
    const save = () => {
      const values = getValues();
      if (hasEntries(values, blankRef.current, timers, coils, photos)) saveDraft(userId, { version: 1, values, timers, coils, photos, savedAt: new Date().toISOString() });
      else clearDraft(userId);
    };
    save();
    const sub = watch(() => save());
    return () => sub.unsubscribe();
  }, [restored, timers, coils, photos, userId, getValues, watch]);

  /** Forget the draft and start a new joint, keeping the job, machine and heater. */
  const startNewDraft = (keep: Remembered, extra: Partial<FormIn> = {}) => {
    clearDraft(userId);
    blankRef.current = blankValues(keep, crypto.randomUUID(), setup);
    reset({ ...blankRef.current, ...extra });
    setTimers(emptyTimers());
    setPhotos([]);
  };

  return { form, timers, setTimers, coils, setCoils, photos, setPhotos, restored, startNewDraft };
}
