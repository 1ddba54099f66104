"use client";
// Record a production joint of this person found unacceptable by a §192.513 test: the
// person must requalify before making more joints under that procedure.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Field } from "@/components/form/field";
import { recordQualificationFailureSchema } from "@/domain/qualifications/schemas";
import { recordQualificationFailureAction } from "../actions";
import { TextAreaField, applyActionResult } from "@/components/form/controls";
import { FormFrame, type FormOutcome } from "@/components/form/form-frame";
import { ProcedureSelect } from "@/components/form/procedure-select";

type Input = z.input<typeof recordQualificationFailureSchema>;
type Output = z.output<typeof recordQualificationFailureSchema>;
const FIELDS = ["procedureId", "failedOn", "jointId", "notes"] as const;

export function FailureForm({ person, procedures, today }: { person: { id: number; name: string }; procedures: { id: number; label: string }[]; today: string }) {
  const router = useRouter();
  const [message, setMessage] = useState<FormOutcome>(null);
  const { register, handleSubmit, formState, setError, reset } = useForm<Input, unknown, Output>({
    resolver: zodResolver(recordQualificationFailureSchema),
    defaultValues: { userId: person.id, failedOn: today },
  });
  const e = formState.errors;
  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const result = await recordQualificationFailureAction(values);
    if (result.ok) {
      setMessage({ text: `Recorded. ${person.name}: ${result.data.status.reason}.`, tone: "error" });
      reset({ userId: person.id, failedOn: today });
      router.refresh();
    } else setMessage({ text: applyActionResult(result, setError, FIELDS) ?? result.message, tone: "error" });
  });
  return (
    <FormFrame label={`Record a failed production joint of ${person.name}`} onSubmit={onSubmit} message={message} isBusy={formState.isSubmitting} submitLabel="Record failed joint test" variant="danger">
      <input type="hidden" {...register("userId")} />
      <div className="grid gap-4 sm:grid-cols-3">
        <ProcedureSelect id="failure-procedure" registration={register("procedureId")} error={e.procedureId?.message} procedures={procedures} />
        <Field id="failure-date" label="Date the joint failed its test" type="date" max={today} {...register("failedOn")} error={e.failedOn?.message} />
        <Field id="failure-joint" label="Joint id" numeric hint="Optional" {...register("jointId")} error={e.jointId?.message} />
      </div>
      <TextAreaField id="failure-notes" label="What was found" {...register("notes")} error={e.notes?.message} />
    </FormFrame>
  );
}
