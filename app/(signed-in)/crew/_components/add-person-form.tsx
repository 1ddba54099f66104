"use client";
// Add a person: name, e-mail, roles, crew, unit preference and a first password.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { Field } from "@/components/form/field";
import { addPersonSchema, MIN_PASSWORD_LENGTH } from "@/domain/crew/schemas";
import { addPersonAction } from "../actions";
import { SelectField, applyActionResult, errorText } from "@/components/form/controls";
import { FormFrame, type FormOutcome } from "@/components/form/form-frame";
import { CrewSelect, RoleChoices, crewIdValue } from "./person-fields";

type Input = z.input<typeof addPersonSchema>;
type Output = z.output<typeof addPersonSchema>;
const FIELDS = ["name", "email", "roles", "password", "unitSystem", "crewId"] as const;

export function AddPersonForm({ crews }: { crews: { id: number; name: string }[] }) {
  const router = useRouter();
  const [message, setMessage] = useState<FormOutcome>(null);
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
    <FormFrame label="Add a person" onSubmit={onSubmit} message={message} isBusy={formState.isSubmitting} submitLabel="Add person" busyLabel="Adding …">
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="person-name" label="Name" autoComplete="off" {...register("name")} error={e.name?.message} />
        <Field id="person-email" label="E-mail" type="email" autoComplete="off" {...register("email")} error={e.email?.message} />
        <Field id="person-password" label="First password" type="password" autoComplete="new-password" hint={`At least ${MIN_PASSWORD_LENGTH} characters; not a common password or the person's name`} {...register("password")} error={e.password?.message} />
        <CrewSelect id="person-crew" registration={register("crewId", { setValueAs: crewIdValue })} error={e.crewId?.message} crews={crews} />
        <SelectField id="person-units" label="Units" {...register("unitSystem")} error={e.unitSystem?.message}>
          <option value="si">SI (mm, MPa, °C)</option>
          <option value="us">US customary (in, psi, °F)</option>
        </SelectField>
      </div>
      <RoleChoices id="person-roles" registration={register("roles")} error={errorText(e.roles)} />
    </FormFrame>
  );
}
