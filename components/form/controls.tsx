"use client";
// Small form pieces shared by the screens (Jobs, Equipment, Procedures, Crew, Trench):
// a labelled select and text area with their errors tied by aria-describedby, and the
// step that copies an action's per-field errors into react-hook-form.
import type { ReactNode, SelectHTMLAttributes, TextareaHTMLAttributes } from "react";
import type { FieldValues, Path, UseFormSetError } from "react-hook-form";
import type { ActionResult } from "@/domain/result";
import { controlBorder, FieldShell } from "./field-shell";

export function SelectField({
  id,
  label,
  error,
  hint,
  className = "",
  children,
  ...select
}: SelectHTMLAttributes<HTMLSelectElement> & { id: string; label: ReactNode; error?: string; hint?: ReactNode; children: ReactNode }) {
  return (
    <FieldShell id={id} label={label} hint={hint} error={error} className={className}>
      {(control) => (
        <select {...control} {...select} className={`min-h-touch w-full rounded-md border-2 bg-white px-3 py-2 text-base ${controlBorder(error)}`}>
          {children}
        </select>
      )}
    </FieldShell>
  );
}

export function TextAreaField({
  id,
  label,
  error,
  hint,
  className = "",
  ...area
}: TextareaHTMLAttributes<HTMLTextAreaElement> & { id: string; label: ReactNode; error?: string; hint?: ReactNode }) {
  return (
    <FieldShell id={id} label={label} hint={hint} error={error} className={className}>
      {(control) => <textarea {...control} rows={3} {...area} className={`w-full rounded-md border-2 bg-white px-3 py-2 text-base ${controlBorder(error)}`} />}
    </FieldShell>
  );
}

/**
 * A group of checkboxes or radios with a legend and one error line. `options` "fill" puts
 * the choices on one row, sharing its width (the Trench's large yes/no buttons).
 */
export function ChoiceGroup({ legend, error, id, options = "wrap", children }: { legend: ReactNode; error?: string; id: string; options?: "wrap" | "fill"; children: ReactNode }) {
  return (
    <fieldset className="flex flex-col gap-1" aria-invalid={error ? true : undefined} aria-describedby={error ? `${id}-error` : undefined}>
      <legend className="text-sm font-semibold text-ink">{legend}</legend>
      <div className={options === "fill" ? "flex gap-2" : "flex flex-wrap gap-3"}>{children}</div>
      {error ? (
        <p id={`${id}-error`} className="text-sm font-semibold text-fail">
          {error}
        </p>
      ) : null}
    </fieldset>
  );
}

/**
 * After a server action: on failure put each field's first message on its input (names
 * the action could not place go into the form message) and return the message to show.
 */
export function applyActionResult<T, F extends FieldValues>(result: ActionResult<T>, setError: UseFormSetError<F>, knownFields: readonly string[]): string | null {
  if (result.ok) return null;
  const unplaced: string[] = [];
  for (const [field, messages] of Object.entries(result.fields ?? {})) {
    const top = field.split(".")[0] ?? field;
    if (knownFields.includes(field) || knownFields.includes(top)) setError((knownFields.includes(field) ? field : top) as Path<F>, { type: "server", message: messages[0] });
    else if (field !== "_form") unplaced.push(messages[0] ?? "");
  }
  const formLevel = result.fields?._form?.join(" ");
  return [result.message, formLevel && !result.message.includes(formLevel) ? formLevel : null, ...unplaced.filter((m) => !result.message.includes(m))].filter(Boolean).join(" ");
}

/** First error message of a field (react-hook-form keeps nested errors for arrays). */
export function errorText(error: unknown): string | undefined {
  if (!error) return undefined;
  const e = error as { message?: string; root?: { message?: string } } & Record<string, unknown>;
  if (typeof e.message === "string") return e.message;
  if (e.root?.message) return e.root.message;
  for (const value of Object.values(e)) {
    const inner = errorText(value);
    if (inner) return inner;
  }
  return undefined;
}
