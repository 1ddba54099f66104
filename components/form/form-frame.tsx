import type { FormEventHandler, ReactNode } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "./field";

/** What an office form says after its action: the outcome in words, coloured by tone. */
export type FormOutcome = { text: string; tone: "error" | "success" } | null;

/**
 * The frame every office form shares: a named form (so it is found by its name), its
 * fields, the result message in an aria-live region, and one submit button that says
 * what it does ("Add machine", not "Submit") and what is happening while it works.
 */
export function FormFrame({
  label,
  onSubmit,
  message,
  submitLabel,
  busyLabel,
  isBusy,
  variant = "primary",
  children,
}: {
  label: string;
  onSubmit: FormEventHandler<HTMLFormElement>;
  message: FormOutcome;
  submitLabel: string;
  /** Shown on the button while the action runs; the submit label stays when omitted. */
  busyLabel?: string;
  isBusy: boolean;
  variant?: "primary" | "secondary" | "danger";
  children: ReactNode;
}) {
  return (
    <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label={label}>
      {children}
      <FormMessage message={message?.text} tone={message?.tone} />
      <div>
        <Button type="submit" variant={variant} disabled={isBusy}>
          {isBusy && busyLabel ? busyLabel : submitLabel}
        </Button>
      </div>
    </form>
  );
}

/** The "in service" tick of an edit form: unticking retires the record, never deletes it. */
export function InServiceCheckbox({ checked, onChange, children }: { checked: boolean; onChange: (checked: boolean) => void; children: ReactNode }) {
  return (
    <label className="flex min-h-touch items-center gap-2">
      <input type="checkbox" className="h-5 w-5" checked={checked} onChange={(ev) => onChange(ev.target.checked)} />
      {children}
    </label>
  );
}
