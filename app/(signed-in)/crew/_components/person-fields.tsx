// Blocks the crew forms share: the roles a person holds and the crew they belong to.
import type { UseFormRegisterReturn } from "react-hook-form";
import { ChoiceGroup, SelectField } from "@/components/form/controls";
import { ROLES, ROLE_LABELS } from "@/domain/roles";

export function RoleChoices({ id, registration, error }: { id: string; registration: UseFormRegisterReturn; error?: string }) {
  return (
    <ChoiceGroup id={id} legend="Roles" error={error}>
      {ROLES.map((r) => (
        <label key={r} className="flex min-h-touch items-center gap-2 rounded-md border-2 border-slate-300 px-3">
          <input type="checkbox" className="h-5 w-5" value={r} {...registration} />
          {ROLE_LABELS[r]}
        </label>
      ))}
    </ChoiceGroup>
  );
}

/** A crew, or none for office staff; the form value is the crew id or null. */
export function CrewSelect({ id, registration, error, crews }: { id: string; registration: UseFormRegisterReturn; error?: string; crews: { id: number; name: string }[] }) {
  return (
    <SelectField id={id} label="Crew" {...registration} error={error}>
      <option value="">No crew (office)</option>
      {crews.map((c) => (
        <option key={c.id} value={c.id}>
          {c.name}
        </option>
      ))}
    </SelectField>
  );
}

/** Parses the crew select's value: "" is no crew. */
export const crewIdValue = (v: unknown) => (v === "" || v === null ? null : Number(v));
