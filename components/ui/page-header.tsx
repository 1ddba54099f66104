import type { ReactNode } from "react";
import Link from "next/link";

/** A detail page's top: the link back to its list, then the page title. */
export function PageHeader({ backHref, backText, title }: { backHref: string; backText: string; title: ReactNode }) {
  return (
    <>
      <p>
        <Link href={backHref} className="inline-flex min-h-touch items-center text-brand underline">
          {backText}
        </Link>
      </p>
      <h1 className="text-2xl font-bold">{title}</h1>
    </>
  );
}
