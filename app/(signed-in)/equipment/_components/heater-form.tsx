"use client";
// Add or edit a heater plate (asset tag, description, how often its surface temperature
// must be checked).
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Field } from "@/components/form/field";
import { type FormOutcome } from "@/components/form/form-frame";
import { createHeaterSchema } from "@/domain/equipment/schemas";
import { createHeaterAction, updateHeaterAction } from "../actions";
import { AssetFields } from "./asset-fields";
import { AssetFormFrame } from "./asset-form-frame";
import { applyActionResult } from "@/components/form/controls";

type Input = z.input<typeof createHeaterSchema>;
type Output = z.output<typeof createHeaterSchema>;
const FIELDS = ["assetTag", "description", "checkIntervalDays", "isActive"] as const;

export function HeaterForm({ heater }: { heater?: { id: number; version: number; isActive: boolean; values: Input } }) {
  const router = useRouter();
  const [message, setMessage] = useState<FormOutcome>(null);
  const [isActive, setIsActive] = useState(heater?.isActive ?? true);
  const { register, handleSubmit, formState, setError, reset } = useForm<Input, unknown, Output>({
    resolver: zodResolver(createHeaterSchema),
    defaultValues: heater?.values ?? { checkIntervalDays: "1" },
  });
  const prefix = heater ? `heater-${heater.id}` : "new-heater";
  const e = formState.errors;
  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const result = heater ? await updateHeaterAction({ ...values, id: heater.id, version: heater.version, isActive }) : await createHeaterAction(values);
    if (result.ok) {
      setMessage({ text: heater ? "Heater plate saved." : `Heater plate ${values.assetTag} added.`, tone: "success" });
      if (!heater) reset({ checkIntervalDays: "1" });
      router.refresh();
    } else setMessage({ text: applyActionResult(result, setError, FIELDS) ?? result.message, tone: "error" });
  });
  return (
    <AssetFormFrame noun="heater plate" shortNoun="plate" isEdit={Boolean(heater)} onSubmit={onSubmit} message={message} isBusy={formState.isSubmitting} isActive={isActive} onActiveChange={setIsActive}>
      <div className="grid gap-4 sm:grid-cols-3">
        <AssetFields prefix={prefix} tag={register("assetTag")} description={register("description")} errors={{ assetTag: e.assetTag?.message, description: e.description?.message }} />
        <Field id={`${prefix}-interval`} label="Check interval" unit="days" numeric hint="1 = a check every working day, before the first joint" {...register("checkIntervalDays")} error={e.checkIntervalDays?.message} />
      </div>
    </AssetFormFrame>
  );
}
