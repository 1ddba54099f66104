"use client";
// The frame both equipment forms share: add or edit titles and buttons named by the kind
// of equipment, and on edit the in-service box (retired equipment stays on record).
import type { FormEventHandler, ReactNode } from "react";
import { FormFrame, InServiceCheckbox, type FormOutcome } from "@/components/form/form-frame";

export function AssetFormFrame({
  noun,
  shortNoun,
  isEdit,
  onSubmit,
  message,
  isBusy,
  isActive,
  onActiveChange,
  children,
}: {
  /** "machine", "heater plate": in the form's name and its button. */
  noun: string;
  /** What the in-service box calls it: "machine", "plate". */
  shortNoun: string;
  isEdit: boolean;
  onSubmit: FormEventHandler<HTMLFormElement>;
  message: FormOutcome;
  isBusy: boolean;
  isActive: boolean;
  onActiveChange: (checked: boolean) => void;
  children: ReactNode;
}) {
  return (
    <FormFrame label={isEdit ? `Edit ${noun}` : `Add a ${noun}`} onSubmit={onSubmit} message={message} isBusy={isBusy} submitLabel={isEdit ? `Save ${noun}` : `Add ${noun}`} busyLabel="Saving …">
      {children}
      {isEdit ? (
        <InServiceCheckbox checked={isActive} onChange={onActiveChange}>
          In service (untick to retire the {shortNoun}; it stays on record for its joints)
        </InServiceCheckbox>
      ) : null}
    </FormFrame>
  );
}
