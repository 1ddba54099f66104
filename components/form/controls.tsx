"use client";
// Small form pieces shared by the screens (Jobs, Equipment, Procedures, Crew, Trench):
// a labelled select and text area with their errors tied by aria-describedby, and the
// step that copies an action's per-field errors into react-hook-form.
import type { ReactNode, SelectHTMLAttributes, TextareaHTMLAttributes } from "react";
import type { FieldValues, Path, UseFormSetError } from "react-hook-form";
import type { ActionResult } from "@/domain/result";

export function SelectField({
  id,
  label,
  error,
  hint,
  children,
  ...select
}: SelectHTMLAttributes<HTMLSelectElement> & { id: string; label: ReactNode; error?: string; hint?: string; children: ReactNode }) {
  const describedBy = [error ? `${id}-error` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-semibold text-ink">
        {label}
      </label>
      <select
        id={id}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        {...select}
        className={`min-h-touch w-full rounded-md border-2 bg-white px-3 py-2 text-base ${error ? "border-fail" : "border-slate-400"}`}
      >
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

export function TextAreaField({ id, label, error, ...area }: TextareaHTMLAttributes<HTMLTextAreaElement> & { id: string; label: ReactNode; error?: string }) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-sm font-semibold text-ink">
        {label}
      </label>
      <textarea
        id={id}
        rows={3}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        {...area}
        className={`w-full rounded-md border-2 bg-white px-3 py-2 text-base ${error ? "border-fail" : "border-slate-400"}`}
      />
      {error ? (
        <p id={`${id}-error`} className="text-sm font-semibold text-fail">
          {error}
        </p>
      ) : null}
    </div>
  );
}

/** A group of checkboxes or radios with a legend and one error line. */
export function ChoiceGroup({ legend, error, id, children }: { legend: ReactNode; error?: string; id: string; children: ReactNode }) {
  return (
    <fieldset className="flex flex-col gap-1" aria-describedby={error ? `${id}-error` : undefined}>
      <legend className="text-sm font-semibold text-ink">{legend}</legend>
      <div className="flex flex-wrap gap-3">{children}</div>
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
