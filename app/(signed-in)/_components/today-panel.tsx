// One box of the Today page: a heading, the content, and a link to the screen that acts on it.
import Link from "next/link";
import type { ReactNode } from "react";

export function TodayPanel({ id, title, href, linkText, tone = "plain", children }: { id: string; title: string; href?: string; linkText?: string; tone?: "plain" | "attention"; children: ReactNode }) {
  return (
    <section aria-labelledby={id} className={`flex flex-col gap-2 rounded-md border-2 bg-white p-4 ${tone === "attention" ? "border-caution" : "border-slate-300"}`}>
      <h2 id={id} className="text-lg font-bold">
        {title}
      </h2>
      <div>{children}</div>
      {href ? (
        <p>
          <Link href={href} className="font-semibold text-brand underline">
            {linkText ?? "Open"}
          </Link>
        </p>
      ) : null}
    </section>
  );
}
