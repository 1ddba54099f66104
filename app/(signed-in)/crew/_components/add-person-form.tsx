"use client";
// Add a person: name, e-mail, roles, crew, unit preference and a first password.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Field, FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { addPersonSchema, MIN_PASSWORD_LENGTH } from "@/domain/crew/schemas";
import { ROLES, ROLE_LABELS } from "@/domain/roles";
import { addPersonAction } from "../actions";
import { ChoiceGroup, SelectField, applyActionResult, errorText } from "@/components/form/controls";

type Input = z.input<typeof addPersonSchema>;
type Output = z.output<typeof addPersonSchema>;
const FIELDS = ["name", "email", "roles", "password", "unitSystem", "crewId"] as const;

export function AddPersonForm({ crews }: { crews: { id: number; name: string }[] }) {
  const router = useRouter();
  const [message, setMessage] = useState<{ text: string; tone: "error" | "success" } | null>(null);
  const { register, handleSubmit, formState, setError, reset } = useForm<Input, unknown, Output>({
    resolver: zodResolver(addPersonSchema),
    defaultValues: { roles: [], unitSystem: "si", crewId: null },
  });
  const e = formState.errors;
  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const result = await addPersonAction(values);
    if (result.ok) {
      setMessage({ text: `${values.name} added. Give them their password in person.`, tone: "success" });
      reset({ roles: [], unitSystem: "si", crewId: null });
      router.refresh();
    } else setMessage({ text: applyActionResult(result, setError, FIELDS) ?? result.message, tone: "error" });
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Add a person">
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="person-name" label="Name" autoComplete="off" {...register("name")} error={e.name?.message} />
        <Field id="person-email" label="E-mail" type="email" autoComplete="off" {...register("email")} error={e.email?.message} />
        <Field id="person-password" label="First password" type="password" autoComplete="new-password" hint={`At least ${MIN_PASSWORD_LENGTH} characters; not a common password or the person's name`} {...register("password")} error={e.password?.message} />
        <SelectField id="person-crew" label="Crew" {...register("crewId", { setValueAs: (v) => (v === "" || v === null ? null : Number(v)) })} error={e.crewId?.message}>
          <option value="">No crew (office)</option>
          {crews.map((c) => (
            <option key={c.id} value={c.id}>
              {c.name}
            </option>
          ))}
        </SelectField>
        <SelectField id="person-units" label="Units" {...register("unitSystem")} error={e.unitSystem?.message}>
          <option value="si">SI (mm, MPa, °C)</option>
          <option value="us">US customary (in, psi, °F)</option>
        </SelectField>
      </div>
      <ChoiceGroup id="person-roles" legend="Roles" error={errorText(e.roles)}>
        {ROLES.map((r) => (
          <label key={r} className="flex min-h-touch items-center gap-2 rounded-md border-2 border-slate-300 px-3">
            <input type="checkbox" className="h-5 w-5" value={r} {...register("roles")} />
            {ROLE_LABELS[r]}
          </label>
        ))}
      </ChoiceGroup>
      <FormMessage message={message?.text} tone={message?.tone} />
      <div>
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Adding …" : "Add person"}
        </Button>
      </div>
    </form>
  );
}
