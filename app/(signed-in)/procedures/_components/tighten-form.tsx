"use client";
// Publish a tightened version of a procedure: narrow one or more windows (in the person's
// units), add a note. The domain's deriveProcedure refuses anything that loosens; the
// version looked at is superseded, never changed.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useEffect, useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Field, FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { SHELTER_RULE_FORM_FIELDS, TIGHTENING_FORM_FIELDS, tightenProcedureSchema, type ShelterRuleField, type TighteningFormField } from "@/domain/procedures/schemas";
import { SHELTER_LABELS, SHELTERS } from "@/domain/joints/shelters";
import { publishProcedureVersionAction } from "../actions";
import { SelectField, TextAreaField, applyActionResult } from "@/components/form/controls";
import type { UnitSystem } from "@/domain/units/format";

type Input = z.input<typeof tightenProcedureSchema>;
type Output = z.output<typeof tightenProcedureSchema>;
const FIELDS = [...TIGHTENING_FORM_FIELDS, ...SHELTER_RULE_FORM_FIELDS, "note", "label", "basedOnVersionId", "procedureId"] as const;

export type TighteningFieldView = { key: TighteningFormField; label: string; unit: string; current: string };
export type ShelterRuleView = { key: ShelterRuleField; label: string; current: string };

export function TightenForm({
  procedure,
  units,
  fields,
  shelterRules = [],
}: {
  procedure: { id: number; code: string; currentVersionId: number; currentVersionNo: number };
  units: UnitSystem;
  fields: TighteningFieldView[];
  shelterRules?: ShelterRuleView[];
}) {
  const router = useRouter();
  const [message, setMessage] = useState<{ text: string; tone: "error" | "success" } | null>(null);
  const { register, handleSubmit, formState, setError, getValues, reset } = useForm<Input, unknown, Output>({
    resolver: zodResolver(tightenProcedureSchema),
    defaultValues: { units, procedureId: procedure.id, basedOnVersionId: procedure.currentVersionId },
  });
  // After a publish the page refreshes with a new current version: start from it, keeping
  // the confirmation on screen (a remount would drop it).
  useEffect(() => {
    reset({ units, procedureId: procedure.id, basedOnVersionId: procedure.currentVersionId });
  }, [reset, units, procedure.id, procedure.currentVersionId]);
  const e = formState.errors as Record<string, { message?: string } | undefined>;
  const onSubmit = handleSubmit(async () => {
    setMessage(null);
    const result = await publishProcedureVersionAction(getValues());
    if (result.ok) {
      setMessage({ text: `Version ${result.data.versionNo} of ${procedure.code} published; version ${procedure.currentVersionNo} is superseded and stays on record for its joints.`, tone: "success" });
      router.refresh();
    } else setMessage({ text: applyActionResult(result, setError, FIELDS) ?? result.message, tone: "error" });
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label={`Publish a tightened version of ${procedure.code}`}>
      <input type="hidden" {...register("units")} />
      <input type="hidden" {...register("procedureId")} />
      <input type="hidden" {...register("basedOnVersionId")} />
      <p className="text-sm">Leave a field blank to keep it as in version {procedure.currentVersionNo}. A minimum may only rise and a maximum only fall.</p>
      <div className="grid gap-4 sm:grid-cols-2">
        {fields.map((f) => (
          <Field key={f.key} id={`tighten-${f.key}`} label={f.label} unit={f.unit} numeric hint={`Now: ${f.current}`} {...register(f.key)} error={e[f.key]?.message} />
        ))}
        {shelterRules.map((f) => (
          <SelectField key={f.key} id={`tighten-${f.key}`} label={f.label} hint={`Now: ${f.current}`} {...register(f.key)} error={e[f.key]?.message}>
            <option value="">Keep as it is</option>
            {SHELTERS.filter((s) => s !== "none").map((s) => (
              <option key={s} value={s}>
                At least: {SHELTER_LABELS[s]}
              </option>
            ))}
          </SelectField>
        ))}
      </div>
      <Field id="tighten-label" label="Version label" hint="Optional; a label is made from the procedure code otherwise" {...register("label")} error={e.label?.message} />
      <TextAreaField id="tighten-note" label="Note on the change" {...register("note")} error={e.note?.message} />
      <FormMessage message={message?.text ?? e._form?.message} tone={message?.tone ?? "error"} />
      <div>
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Publishing …" : "Publish new version"}
        </Button>
      </div>
    </form>
  );
}
