import { requireUser } from "@/app/_lib/page-guard";
import { currentProcedureVersion, listProcedures } from "@/database/queries/procedures";
import { builtInProcedure } from "@/domain/procedures";
import { can } from "@/domain/roles";
import { DataTable } from "@/components/ui/data-table";
import { formatInstant } from "@/components/ui/display-format";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { SectionCard } from "@/components/ui/section-card";
import { AddProcedureForm } from "./_components/add-procedure-form";
import { standardOptions } from "./_lib/views";

export const dynamic = "force-dynamic";

// Procedures: the operator's written joining procedures, each based on a published standard.
export default async function ProceduresPage() {
  const user = await requireUser("viewProcedures");
  const timeZone = await organisationTimeZone();
  const procedures = await listProcedures();
  const current = await Promise.all(procedures.map((p) => currentProcedureVersion({ procedureId: p.id })));
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Procedures</h1>
      <p>Each procedure is based on a published standard&apos;s windows and may only tighten them. A version used by any joint is never changed: tightening publishes a new version.</p>
      <SectionCard id="procedure-list" title="Written procedures">
        <DataTable
          labelledBy="procedure-list"
          rows={procedures.map((p, i) => ({ ...p, current: current[i] }))}
          rowKey={(p) => p.id}
          empty="No procedures yet."
          columns={[
            { header: "Code", isRowHeader: true, cell: (p) => p.code, href: (p) => `/procedures/${p.id}` },
            { header: "Name", cell: (p) => p.name },
            {
              header: "Versions",
              className: "text-sm text-slate-700",
              cell: (p) => (
                <>
                  Based on {builtInProcedure(p.standard).label}. {p.current ? `Current version ${p.current.versionNo}, published ${formatInstant(p.current.publishedAt, "date", timeZone)}.` : "No version published."}
                  {p.isActive ? "" : " Retired."}
                </>
              ),
            },
          ]}
        />
      </SectionCard>
      {can(user, "manageProcedures") ? (
        <SectionCard id="add-procedure" title="Add a procedure" tone="card">
          <AddProcedureForm standards={standardOptions()} />
        </SectionCard>
      ) : null}
    </div>
  );
}
