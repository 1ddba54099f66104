import type { SelectHTMLAttributes } from "react";

/** A labelled select with a 44 px target and its error tied by aria-describedby. */
export function SelectField({ id, label, error, hint, children, ...props }: SelectHTMLAttributes<HTMLSelectElement> & { id: string; label: string; error?: string; hint?: string }) {
  const describedBy = [error ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-semibold text-ink">
        {label}
      </label>
      <select id={id} aria-invalid={error ? true : undefined} aria-describedby={describedBy} {...props} className={`min-h-touch w-full rounded-md border-2 bg-white px-3 py-2 text-base ${error ? "border-fail" : "border-slate-400"}`}>
        {children}
      </select>
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
