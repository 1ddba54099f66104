import Link from "next/link";

/** An equipment list's first cell: the asset tag linked to its page, the description under it. */
export function AssetTagCell({ href, assetTag, description }: { href: string; assetTag: string; description: string | null }) {
  return (
    <>
      <Link className="font-semibold text-brand underline" href={href}>
        {assetTag}
      </Link>
      {description ? <div className="text-sm font-normal text-slate-700">{description}</div> : null}
    </>
  );
}
