"use client";
// The form of the Trench screen and its draft on the device: react-hook-form with the
// domain's zod schema, restored once from the device, saved on every keystroke and on
// every timer, coil or photo change, and started afresh after a joint is recorded.
// The schema (and zod) is not part of the page's first load: it is fetched once the form is
// usable and awaited by the first check (see schemaResolver).
import { useEffect, useState } from "react";
import { useForm, type Resolver, type UseFormReturn } from "react-hook-form";
import type { RecordJointFormInput, RecordJointFormValues } from "@/domain/joints/schemas";
import type { TimedPhase } from "@/domain/joints/record-words";
import type { PhaseTiming } from "@/domain/joints/timer";
import { clearDraft, emptyTimers, loadDraft, loadRemembered, saveDraft, type PhotoRef, type Remembered } from "../../_client/device-store";
import type { TrenchCoil, TrenchSetup } from "@/app/_server/trench/setup-types";

export type FormIn = RecordJointFormInput;
export type FormOut = RecordJointFormValues;
export type TrenchForm = UseFormReturn<FormIn, unknown, FormOut>;
export type SideCoils = { A: TrenchCoil | null; B: TrenchCoil | null };
export type PhaseTimings = Record<TimedPhase, PhaseTiming>;

let loadingResolver: Promise<Resolver<FormIn, unknown, FormOut>> | null = null;

/** The domain's zod schema as the form's resolver, loaded on first use (a failed load is tried again next time). */
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

export function useTrenchDraft(setup: TrenchSetup) {
  const userId = setup.user.id;
  const [timers, setTimers] = useState<PhaseTimings>(emptyTimers);
  const [coils, setCoils] = useState<SideCoils>({ A: null, B: null });
  const [photos, setPhotos] = useState<PhotoRef[]>([]);
  const [restored, setRestored] = useState(false);

  const form: TrenchForm = useForm<FormIn, unknown, FormOut>({
    resolver: schemaResolver,
    defaultValues: blankValues({}, "", setup),
    mode: "onTouched",
  });
  const { getValues, reset, watch } = form;

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
    setRestored(true);
    // Fetch the schema now, while there may be signal, so a check later needs no network.
    void loadSchemaResolver().catch(() => undefined);
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

  /** Forget the draft and start a new joint, keeping the job, machine and heater. */
  const startNewDraft = (keep: Remembered, extra: Partial<FormIn> = {}) => {
    clearDraft(userId);
    reset({ ...blankValues(keep, crypto.randomUUID(), setup), ...extra });
    setTimers(emptyTimers());
    setPhotos([]);
  };

  return { form, timers, setTimers, coils, setCoils, photos, setPhotos, restored, startNewDraft };
}
