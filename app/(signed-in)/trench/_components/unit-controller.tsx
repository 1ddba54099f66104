"use client";
// A react-hook-form field in the user's units (canonical SI in the form), see UnitInput.
import { Controller, type Control, type FieldValues, type Path } from "react-hook-form";
import type { QuantityKind, UnitSystem } from "@/domain/units/format";
import { UnitInput } from "./unit-input";

export function UnitController<T extends FieldValues>({ control, name, label, kind, system, error, hint, allowNegative }: { control: Control<T, unknown, FieldValues>; name: Path<T>; label: string; kind: QuantityKind; system: UnitSystem; error?: string; hint?: string; allowNegative?: boolean }) {
  return (
    <Controller
      control={control}
      name={name}
      render={({ field }) => <UnitInput id={name} label={label} kind={kind} system={system} value={field.value as number | undefined} onChange={field.onChange} onBlur={field.onBlur} error={error} hint={hint} allowNegative={allowNegative} />}
    />
  );
}
