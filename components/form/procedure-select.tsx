// The procedure picker of the crew forms (qualification, failed test) and the job form.
import type { UseFormRegisterReturn } from "react-hook-form";
import { SelectField } from "./controls";

export function ProcedureSelect({ id, registration, error, procedures }: { id: string; registration: UseFormRegisterReturn; error?: string; procedures: { id: number; label: string }[] }) {
  return (
    <SelectField id={id} label="Procedure" {...registration} error={error}>
      <option value="">Choose a procedure …</option>
      {procedures.map((p) => (
        <option key={p.id} value={p.id}>
          {p.label}
        </option>
      ))}
    </SelectField>
  );
}
