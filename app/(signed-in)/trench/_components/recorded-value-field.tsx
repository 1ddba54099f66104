"use client";
// A recorded value of domain/joints/values as a Trench field: its prompt, unit kind and
// hint come from the table (the record schema enforces the table's bounds), so a new
// value asked for at the trench needs one row there and no field written here.
import type { ReactNode } from "react";
import type { Control } from "react-hook-form";
import type { RecordJointFormInput, RecordJointFormValues } from "@/domain/joints/schemas";
import { QUANTITY_VALUES, type QuantityValueDefinition, type QuantityValueKey, type TrenchStep } from "@/domain/joints/values";
import type { UnitSystem } from "@/domain/units/format";
import { UnitController } from "./unit-controller";
import type { UnitValue } from "./unit-input";

/** The values typed in one step of the Trench form, in the table's order. */
export function quantitiesAskedIn(step: TrenchStep): QuantityValueDefinition[] {
  return QUANTITY_VALUES.filter((d) => d.step === step);
}

export function RecordedValueField({
  definition,
  control,
  system,
  error,
  hint = definition.hint,
  badge,
  onTyped,
}: {
  definition: QuantityValueDefinition;
  control: Control<RecordJointFormInput, unknown, RecordJointFormValues>;
  system: UnitSystem;
  error?: string;
  /** Replaces the table's hint where the screen knows better (the timer's fields). */
  hint?: string;
  badge?: (value: UnitValue) => ReactNode;
  onTyped?: () => void;
}) {
  return <UnitController control={control} name={definition.key as QuantityValueKey} label={definition.prompt} kind={definition.quantity} system={system} error={error} hint={hint} badge={badge} onTyped={onTyped} />;
}
