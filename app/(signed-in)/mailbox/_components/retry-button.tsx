"use client";
import { useState, useTransition } from "react";
import { retryMailAction } from "../actions";

export function RetryButton({ id, subject }: { id: number; subject: string }) {
  const [pending, start] = useTransition();
  const [message, setMessage] = useState<string | null>(null);
  return (
    <span className="flex flex-col gap-1">
      <button
        type="button"
        disabled={pending}
        aria-label={`Try sending “${subject}” again`}
        onClick={() =>
          start(async () => {
            const r = await retryMailAction({ id });
            setMessage(r.ok ? "Queued again." : r.message);
          })
        }
        className="min-h-touch rounded-md border-2 border-brand px-3 font-semibold text-brand hover:bg-brand-light disabled:opacity-50"
      >
        {pending ? "Queuing…" : "Try again"}
      </button>
      <span role="status" aria-live="polite" className="text-xs">
        {message}
      </span>
    </span>
  );
}
