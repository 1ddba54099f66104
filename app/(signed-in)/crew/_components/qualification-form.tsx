"use client";
// Record a qualification or requalification of a person for a procedure (49 CFR 192.285(b)):
// date, test method, the specimen joint's result, the evaluator and optional evidence.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Field } from "@/components/form/field";
import { QUALIFICATION_METHODS, QUALIFICATION_METHOD_LABELS, recordQualificationSchema } from "@/domain/qualifications/schemas";
import { recordQualificationAction } from "../actions";
import { ChoiceGroup, applyActionResult } from "@/components/form/controls";
import { FormFrame, type FormOutcome } from "@/components/form/form-frame";
import { ProcedureSelect } from "@/components/form/procedure-select";
import { FieldShell } from "@/components/form/field-shell";

type Input = z.input<typeof recordQualificationSchema>;
type Output = z.output<typeof recordQualificationSchema>;
const FIELDS = ["procedureId", "qualifiedOn", "method", "specimenResult", "evaluator", "evidence"] as const;

export function QualificationForm({ person, procedures, today }: { person: { id: number; name: string }; procedures: { id: number; label: string }[]; today: string }) {
  const router = useRouter();
  const [file, setFile] = useState<File | null>(null);
  const [fileKey, setFileKey] = useState(0);
  const [message, setMessage] = useState<FormOutcome>(null);
  const { register, handleSubmit, formState, setError, reset } = useForm<Input, unknown, Output>({
    resolver: zodResolver(recordQualificationSchema),
    defaultValues: { userId: person.id, qualifiedOn: today },
  });
  const e = formState.errors as Record<string, { message?: string } | undefined>;
  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const form = new FormData();
    for (const [key, value] of Object.entries(values)) form.set(key, String(value));
    if (file) form.set("evidence", file);
    const result = await recordQualificationAction(form);
    if (result.ok) {
      const s = result.data.status;
      setMessage({ text: `Recorded. ${person.name}: ${s.reason}.`, tone: s.qualified ? "success" : "error" });
      reset({ userId: person.id, qualifiedOn: today });
      setFile(null);
      setFileKey((k) => k + 1);
      router.refresh();
    } else setMessage({ text: applyActionResult(result, setError, FIELDS) ?? result.message, tone: "error" });
  });
  return (
    <FormFrame label={`Record a qualification of ${person.name}`} onSubmit={onSubmit} message={message} isBusy={formState.isSubmitting} submitLabel="Record qualification" busyLabel="Recording …">
      <input type="hidden" {...register("userId")} />
      <div className="grid gap-4 sm:grid-cols-2">
        <ProcedureSelect id="qualification-procedure" registration={register("procedureId")} error={e.procedureId?.message} procedures={procedures} />
        <Field id="qualification-date" label="Qualification date" type="date" max={today} {...register("qualifiedOn")} error={e.qualifiedOn?.message} />
      </div>
      <ChoiceGroup id="qualification-method" legend="Test of the specimen joint" error={e.method?.message}>
        {QUALIFICATION_METHODS.map((m) => (
          <label key={m} className="flex min-h-touch items-center gap-2 rounded-md border-2 border-slate-300 px-3">
            <input type="radio" className="h-5 w-5" value={m} {...register("method")} />
            {QUALIFICATION_METHOD_LABELS[m]}
          </label>
        ))}
      </ChoiceGroup>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="qualification-result" label="Specimen joint's result" hint='For example "3 straps bent, no voids, failure outside the joint"' {...register("specimenResult")} error={e.specimenResult?.message} />
        <Field id="qualification-evaluator" label="Evaluator" hint="The qualified person who examined the specimen" {...register("evaluator")} error={e.evaluator?.message} />
      </div>
      <FieldShell id="qualification-evidence" label="Evidence (optional: PDF, JPEG or PNG, at most 10 MB)" error={e.evidence?.message}>
        {(control) => <input {...control} key={fileKey} onChange={(ev) => setFile(ev.target.files?.[0] ?? null)} type="file" accept="application/pdf,image/jpeg,image/png" className="min-h-touch" />}
      </FieldShell>
    </FormFrame>
  );
}
