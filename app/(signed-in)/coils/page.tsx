import Link from "next/link";
import { requireUser } from "@/app/_lib/page-guard";
import { countCoilsByStatus, listCoils } from "@/database/queries/coils";
import { COIL_STATUSES, COIL_STATUS_LABELS, type CoilStatus } from "@/domain/coils/statuses";
import { describeSize } from "@/domain/labels/label";
import { formatQuantity } from "@/domain/units/format";
import { FieldShell } from "@/components/form/field-shell";
import { CoilStatusBadge } from "@/components/ui/badges";
import { DataTable } from "@/components/ui/data-table";
import { formatInstant } from "@/components/ui/display-format";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";

export const dynamic = "force-dynamic";

// Coils: every coil on file with its status and length left; pick coils to print labels for.
export default async function CoilsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("listCoils");
  const timeZone = await organisationTimeZone();
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
        <FieldShell id="coil-search" label="Coil id, lot or traceability code">
          {(control) => <input {...control} name="q" defaultValue={search} className="min-h-touch rounded-md border-2 border-slate-400 bg-white px-3" />}
        </FieldShell>
        <button type="submit" className="min-h-touch rounded-md border-2 border-brand bg-white px-4 font-semibold text-brand">
          Find coils
        </button>
      </form>
      <form method="get" action="/labels" className="flex flex-col gap-2">
        <input type="hidden" name="kind" value="coil" />
        <DataTable
          caption="Coils"
          isCaptionHidden
          isDense
          className="rounded-md border-2 border-slate-300 bg-white"
          rows={coils}
          rowKey={(c) => c.id}
          empty={<span className="block text-center">No coils match.</span>}
          columns={[
            { header: "Label", cell: (c) => <input type="checkbox" name="ids" value={c.id} aria-label={`Print label for ${c.coilCode}`} className="h-6 w-6" /> },
            {
              header: "Coil id",
              className: "whitespace-nowrap font-semibold",
              cell: (c) => (
                <>
                  <Link href={`/coils/${encodeURIComponent(c.coilCode)}`} className="text-brand underline">
                    {c.coilCode}
                  </Link>
                  {c.traceCodeFlags.length ? <span className="ml-1 text-caution">(code disagrees)</span> : null}
                </>
              ),
            },
            { header: "Size", cell: (c) => describeSize(c) },
            { header: "Material", cell: (c) => c.material },
            { header: "Maker and lot", cell: (c) => `${c.manufacturer} · lot ${c.lot}` },
            { header: "Left of length", align: "right", cell: (c) => `${formatQuantity(c.remainingM, "length-m", user.unitSystem)} of ${formatQuantity(c.lengthM, "length-m", user.unitSystem)}` },
            { header: "Status", cell: (c) => <CoilStatusBadge status={c.status} /> },
            { header: "Crew / job", cell: (c) => [c.crewName, c.jobCode].filter(Boolean).join(" · ") || "—" },
            { header: "Label printed", cell: (c) => (c.labelPrintedAt ? formatInstant(c.labelPrintedAt, "date", timeZone) : "not yet") },
          ]}
        />
        <div>
          <button type="submit" className="min-h-touch rounded-md bg-brand px-4 font-semibold text-white hover:bg-brand-dark">
            Print labels for the chosen coils
          </button>
        </div>
      </form>
    </div>
  );
}
