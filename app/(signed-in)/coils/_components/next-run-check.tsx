"use client";
// "Is there enough left for the next run?" — typed in the person's units, warned in words.
import { useId, useState } from "react";
import { FieldShell } from "@/components/form/field-shell";
import { nextRunWarning } from "@/domain/coils/life";
import { fromDisplay, unitLabel, type UnitSystem } from "@/domain/units/format";

export function NextRunCheck({ coilCode, remainingM, unitSystem }: { coilCode: string; remainingM: number; unitSystem: UnitSystem }) {
  const id = useId();
  const [text, setText] = useState("");
  const value = Number(text.replace(",", "."));
  const runM = text.trim() && Number.isFinite(value) ? fromDisplay(value, "length-m", unitSystem) : null;
  const warning = nextRunWarning({ coilCode, remainingM }, runM, unitSystem);
  return (
    <div className="flex flex-col gap-2">
      <FieldShell id={id} label="Length of the next run" unit={unitLabel("length-m", unitSystem)}>
        {(control) => <input {...control} inputMode="decimal" value={text} onChange={(e) => setText(e.target.value)} aria-describedby={`${id}-result`} className="min-h-touch max-w-xs rounded-md border-2 border-slate-400 bg-white px-3" />}
      </FieldShell>
      <p id={`${id}-result`} role="status" aria-live="polite" className={warning ? "rounded-md border-2 border-caution bg-caution-light p-2 font-semibold text-caution" : "text-sm text-slate-700"}>
        {warning ?? (runM ? "The next run fits on what is left of this coil." : "Type the next run's length to check it against what is left.")}
      </p>
    </div>
  );
}
