import type { ReactNode } from "react";

/** What a field's control needs to be tied to its label, hint and error. */
export type FieldControlProps = {
  id: string;
  "aria-invalid": true | undefined;
  "aria-describedby": string | undefined;
};

/** The ids a control points at: its error first, then its note, then its hint (the order screen readers read). */
export function fieldControlProps(id: string, { error, note, hint, isInvalid }: { error?: ReactNode; note?: ReactNode; hint?: ReactNode; isInvalid?: boolean }): FieldControlProps {
  const describedBy = [error ? `${id}-error` : null, note ? `${id}-note` : null, hint ? `${id}-hint` : null].filter(Boolean).join(" ") || undefined;
  return { id, "aria-invalid": error || isInvalid ? true : undefined, "aria-describedby": describedBy };
}

/** The border of a control: red while it has an error. */
export function controlBorder(error: unknown): string {
  return error ? "border-fail" : "border-slate-400";
}

/**
 * Spacing between a field's parts: "regular" for the office screens, "large" for the
 * Trench, whose fields carry 48 px buttons and panels under the control (gloved hands).
 */
export type FieldSize = "regular" | "large";

const GAP: Record<FieldSize, string> = { regular: "gap-1", large: "gap-2" };

/**
 * The one markup of a form field: a visible label tied by htmlFor, the unit beside the
 * label and the control, a hint, and the error tied with aria-describedby and aria-invalid.
 * The control itself comes from `children`, called with the props that tie it; what
 * `children` returns may hold more than the control (buttons, a summary under it).
 */
export function FieldShell({
  id,
  label,
  unit,
  hint,
  note,
  error,
  isInvalid,
  errorRole,
  size = "regular",
  className = "",
  children,
}: {
  id: string;
  label: ReactNode;
  /** Shown after the label and beside the control ("mm", "°C", "psi"). */
  unit?: string;
  hint?: ReactNode;
  /** A caution about what was entered (nothing found, no signal), shown before the error. */
  note?: ReactNode;
  error?: ReactNode;
  /** Marks the control invalid without an error line of its own (a message shown elsewhere). */
  isInvalid?: boolean;
  /** "alert" where the error appears after a submit without moving focus. */
  errorRole?: "alert";
  size?: FieldSize;
  className?: string;
  children: (control: FieldControlProps) => ReactNode;
}) {
  const control = children(fieldControlProps(id, { error, note, hint, isInvalid }));
  return (
    <div className={`flex flex-col ${GAP[size]} ${className}`}>
      <label htmlFor={id} className="text-sm font-semibold text-ink">
        {label}
        {unit ? <span className="ml-1 font-normal text-slate-700">({unit})</span> : null}
      </label>
      {unit ? (
        <div className="flex items-center gap-2">
          {control}
          <span className="shrink-0 text-sm text-slate-700" aria-hidden="true">
            {unit}
          </span>
        </div>
      ) : (
        control
      )}
      {hint ? (
        <p id={`${id}-hint`} className="text-sm text-slate-700">
          {hint}
        </p>
      ) : null}
      {note ? (
        <p id={`${id}-note`} className="text-sm font-semibold text-caution">
          {note}
        </p>
      ) : null}
      {error ? (
        <p id={`${id}-error`} role={errorRole} className="text-sm font-semibold text-fail">
          {error}
        </p>
      ) : null}
    </div>
  );
}
