"use client";
// Set a person's roles and crew, or deactivate them (their sessions end at once).
// The server refuses to remove the last active administrator.
import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import type { z } from "zod";
import { updatePersonSchema } from "@/domain/crew/schemas";
import type { Role } from "@/domain/roles";
import { updatePersonAction } from "../actions";
import { applyActionResult, errorText } from "@/components/form/controls";
import { FormFrame, type FormOutcome } from "@/components/form/form-frame";
import { CrewSelect, RoleChoices, crewIdValue } from "./person-fields";

type Input = z.input<typeof updatePersonSchema>;
type Output = z.output<typeof updatePersonSchema>;
const FIELDS = ["roles", "isActive", "crewId"] as const;

export function PersonAccessForm({ person, crews }: { person: { id: number; version: number; name: string; roles: Role[]; isActive: boolean; crewId: number | null }; crews: { id: number; name: string }[] }) {
  const router = useRouter();
  const [message, setMessage] = useState<FormOutcome>(null);
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
    <FormFrame label={`Access of ${person.name}`} onSubmit={onSubmit} message={message} isBusy={formState.isSubmitting} submitLabel="Save access" busyLabel="Saving …">
      <input type="hidden" {...register("id")} />
      <input type="hidden" {...register("version")} />
      <RoleChoices id="access-roles" registration={register("roles")} error={errorText(e.roles)} />
      <CrewSelect id="access-crew" registration={register("crewId", { setValueAs: crewIdValue })} error={e.crewId?.message} crews={crews} />
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
    </FormFrame>
  );
}
