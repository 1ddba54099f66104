"use client";
// Set a person's roles and crew, or deactivate them (their sessions end at once).
// The server refuses to remove the last active administrator.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { FormMessage } from "@/components/form/field";
import { Button } from "@/components/ui/button";
import { updatePersonSchema } from "@/domain/crew/schemas";
import { ROLES, ROLE_LABELS, type Role } from "@/domain/roles";
import { updatePersonAction } from "../actions";
import { ChoiceGroup, SelectField, applyActionResult, errorText } from "@/components/form/controls";

type Input = z.input<typeof updatePersonSchema>;
type Output = z.output<typeof updatePersonSchema>;
const FIELDS = ["roles", "isActive", "crewId"] as const;

export function PersonAccessForm({ person, crews }: { person: { id: number; version: number; name: string; roles: Role[]; isActive: boolean; crewId: number | null }; crews: { id: number; name: string }[] }) {
  const router = useRouter();
  const [message, setMessage] = useState<{ text: string; tone: "error" | "success" } | null>(null);
  const { register, handleSubmit, formState, setError } = useForm<Input, unknown, Output>({
    resolver: zodResolver(updatePersonSchema),
    defaultValues: { id: person.id, version: person.version, roles: person.roles, isActive: person.isActive, crewId: person.crewId },
  });
  const e = formState.errors;
  const onSubmit = handleSubmit(async (values) => {
    setMessage(null);
    const result = await updatePersonAction(values);
    if (result.ok) {
      setMessage({ text: `${person.name}'s access saved.`, tone: "success" });
      router.refresh();
    } else setMessage({ text: applyActionResult(result, setError, FIELDS) ?? result.message, tone: "error" });
  });
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label={`Access of ${person.name}`}>
      <input type="hidden" {...register("id")} />
      <input type="hidden" {...register("version")} />
      <ChoiceGroup id="access-roles" legend="Roles" error={errorText(e.roles)}>
        {ROLES.map((r) => (
          <label key={r} className="flex min-h-touch items-center gap-2 rounded-md border-2 border-slate-300 px-3">
            <input type="checkbox" className="h-5 w-5" value={r} {...register("roles")} />
            {ROLE_LABELS[r]}
          </label>
        ))}
      </ChoiceGroup>
      <SelectField id="access-crew" label="Crew" {...register("crewId", { setValueAs: (v) => (v === "" || v === null ? null : Number(v)) })} error={e.crewId?.message}>
        <option value="">No crew (office)</option>
        {crews.map((c) => (
          <option key={c.id} value={c.id}>
            {c.name}
          </option>
        ))}
      </SelectField>
      <div className="flex flex-col gap-1">
        <label className="flex min-h-touch items-center gap-2">
          <input type="checkbox" className="h-5 w-5" aria-describedby={e.isActive ? "access-active-error" : undefined} {...register("isActive")} />
          Active (untick to deactivate: the person is signed out everywhere and cannot sign in)
        </label>
        {e.isActive ? (
          <p id="access-active-error" className="text-sm font-semibold text-fail">
            {e.isActive.message}
          </p>
        ) : null}
      </div>
      <FormMessage message={message?.text} tone={message?.tone} />
      <div>
        <Button type="submit" disabled={formState.isSubmitting}>
          {formState.isSubmitting ? "Saving …" : "Save access"}
        </Button>
      </div>
    </form>
  );
}
