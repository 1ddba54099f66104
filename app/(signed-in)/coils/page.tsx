import Link from "next/link";
import { requireUser } from "@/app/_lib/page-guard";
import { countCoilsByStatus, listCoils } from "@/database/queries/coils";
import { COIL_STATUSES, COIL_STATUS_LABELS, type CoilStatus } from "@/domain/coils/statuses";
import { describeSize } from "@/domain/labels/label";
import { formatQuantity } from "@/domain/units/format";
import { CoilStatusBadge } from "@/components/coils/coil-status-badge";

export const dynamic = "force-dynamic";

// Coils: every coil on file with its status and length left; pick coils to print labels for.
export default async function CoilsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("listCoils");
  const params = await searchParams;
  const statusParam = typeof params.status === "string" ? params.status : "all";
  const status = (COIL_STATUSES as readonly string[]).includes(statusParam) ? (statusParam as CoilStatus) : "all";
  const search = typeof params.q === "string" ? params.q : "";
  const [coils, counts] = await Promise.all([listCoils({ status, search }), countCoilsByStatus()]);
  const total = Object.values(counts).reduce((a, b) => a + b, 0);
  const tabHref = (s: string) => `/coils?${new URLSearchParams({ ...(s !== "all" ? { status: s } : {}), ...(search ? { q: search } : {}) })}`;
  return (
    <div className="flex flex-col gap-4">
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h1 className="text-2xl font-bold">Coils</h1>
        <Link href="/coils/receive" className="inline-flex min-h-touch items-center rounded-md bg-brand px-4 font-semibold text-white hover:bg-brand-dark">
          Receive a coil
        </Link>
      </div>
      <nav aria-label="Coil status">
        <ul className="flex flex-wrap gap-2">
          {(["all", ...COIL_STATUSES] as const).map((s) => (
            <li key={s}>
              <Link
                href={tabHref(s)}
                aria-current={status === s ? "page" : undefined}
                className={`inline-flex min-h-touch items-center rounded-md border-2 px-3 font-semibold ${status === s ? "border-brand bg-brand text-white" : "border-brand bg-white text-brand"}`}
              >
                {s === "all" ? "All" : COIL_STATUS_LABELS[s]} ({s === "all" ? total : counts[s]})
              </Link>
            </li>
          ))}
        </ul>
      </nav>
      <form role="search" method="get" action="/coils" className="flex flex-wrap items-end gap-2">
        {status !== "all" ? <input type="hidden" name="status" value={status} /> : null}
        <div className="flex flex-col gap-1">
          <label htmlFor="coil-search" className="text-sm font-semibold">
            Coil id, lot or traceability code
          </label>
          <input id="coil-search" name="q" defaultValue={search} className="min-h-touch rounded-md border-2 border-slate-400 bg-white px-3" />
        </div>
        <button type="submit" className="min-h-touch rounded-md border-2 border-brand bg-white px-4 font-semibold text-brand">
          Find coils
        </button>
      </form>
      <form method="get" action="/labels" className="flex flex-col gap-2">
        <input type="hidden" name="kind" value="coil" />
        <div className="overflow-x-auto rounded-md border-2 border-slate-300 bg-white">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Coils</caption>
            <thead className="bg-slate-100">
              <tr>
                <th scope="col" className="p-2">
                  Label
                </th>
                <th scope="col" className="p-2">Coil id</th>
                <th scope="col" className="p-2">Size</th>
                <th scope="col" className="p-2">Material</th>
                <th scope="col" className="p-2">Maker and lot</th>
                <th scope="col" className="p-2 text-right">Left of length</th>
                <th scope="col" className="p-2">Status</th>
                <th scope="col" className="p-2">Crew / job</th>
                <th scope="col" className="p-2">Label printed</th>
              </tr>
            </thead>
            <tbody>
              {coils.map((c) => (
                <tr key={c.id} className="border-t border-slate-200">
                  <td className="p-2">
                    <input type="checkbox" name="ids" value={c.id} aria-label={`Print label for ${c.coilCode}`} className="h-6 w-6" />
                  </td>
                  <td className="p-2 font-semibold">
                    <Link href={`/coils/${encodeURIComponent(c.coilCode)}`} className="text-brand underline">
                      {c.coilCode}
                    </Link>
                    {c.traceCodeFlags.length ? <span className="ml-1 text-caution">(code disagrees)</span> : null}
                  </td>
                  <td className="p-2">{describeSize(c)}</td>
                  <td className="p-2">{c.material}</td>
                  <td className="p-2">
                    {c.manufacturer} · lot {c.lot}
                  </td>
                  <td className="p-2 text-right">
                    {formatQuantity(c.remainingM, "length-m", user.unitSystem)} of {formatQuantity(c.lengthM, "length-m", user.unitSystem)}
                  </td>
                  <td className="p-2">
                    <CoilStatusBadge status={c.status} />
                  </td>
                  <td className="p-2">{[c.crewName, c.jobCode].filter(Boolean).join(" · ") || "—"}</td>
                  <td className="p-2">{c.labelPrintedAt ? c.labelPrintedAt.toISOString().slice(0, 10) : "not yet"}</td>
                </tr>
              ))}
              {coils.length === 0 ? (
                <tr>
                  <td colSpan={9} className="p-4 text-center">
                    No coils match.
                  </td>
                </tr>
              ) : null}
            </tbody>
          </table>
        </div>
        <div>
          <button type="submit" className="min-h-touch rounded-md bg-brand px-4 font-semibold text-white hover:bg-brand-dark">
            Print labels for the chosen coils
          </button>
        </div>
      </form>
    </div>
  );
}
