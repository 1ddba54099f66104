"use client";
// Add an operator procedure based on a published standard; its version 1 carries the
// standard's windows unchanged.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Field } from "@/components/form/field";
import { createProcedureSchema } from "@/domain/procedures/schemas";
import { createProcedureAction } from "../actions";
import { SelectField, TextAreaField, applyActionResult } from "@/components/form/controls";
import { FormFrame, type FormOutcome } from "@/components/form/form-frame";

type Input = z.input<typeof createProcedureSchema>;
type Output = z.output<typeof createProcedureSchema>;
const FIELDS = ["code", "name", "standard", "notes"] as const;

export function AddProcedureForm({ standards }: { standards: { id: string; label: string }[] }) {
  const router = useRouter();
  const [message, setMessage] = useState<FormOutcome>(null);
  const { register, handleSubmit, formState, setError, reset } = useForm<Input, unknown, Output>({ resolver: zodResolver(createProcedureSchema) });
  const e = formState.errors;
  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const result = await createProcedureAction(values);
    if (result.ok) {
      setMessage({ text: `Procedure ${values.code} added with version 1.`, tone: "success" });
      reset();
      router.refresh();
    } else setMessage({ text: applyActionResult(result, setError, FIELDS) ?? result.message, tone: "error" });
  });
  return (
    <FormFrame label="Add a procedure" onSubmit={onSubmit} message={message} isBusy={formState.isSubmitting} submitLabel="Add procedure" busyLabel="Adding …">
      <div className="grid gap-4 sm:grid-cols-3">
        <Field id="procedure-code" label="Procedure code" {...register("code")} error={e.code?.message} />
        <Field id="procedure-name" label="Procedure name" {...register("name")} error={e.name?.message} />
        <SelectField id="procedure-standard" label="Based on" {...register("standard")} error={e.standard?.message}>
          <option value="">Choose a published standard …</option>
          {standards.map((s) => (
            <option key={s.id} value={s.id}>
              {s.label}
            </option>
          ))}
        </SelectField>
      </div>
      <TextAreaField id="procedure-notes" label="Notes for version 1" {...register("notes")} error={e.notes?.message} />
    </FormFrame>
  );
}
