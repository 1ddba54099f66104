import type { ReactNode } from "react";

const TONES = {
  plain: "",
  card: "rounded-md border-2 border-slate-300 bg-white p-4",
  caution: "rounded-md border-2 border-caution bg-white p-4",
  fail: "rounded-md border-2 border-fail bg-white p-4",
  pass: "rounded-md border-2 border-pass bg-white p-4",
} as const;

/**
 * A titled section, named by its heading (so it is a landmark region), with optional
 * actions beside the title. `tone` "plain" is a bare section (lists, tables); the others
 * are bordered cards, the border colour backing words that already say the state.
 */
export function SectionCard({
  id,
  title,
  actions,
  tone = "plain",
  level = 2,
  isCompact = false,
  className = "",
  children,
}: {
  /** The heading's id; other parts (a DataTable) may be labelled by it. */
  id: string;
  title: ReactNode;
  actions?: ReactNode;
  tone?: keyof typeof TONES;
  level?: 2 | 3;
  /** A smaller title, for cards side by side. */
  isCompact?: boolean;
  className?: string;
  children: ReactNode;
}) {
  const Heading = level === 2 ? "h2" : "h3";
  const heading = (
    <Heading id={id} className={`${actions ? "" : "mb-2 "}${level === 2 && !isCompact ? "text-xl" : "text-lg"} font-bold`}>
      {title}
    </Heading>
  );
  return (
    <section aria-labelledby={id} className={`${TONES[tone]} ${className}`}>
      {actions ? (
        <div className="mb-2 flex flex-wrap items-center justify-between gap-2">
          {heading}
          <div className="flex flex-wrap gap-2">{actions}</div>
        </div>
      ) : (
        heading
      )}
      {children}
    </section>
  );
}
