import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { requirePageId, requireUser } from "@/app/_lib/page-guard";
import { findProcedureById, listProcedureVersions } from "@/database/queries/procedures";
import { builtInProcedure, describeProcedureWindows } from "@/domain/procedures";
import { can } from "@/domain/roles";
import { DataTable } from "@/components/ui/data-table";
import { formatInstant } from "@/components/ui/display-format";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { SectionCard } from "@/components/ui/section-card";
import { TightenForm } from "../_components/tighten-form";
import { VersionNotesForm } from "../_components/version-notes-form";
import { shelterRuleViews, tighteningFieldViews } from "../_lib/views";

export const dynamic = "force-dynamic";

const STATUS_STYLE = { confirmed: "text-pass", "confirmed-2nd": "text-brand", "from-memory": "text-caution", operator: "text-caution" } as const;

export default async function ProcedurePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requireUser("viewProcedures");
  const timeZone = await organisationTimeZone();
  const id = await requirePageId(params);
  const procedure = await findProcedureById({ id });
  if (!procedure) notFound();
  const versions = await listProcedureVersions({ procedureId: id });
  const current = versions.find((v) => v.isCurrent) ?? null;
  const units = user.unitSystem;
  const isAdmin = can(user, "manageProcedures");
  return (
    <div className="flex flex-col gap-6">
      <PageHeader backHref="/procedures" backText="All procedures" title={`${procedure.code}: ${procedure.name}`} />
      <p>Based on {builtInProcedure(procedure.standard).label}. Values are shown in {units === "us" ? "US customary" : "SI"} units; each window names its source and whether the value is confirmed or from memory.</p>
      {versions.map((v) => (
        <section key={v.id} aria-labelledby={`version-${v.id}`} className={`rounded-md border-2 p-4 ${v.isCurrent ? "border-brand bg-white" : "border-slate-300 bg-slate-50"}`}>
          <h2 id={`version-${v.id}`} className="text-xl font-bold">
            Version {v.versionNo} {v.isCurrent ? "(current)" : "(superseded)"}
          </h2>
          <p className="text-sm text-slate-700">
            {v.definition.label}. Published {formatInstant(v.publishedAt, "date", timeZone)}
            {v.publishedByName ? ` by ${v.publishedByName}` : ""}
            {v.supersededAt ? `; superseded ${formatInstant(v.supersededAt, "date", timeZone)}` : ""}. Used for {v.jointCount} joint{v.jointCount === 1 ? "" : "s"}.
          </p>
          {v.notes ? <p className="mt-1">Note: {v.notes}</p> : null}
          <DataTable
            className="mt-3"
            label={`Windows of version ${v.versionNo}`}
            isDense
            rows={describeProcedureWindows(v.definition, units)}
            rowKey={(row) => row.parameter}
            columns={[
              { header: "Parameter", className: "font-semibold", cell: (row) => row.label },
              {
                header: "Window",
                cell: (row) => (
                  <>
                    {row.value}
                    {row.details.length ? (
                      <ul className="mt-1 list-disc pl-5 text-slate-700">
                        {row.details.map((d) => (
                          <li key={d}>{d}</li>
                        ))}
                      </ul>
                    ) : null}
                  </>
                ),
              },
              { header: "Source", cell: (row) => row.source },
              { header: "Status", cell: (row) => <span className={`font-semibold ${STATUS_STYLE[row.status]}`}>{row.statusText}</span> },
            ]}
          />
          {v.definition.notes.length ? (
            <ul className="mt-2 list-disc pl-5 text-sm">
              {v.definition.notes.map((n) => (
                <li key={n}>{n}</li>
              ))}
            </ul>
          ) : null}
          {isAdmin ? (
            <div className="mt-3">
              {v.jointCount === 0 ? (
                <VersionNotesForm versionId={v.id} versionNo={v.versionNo} notes={v.notes ?? ""} />
              ) : (
                <p className="text-sm">This version has been used for joints, so it cannot be changed; publish a new version instead.</p>
              )}
            </div>
          ) : null}
        </section>
      ))}
      {isAdmin && current && procedure.isActive ? (
        <SectionCard id="tighten" title="Tighten and publish a new version" tone="card">
          <TightenForm
            procedure={{ id: procedure.id, code: procedure.code, currentVersionId: current.id, currentVersionNo: current.versionNo }}
            units={units}
            fields={tighteningFieldViews(current.definition, units)}
            shelterRules={shelterRuleViews(current.definition)}
          />
        </SectionCard>
      ) : null}
    </div>
  );
}
