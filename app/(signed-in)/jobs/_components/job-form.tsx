"use client";
// Add or edit a job: code, name, place (text and optional coordinates), dates, procedure,
// crew, pipe sizes in use and the coils assigned to it.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import { Field } from "@/components/form/field";
import { createJobSchema } from "@/domain/jobs/schemas";
import { createJobAction, updateJobAction } from "../actions";
import { ChoiceGroup, SelectField, applyActionResult, errorText } from "@/components/form/controls";
import { FormFrame, type FormOutcome } from "@/components/form/form-frame";
import { ProcedureSelect } from "@/components/form/procedure-select";

type Input = z.input<typeof createJobSchema>;
type Output = z.output<typeof createJobSchema>;

export type JobFormOption = { id: number; label: string };
export type JobFormCoil = { id: number; label: string };

const FIELDS = ["code", "name", "place", "latitude", "longitude", "startsOn", "endsOn", "procedureId", "crewId", "pipeSizes", "coilIds"] as const;

export function JobForm({
  procedures,
  crews,
  coils,
  job,
}: {
  procedures: JobFormOption[];
  crews: JobFormOption[];
  coils: JobFormCoil[];
  job?: { id: number; version: number; values: Input };
}) {
  const router = useRouter();
  const [message, setMessage] = useState<FormOutcome>(null);
  const { register, handleSubmit, formState, setError, setValue, control, reset } = useForm<Input, unknown, Output>({
    resolver: zodResolver(createJobSchema),
    defaultValues: job?.values ?? { coilIds: [] },
  });
  const coilIds = useWatch({ control, name: "coilIds" });
  const chosen = new Set((coilIds ?? []).map(Number));
  const toggleCoil = (id: number, on: boolean) => {
    const next = new Set(chosen);
    if (on) next.add(id);
    else next.delete(id);
    setValue("coilIds", [...next], { shouldDirty: true });
  };
  const prefix = job ? `job-${job.id}` : "new-job";

  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const result = job ? await updateJobAction({ ...values, id: job.id, version: job.version }) : await createJobAction(values);
    if (result.ok) {
      setMessage({ text: job ? "Job saved." : `Job ${values.code} added.`, tone: "success" });
      if (!job) reset({ coilIds: [] });
      router.refresh();
    } else {
      setMessage({ text: applyActionResult(result, setError, FIELDS) ?? result.message, tone: "error" });
    }
  });

  const e = formState.errors;
  return (
    <FormFrame label={job ? "Edit job" : "Add a job"} onSubmit={onSubmit} message={message} isBusy={formState.isSubmitting} submitLabel={job ? "Save job" : "Add job"} busyLabel="Saving …">
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id={`${prefix}-code`} label="Job code" {...register("code")} error={e.code?.message} />
        <Field id={`${prefix}-name`} label="Job name" {...register("name")} error={e.name?.message} />
        <Field id={`${prefix}-place`} label="Place" hint="Street, stations or area" {...register("place")} error={e.place?.message} />
        <Field id={`${prefix}-pipe-sizes`} label="Pipe sizes in use" hint='For example "2 IPS SDR 11; 4 IPS SDR 11"' {...register("pipeSizes")} error={e.pipeSizes?.message} />
        <Field id={`${prefix}-latitude`} label="Latitude" unit="°" numeric hint="Optional, decimal degrees" {...register("latitude")} error={e.latitude?.message} />
        <Field id={`${prefix}-longitude`} label="Longitude" unit="°" numeric hint="Optional, decimal degrees" {...register("longitude")} error={e.longitude?.message} />
        <Field id={`${prefix}-starts`} label="Start date" type="date" {...register("startsOn")} error={e.startsOn?.message} />
        <Field id={`${prefix}-ends`} label="End date" type="date" {...register("endsOn")} error={e.endsOn?.message} />
        <ProcedureSelect id={`${prefix}-procedure`} registration={register("procedureId")} error={e.procedureId?.message} procedures={procedures} />
        <SelectField id={`${prefix}-crew`} label="Crew" {...register("crewId")} error={e.crewId?.message}>
          <option value="">No crew yet (any fuser may record)</option>
          {crews.map((c) => (
            <option key={c.id} value={c.id}>
              {c.label}
            </option>
          ))}
        </SelectField>
      </div>
      <ChoiceGroup id={`${prefix}-coils`} legend="Coils assigned to this job" error={errorText(e.coilIds)}>
        {coils.length === 0 ? <p className="text-sm text-slate-700">No coils are free to assign.</p> : null}
        {coils.map((c) => (
          <label key={c.id} className="flex min-h-touch items-center gap-2 rounded-md border-2 border-slate-300 px-3">
            <input type="checkbox" className="h-5 w-5" checked={chosen.has(c.id)} onChange={(ev) => toggleCoil(c.id, ev.target.checked)} />
            {c.label}
          </label>
        ))}
      </ChoiceGroup>
    </FormFrame>
  );
}
