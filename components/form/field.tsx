import type { InputHTMLAttributes, ReactNode } from "react";

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
  numeric,
  className = "",
  ...input
}: InputHTMLAttributes<HTMLInputElement> & { id: string; label: ReactNode; unit?: string; error?: string; hint?: string; numeric?: boolean }) {
  const describedBy = [error ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className={`flex flex-col gap-1 ${className}`}>
      <label htmlFor={id} className="text-sm font-semibold text-ink">
        {label}
        {unit ? <span className="ml-1 font-normal text-slate-700">({unit})</span> : null}
      </label>
      <div className="flex items-center gap-2">
        <input
          id={id}
          aria-invalid={error ? true : undefined}
          aria-describedby={describedBy}
          inputMode={numeric ? "decimal" : input.inputMode}
          {...input}
          className={`min-h-touch w-full rounded-md border-2 px-3 py-2 text-base ${error ? "border-fail" : "border-slate-400"} bg-white focus:border-brand`}
        />
        {unit ? <span className="shrink-0 text-sm text-slate-700" aria-hidden="true">{unit}</span> : null}
      </div>
      {hint ? (
        <p id={`${id}-hint`} className="text-sm text-slate-700">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} className="text-sm font-semibold text-fail">
          {error}
        </p>
      ) : null}
    </div>
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
