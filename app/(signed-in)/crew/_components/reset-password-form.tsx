"use client";
// Reset a person's password; their open sessions end at once.
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Field } from "@/components/form/field";
import { MIN_PASSWORD_LENGTH, resetPasswordSchema } from "@/domain/crew/schemas";
import { resetPasswordAction } from "../actions";
import { applyActionResult } from "@/components/form/controls";
import { FormFrame, type FormOutcome } from "@/components/form/form-frame";

type Input = z.input<typeof resetPasswordSchema>;
type Output = z.output<typeof resetPasswordSchema>;

export function ResetPasswordForm({ person }: { person: { id: number; name: string } }) {
  const [message, setMessage] = useState<FormOutcome>(null);
  const { register, handleSubmit, formState, setError, reset } = useForm<Input, unknown, Output>({ resolver: zodResolver(resetPasswordSchema), defaultValues: { id: person.id } });
  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const result = await resetPasswordAction(values);
    if (result.ok) {
      setMessage({ text: `Password of ${person.name} reset; their open sessions have ended.`, tone: "success" });
      reset({ id: person.id, password: "" });
    } else setMessage({ text: applyActionResult(result, setError, ["password"]) ?? result.message, tone: "error" });
  });
  return (
    <FormFrame label={`Reset the password of ${person.name}`} onSubmit={onSubmit} message={message} isBusy={formState.isSubmitting} submitLabel="Reset password" variant="secondary">
      <input type="hidden" {...register("id")} />
      <Field id="reset-password" label="New password" type="password" autoComplete="new-password" hint={`At least ${MIN_PASSWORD_LENGTH} characters`} {...register("password")} error={formState.errors.password?.message} />
    </FormFrame>
  );
}
