import type { ReactNode } from "react";

/** One term and what it is ("Made" → "2026-03-01 10:12 UTC"). */
export type Fact = { term: ReactNode; description: ReactNode; key?: string };

/** Term/description pairs as a description list, two columns from a small tablet up. */
export function FactList({ facts, className = "" }: { facts: readonly (Fact | null | false | undefined)[]; className?: string }) {
  return (
    <dl className={`grid gap-x-4 gap-y-1 sm:grid-cols-[max-content_1fr] ${className}`}>
      {facts.filter((f): f is Fact => Boolean(f)).map((f, i) => (
        <FactRow key={f.key ?? i} term={f.term}>
          {f.description}
        </FactRow>
      ))}
    </dl>
  );
}

/** One pair inside a FactList (or any `<dl>` laid out the same way). */
export function FactRow({ term, children }: { term: ReactNode; children: ReactNode }) {
  return (
    <>
      <dt className="font-semibold">{term}</dt>
      <dd>{children}</dd>
    </>
  );
}
