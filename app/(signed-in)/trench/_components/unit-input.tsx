"use client";
// A number field in the user's units that hands the form canonical SI: what the person
// types stays as typed on screen; the form value is converted with domain/units. Text that
// is not a number is passed on as text, so the schema says "must be a number".
import { useState } from "react";
import { Field } from "@/components/form/field";
import { displayDecimals, fromDisplay, roundTo, toDisplay, unitLabel, type QuantityKind, type UnitSystem } from "@/domain/units/format";

function parse(text: string): number | null {
  const t = text.trim().replace(",", ".").replace("−", "-");
  if (t === "" || !/^[-+]?(\d+\.?\d*|\.\d+)$/.test(t)) return null;
  return Number(t);
}

/** SI → text in the user's units, one decimal more than the display rounding, no trailing zeros. */
export function displayText(valueSi: number, kind: QuantityKind, system: UnitSystem): string {
  const decimals = kind === "duration" ? 0 : displayDecimals(kind, system) + 1;
  return String(roundTo(toDisplay(valueSi, kind, system), decimals));
}

export type UnitValue = number | string | null | undefined;

export function UnitInput({
  id,
  label,
  kind,
  system,
  value,
  onChange,
  onBlur,
  error,
  hint,
  unit,
  allowNegative = false,
  badge,
  note,
}: {
  id: string;
  label: string;
  kind: QuantityKind;
  system: UnitSystem;
  value: UnitValue;
  onChange: (value: number | string | undefined) => void;
  onBlur?: () => void;
  error?: string;
  hint?: string;
  unit?: string;
  allowNegative?: boolean;
  badge?: React.ReactNode;
  /** Shown under the control and tied to it (the value judged against the plan). */
  note?: React.ReactNode;
}) {
  const [text, setText] = useState(() => (typeof value === "number" ? displayText(value, kind, system) : typeof value === "string" ? value : ""));

  // Follow changes made elsewhere (draft restored, timer ended, form reset): adjust the
  // text while rendering when the value moved away from what the text says.
  const [seen, setSeen] = useState<UnitValue>(value);
  if (!Object.is(seen, value)) {
    setSeen(value);
    const typed = parse(text);
    if (typeof value === "number") {
      const typedSi = typed === null ? null : fromDisplay(typed, kind, system);
      if (typedSi === null || Math.abs(typedSi - value) > 1e-9 * Math.max(1, Math.abs(value))) setText(displayText(value, kind, system));
    } else if ((value === undefined || value === null) && typed !== null) {
      setText("");
    }
  }

  const change = (next: string) => {
    setText(next);
    const n = parse(next);
    if (next.trim() === "") onChange(undefined);
    else if (n === null) onChange(next);
    else onChange(fromDisplay(n, kind, system));
  };

  return (
    <div className="flex flex-col gap-1">
      <Field
        id={id}
        label={
          <>
            {label}
            {badge ? <span className="ml-2">{badge}</span> : null}
          </>
        }
        unit={unit ?? unitLabel(kind, system)}
        numeric
        type="text"
        autoComplete="off"
        value={text}
        onChange={(e) => change(e.target.value)}
        onBlur={onBlur}
        error={error}
        hint={hint}
        note={note}
      />
      {allowNegative ? (
        <button
          type="button"
          className="min-h-touch self-start rounded-md border-2 border-slate-400 bg-white px-3 text-sm font-semibold text-ink"
          onClick={() => {
            const n = parse(text);
            change(n === null ? "-" : String(-n));
          }}
        >
          Below zero / above zero (±)
        </button>
      ) : null}
    </div>
  );
}
