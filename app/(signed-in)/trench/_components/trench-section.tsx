"use client";
// One foldable step of the Trench form (native <details>/<summary>: keyboard and screen
// readers know it). The summary names the step and, folded, what it holds, so a fuser sees
// where they are without opening it. Fields stay in the form while folded.
import type { ReactNode } from "react";

export function TrenchSection({ id, title, status, open, onToggle, children }: { id: string; title: string; status?: ReactNode; open: boolean; onToggle: (open: boolean) => void; children: ReactNode }) {
  return (
    <details id={`section-${id}`} open={open} onToggle={(e) => onToggle(e.currentTarget.open)} className="min-w-0 rounded-md border-2 border-slate-300 bg-white">
      <summary className="flex min-h-12 cursor-pointer list-none items-center justify-between gap-3 px-3 py-2 [&::-webkit-details-marker]:hidden">
        <span className="flex min-w-0 flex-col">
          <h2 className="text-xl font-bold text-ink">{title}</h2>
          {status ? <span className="text-sm text-slate-700">{status}</span> : null}
        </span>
        <span aria-hidden="true" className="shrink-0 text-2xl font-bold text-brand">
          {open ? "−" : "+"}
        </span>
      </summary>
      {/* The step's own fieldset legend repeats the summary: kept for screen readers only. */}
      <div className="flex min-w-0 flex-col gap-4 border-t-2 border-slate-200 p-3 [&>fieldset]:min-w-0 [&>fieldset>legend]:sr-only">{children}</div>
    </details>
  );
}
