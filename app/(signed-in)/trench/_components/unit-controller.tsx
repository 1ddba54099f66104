"use client";
// A react-hook-form field in the user's units (canonical SI in the form), see UnitInput.
import type { ReactNode } from "react";
import { Controller, type Control, type FieldValues, type Path } from "react-hook-form";
import type { QuantityKind, UnitSystem } from "@/domain/units/format";
import { UnitInput, type UnitValue } from "./unit-input";

export function UnitController<T extends FieldValues>({
  control,
  name,
  label,
  kind,
  system,
  error,
  hint,
  allowNegative,
  badge,
  note,
  onTyped,
}: {
  control: Control<T, unknown, FieldValues>;
  name: Path<T>;
  label: string;
  kind: QuantityKind;
  system: UnitSystem;
  error?: string;
  hint?: string;
  allowNegative?: boolean;
  /** Shown after the label, from the field's value ("timed", "typed"). */
  badge?: (value: UnitValue) => ReactNode;
  /** Shown under the control, from the field's value (the value judged against the plan). */
  note?: (value: UnitValue) => ReactNode;
  /** Called after each change typed into the field (a typed duration replaces the timed one). */
  onTyped?: () => void;
}) {
  return (
    <Controller
      control={control}
      name={name}
      render={({ field }) => (
        <UnitInput
          id={name}
          label={label}
          kind={kind}
          system={system}
          value={field.value as UnitValue}
          onChange={(v) => {
            field.onChange(v);
            onTyped?.();
          }}
          onBlur={field.onBlur}
          error={error}
          hint={hint}
          allowNegative={allowNegative}
          badge={badge?.(field.value as UnitValue)}
          note={note?.(field.value as UnitValue)}
        />
      )}
    />
  );
}
