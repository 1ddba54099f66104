"use client";
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Field, FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { safeNextPath } from "@/domain/crew/next-path";
import { signInSchema } from "@/domain/crew/schemas";
import { signInAction } from "../actions";

type Input = z.input<typeof signInSchema>;
type Output = z.output<typeof signInSchema>;

export function SignInForm({ next }: { next: string }) {
  const [message, setMessage] = useState<string | null>(null);
  const { register, handleSubmit, formState } = useForm<Input, unknown, Output>({ resolver: zodResolver(signInSchema) });
  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const result = await signInAction({ ...values, next });
    // Checked again here against this page's own origin: only a path on Beadline is followed.
    if (result.ok) window.location.assign(safeNextPath(result.data.next, window.location.origin));
    else setMessage(result.message);
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4">
      <Field id="email" label="E-mail" type="email" autoComplete="username" {...register("email")} error={formState.errors.email?.message} />
      <Field id="password" label="Password" type="password" autoComplete="current-password" {...register("password")} error={formState.errors.password?.message} />
      <FormMessage message={message} />
      <Button type="submit" disabled={formState.isSubmitting}>
        {formState.isSubmitting ? "Signing in …" : "Sign in"}
      </Button>
    </form>
  );
}
