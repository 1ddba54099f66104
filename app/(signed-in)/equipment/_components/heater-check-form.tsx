"use client";
// Record a heater plate's surface-temperature check: the instrument, readings at several
// points of each face, judged against the chosen procedure's heater window.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import type { z } from "zod";
import { Field } from "@/components/form/field";
import { MAX_POINTS_PER_FACE, recordHeaterCheckSchema } from "@/domain/equipment/schemas";
import { formatRange, unitLabel, type UnitSystem } from "@/domain/units/format";
import { recordHeaterCheckAction } from "../actions";
import { SelectField, TextAreaField, applyActionResult, errorText } from "@/components/form/controls";
import { FormFrame, type FormOutcome } from "@/components/form/form-frame";

type Input = z.input<typeof recordHeaterCheckSchema>;
type Output = z.output<typeof recordHeaterCheckSchema>;
const FIELDS = ["procedureId", "instrument", "faceA", "faceB", "notes", "heaterId"] as const;
const POINTS = 4;

export function HeaterCheckForm({
  heater,
  units,
  procedures,
}: {
  heater: { id: number; assetTag: string };
  units: UnitSystem;
  procedures: { id: number; label: string; minC: number; maxC: number }[];
}) {
  const router = useRouter();
  const [message, setMessage] = useState<FormOutcome>(null);
  const { register, handleSubmit, formState, setError, reset, getValues, control } = useForm<Input, unknown, Output>({
    resolver: zodResolver(recordHeaterCheckSchema),
    defaultValues: { units, heaterId: heater.id, procedureId: procedures[0]?.id, faceA: Array(POINTS).fill(""), faceB: Array(POINTS).fill("") },
  });
  const procedureId = useWatch({ control, name: "procedureId" });
  const temp = unitLabel("temperature", units);
  const chosen = procedures.find((p) => String(p.id) === String(procedureId));
  const e = formState.errors;
  const onSubmit = handleSubmit(async () => {
    setMessage(null);
    const result = await recordHeaterCheckAction(getValues());
    if (result.ok) {
      const d = result.data;
      setMessage(
        d.passed
          ? { text: `Check passed: every reading is inside ${formatRange(d.windowMinC, d.windowMaxC, "temperature", units)}. Next check due ${d.nextDueOn}.`, tone: "success" }
          : { text: `Check failed — heater plate ${heater.assetTag} is flagged until a check passes. ${d.misses.join("; ")}.`, tone: "error" },
      );
      reset({ units, heaterId: heater.id, procedureId: getValues("procedureId"), instrument: getValues("instrument"), faceA: Array(POINTS).fill(""), faceB: Array(POINTS).fill("") });
      router.refresh();
    } else setMessage({ text: applyActionResult(result, setError, FIELDS) ?? result.message, tone: "error" });
  });
  const face = (name: "faceA" | "faceB", letter: string) => (
    <fieldset className="flex flex-col gap-2" aria-describedby={e[name] ? `check-${name}-error` : undefined}>
      <legend className="text-sm font-semibold">
        Face {letter} surface temperatures ({temp}), at least 3 points
      </legend>
      <div className="grid grid-cols-2 gap-2 sm:grid-cols-4">
        {Array.from({ length: Math.min(POINTS, MAX_POINTS_PER_FACE) }, (_, i) => (
          <Field key={i} id={`check-${name}-${i}`} label={`Face ${letter} point ${i + 1}`} unit={temp} numeric {...register(`${name}.${i}` as const)} />
        ))}
      </div>
      {e[name] ? (
        <p id={`check-${name}-error`} className="text-sm font-semibold text-fail">
          {errorText(e[name])}
        </p>
      ) : null}
    </fieldset>
  );
  return (
    <FormFrame label={`Record a surface-temperature check of ${heater.assetTag}`} onSubmit={onSubmit} message={message} isBusy={formState.isSubmitting} submitLabel="Record heater check" busyLabel="Recording …">
      <input type="hidden" {...register("units")} />
      <input type="hidden" {...register("heaterId")} />
      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField
          id="check-procedure"
          label="Procedure whose heater window applies"
          hint={chosen ? `Heater window ${formatRange(chosen.minC, chosen.maxC, "temperature", units)}` : undefined}
          {...register("procedureId")}
          error={e.procedureId?.message}
        >
          {procedures.map((p) => (
            <option key={p.id} value={p.id}>
              {p.label}
            </option>
          ))}
        </SelectField>
        <Field id="check-instrument" label="Instrument" hint="Pyrometer or surface thermometer, with its id" {...register("instrument")} error={e.instrument?.message} />
      </div>
      {face("faceA", "A")}
      {face("faceB", "B")}
      <TextAreaField id="check-notes" label="Notes" {...register("notes")} error={e.notes?.message} />
    </FormFrame>
  );
}
