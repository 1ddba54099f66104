"use client";
import { useState, useTransition } from "react";
import { setMailPreferenceAction } from "../mailbox/actions";
import { useTimeZone } from "@/components/ui/time-zone";

/** One mail per alert, or one summary a day (the daily digest). */
export function MailPreference({ dailyDigest }: { dailyDigest: boolean }) {
  const timeZone = useTimeZone();
  const [value, setValue] = useState(dailyDigest);
  const [message, setMessage] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const choose = (next: boolean) =>
    start(async () => {
      const r = await setMailPreferenceAction({ dailyDigest: next });
      if (r.ok) {
        setValue(next);
        setMessage(next ? "Saved: alerts come as one summary a day." : "Saved: each alert comes as its own mail.");
      } else setMessage(r.message);
    });
  return (
    <fieldset className="flex flex-col gap-2 rounded-md border-2 border-slate-300 bg-white p-3" disabled={pending}>
      <legend className="px-1 font-semibold">Alert mail for me</legend>
      <label className="flex min-h-touch items-center gap-2">
        <input type="radio" name="daily-digest" checked={!value} onChange={() => choose(false)} className="h-5 w-5" />
        <span>A mail for each alert</span>
      </label>
      <label className="flex min-h-touch items-center gap-2">
        <input type="radio" name="daily-digest" checked={value} onChange={() => choose(true)} className="h-5 w-5" />
        <span>One summary a day (06:00 {timeZone})</span>
      </label>
      <p role="status" aria-live="polite" className="text-sm">
        {message}
      </p>
    </fieldset>
  );
}
