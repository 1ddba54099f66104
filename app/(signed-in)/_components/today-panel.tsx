// One box of the Today page: a heading, the content, and a link to the screen that acts on it.
import Link from "next/link";
import type { ReactNode } from "react";
import { SectionCard } from "@/components/ui/section-card";

export function TodayPanel({ id, title, href, linkText, tone = "plain", children }: { id: string; title: string; href?: string; linkText?: string; tone?: "plain" | "attention"; children: ReactNode }) {
  return (
    <SectionCard id={id} title={title} tone={tone === "attention" ? "caution" : "card"} isCompact className="flex flex-col gap-2">
      <div>{children}</div>
      {href ? (
        <p>
          <Link href={href} className="inline-flex min-h-touch items-center font-semibold text-brand underline">
            {linkText ?? "Open"}
          </Link>
        </p>
      ) : null}
    </SectionCard>
  );
}
