"use client";
import { useState, useTransition } from "react";
import { setMailPreferenceAction } from "../notifications/actions";
import { useTimeZone } from "@/components/ui/time-zone";
import { MAIL_GROUPINGS, mailGroupingLabel, type MailGrouping } from "@/domain/mail/grouping";

/** How my alerts come: as they happen (a burst as one mail), once an hour or once a day. */
export function MailPreference({ grouping, burstWindowS }: { grouping: MailGrouping; burstWindowS?: number }) {
  const timeZone = useTimeZone();
  const [value, setValue] = useState(grouping);
  const [message, setMessage] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const choose = (next: MailGrouping) =>
    start(async () => {
      const r = await setMailPreferenceAction({ grouping: next });
      if (r.ok) {
        setValue(next);
        setMessage(`Saved: ${mailGroupingLabel(next, { timeZone, burstWindowS }).replace(/^./, (c) => c.toLowerCase())}.`);
      } else setMessage(r.message);
    });
  return (
    <fieldset className="flex flex-col gap-2 rounded-md border-2 border-slate-300 bg-white p-3" disabled={pending}>
      <legend className="px-1 font-semibold">Alert mail for me</legend>
      {MAIL_GROUPINGS.map((g) => (
        <label key={g} className="flex min-h-touch items-center gap-2">
          <input type="radio" name="mail-grouping" value={g} checked={value === g} onChange={() => choose(g)} className="h-5 w-5 shrink-0" />
          <span>{mailGroupingLabel(g, { timeZone, burstWindowS })}</span>
        </label>
      ))}
      <p role="status" aria-live="polite" className="text-sm">
        {message}
      </p>
    </fieldset>
  );
}
