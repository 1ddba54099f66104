import type { ReactNode } from "react";

/** One term and what it is ("Made" → "2026-03-01 10:12 UTC"). */
export type Fact = { term: ReactNode; description: ReactNode; key?: string };

const STACKED_COLUMNS = { 1: "", 2: "sm:grid-cols-2", 3: "sm:grid-cols-3" } as const;

/**
 * Term/description pairs as a description list. "inline": term beside its description
 * (stacked on a phone). "stacked": small term above a bold description, in 1–3 columns.
 * "ruled": one pair a line with a rule between lines, as a record sheet.
 * Pass `facts`, or FactRow / FactBlock / FactLine children for descriptions with markup.
 */
export function FactList({
  facts,
  layout = "inline",
  columns = 1,
  className = "",
  children,
}: {
  facts?: readonly (Fact | null | false | undefined)[];
  layout?: "inline" | "stacked" | "ruled";
  columns?: keyof typeof STACKED_COLUMNS;
  className?: string;
  children?: ReactNode;
}) {
  const Item = layout === "inline" ? FactRow : layout === "stacked" ? FactBlock : FactLine;
  const grid = layout === "inline" ? "grid gap-x-4 gap-y-1 sm:grid-cols-[max-content_1fr]" : layout === "stacked" ? `grid gap-2 ${STACKED_COLUMNS[columns]}` : "";
  return (
    <dl className={`${grid} ${className}`}>
      {facts?.filter((f): f is Fact => Boolean(f)).map((f, i) => (
        <Item key={f.key ?? i} term={f.term}>
          {f.description}
        </Item>
      ))}
      {children}
    </dl>
  );
}

/** One inline pair: the term in bold, its description beside it. */
export function FactRow({ term, children }: { term: ReactNode; children: ReactNode }) {
  return (
    <>
      <dt className="font-semibold">{term}</dt>
      <dd>{children}</dd>
    </>
  );
}

/** One stacked pair: a small term above its description in bold. */
export function FactBlock({ term, children }: { term: ReactNode; children: ReactNode }) {
  return (
    <div className="flex flex-col">
      <dt className="text-sm text-slate-700">{term}</dt>
      <dd className="font-semibold">{children}</dd>
    </div>
  );
}

/** One ruled line: the term in a fixed column beside its description (stacked on a phone). */
export function FactLine({ term, children }: { term: ReactNode; children: ReactNode }) {
  return (
    <div className="flex flex-col border-b border-slate-200 py-2 sm:flex-row sm:gap-4">
      <dt className="font-semibold text-slate-700 sm:w-64">{term}</dt>
      <dd className="text-ink">{children}</dd>
    </div>
  );
}
