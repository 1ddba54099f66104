"use client";
// A recorded value of domain/joints/values as a Trench field: its prompt, unit kind and
// hint come from the table (the record schema enforces the table's bounds), so a new
// value asked for at the trench needs one row there and no field written here. Once the
// plan is known, the value is judged as it is typed (domain/fusion/judge: the joint
// check's own rule for that value) and the judgement is shown under the field in words
// with an icon; the server's check when the joint is recorded stays the record.
import type { ReactNode } from "react";
import type { Control } from "react-hook-form";
import type { CheckJointOptions } from "@/domain/fusion/check";
import type { ValueJudgement, ValueVerdict } from "@/domain/fusion/judge";
import type { FusionPlan } from "@/domain/fusion/plan";
import type { RecordJointFormInput, RecordJointFormValues } from "@/domain/joints/schemas";
import { QUANTITY_VALUES, type QuantityValueDefinition, type QuantityValueKey, type TrenchStep } from "@/domain/joints/values";
import type { UnitSystem } from "@/domain/units/format";
import { UnitController } from "./unit-controller";
import { useFusionTools } from "../_client/load-fusion-tools";
import type { UnitValue } from "./unit-input";

/** The values typed in one step of the Trench form, in the table's order. */
export function quantitiesAskedIn(step: TrenchStep): QuantityValueDefinition[] {
  return QUANTITY_VALUES.filter((d) => d.step === step);
}

const ICONS: Record<ValueVerdict, { icon: string; tone: string }> = {
  inside: { icon: "✓", tone: "text-pass" },
  above: { icon: "▲", tone: "text-fail" },
  below: { icon: "▼", tone: "text-fail" },
};

/** The judgement of one value in words, with an icon (not colour alone). */
export function ValueJudgementNote({ judged }: { judged: ValueJudgement }) {
  const { icon, tone } = ICONS[judged.verdict];
  return (
    <span className={`inline-flex items-center gap-2 text-base ${tone}`} data-verdict={judged.verdict}>
      <span aria-hidden="true" className="text-lg leading-none">
        {icon}
      </span>
      {judged.text}
    </span>
  );
}

export function RecordedValueField({
  definition,
  control,
  system,
  error,
  hint = definition.hint,
  badge,
  onTyped,
  plan,
  judgeOptions,
}: {
  definition: QuantityValueDefinition;
  control: Control<RecordJointFormInput, unknown, RecordJointFormValues>;
  system: UnitSystem;
  error?: string;
  /** Replaces the table's hint where the screen knows better (the timer's fields). */
  hint?: string;
  badge?: (value: UnitValue) => ReactNode;
  onTyped?: () => void;
  /** The plan to judge the value against as it is typed; none until the plan is known. */
  plan?: FusionPlan | null;
  judgeOptions?: CheckJointOptions;
}) {
  const key = definition.key as QuantityValueKey;
  const tools = useFusionTools();
  const note = (value: UnitValue) => {
    const judged = plan && tools && typeof value === "number" ? tools.judgeValue(plan, key, value, judgeOptions ?? { system }) : null;
    return judged ? <ValueJudgementNote judged={judged} /> : null;
  };
  return <UnitController control={control} name={key} label={definition.prompt} kind={definition.quantity} system={system} error={error} hint={hint} badge={badge} note={note} onTyped={onTyped} />;
}
