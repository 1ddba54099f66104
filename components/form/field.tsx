import type { InputHTMLAttributes, ReactNode } from "react";
import { controlBorder, FieldShell } from "./field-shell";

/**
 * A labelled input with its unit beside it and its error tied by aria-describedby.
 * Numbers open a numeric keypad (inputMode decimal) when `numeric` is set.
 */
export function Field({
  id,
  label,
  unit,
  error,
  hint,
  note,
  numeric,
  className = "",
  ...input
}: InputHTMLAttributes<HTMLInputElement> & { id: string; label: ReactNode; unit?: string; error?: string; hint?: ReactNode; note?: ReactNode; numeric?: boolean }) {
  return (
    <FieldShell id={id} label={label} unit={unit} hint={hint} note={note} error={error} className={className}>
      {(control) => (
        <input
          {...control}
          inputMode={numeric ? "decimal" : input.inputMode}
          {...input}
          className={`min-h-touch w-full rounded-md border-2 px-3 py-2 text-base ${controlBorder(error)} bg-white focus:border-brand`}
        />
      )}
    </FieldShell>
  );
}

/** The form-level message, announced to screen readers. */
export function FormMessage({ message, tone = "error" }: { message?: string | null; tone?: "error" | "success" | "info" }) {
  const colours = { error: "bg-fail-light text-fail border-fail", success: "bg-pass-light text-pass border-pass", info: "bg-brand-light text-brand-dark border-brand" };
  return (
    <div aria-live="polite" role="status" className="min-h-0">
      {message ? <p className={`rounded-md border-2 px-3 py-2 font-semibold ${colours[tone]}`}>{message}</p> : null}
    </div>
  );
}
