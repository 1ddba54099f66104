import { requireUser } from "@/app/_lib/page-guard";
import { listAssignableCoils, listJobs } from "@/database/queries/jobs";
import { listCurrentProcedureVersions } from "@/database/queries/procedures";
import { listCrews } from "@/database/queries/users";
import { COIL_STATUS_LABELS } from "@/domain/coils/statuses";
import { DataTable } from "@/components/ui/data-table";
import { SectionCard } from "@/components/ui/section-card";
import { JobForm } from "./_components/job-form";

export const dynamic = "force-dynamic";

// Jobs (admin): every work order with its procedure, crew and status; add a job.
export default async function JobsPage() {
  await requireUser("manageJobs");
  const [jobs, procedures, crews, coils] = await Promise.all([listJobs(), listCurrentProcedureVersions(), listCrews(), listAssignableCoils()]);
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Jobs</h1>
      <SectionCard id="jobs-list" title="Work orders">
        <DataTable
          labelledBy="jobs-list"
          rows={jobs}
          rowKey={(j) => j.id}
          empty="No jobs yet."
          columns={[
            { header: "Code", cell: (j) => j.code, href: (j) => `/jobs/${j.id}` },
            { header: "Name", cell: (j) => j.name },
            { header: "Procedure", cell: (j) => j.procedureCode },
            { header: "Crew", cell: (j) => j.crewName ?? "—" },
            { header: "Pipe sizes", cell: (j) => j.pipeSizes ?? "—" },
            { header: "Status", cell: (j) => (j.status === "open" ? "Open" : <span className="font-semibold text-fail">Closed: takes no new joints</span>) },
          ]}
        />
      </SectionCard>
      <SectionCard id="add-job" title="Add a job" tone="card">
        <JobForm
          procedures={procedures.map((p) => ({ id: p.procedureId, label: `${p.procedureCode} — ${p.procedureName} (version ${p.versionNo})` }))}
          crews={crews.map((c) => ({ id: c.id, label: c.name }))}
          coils={coils.map((c) => ({ id: c.id, label: `${c.coilCode} · lot ${c.lot} · ${c.nominalSize}" SDR ${c.sdr} · ${COIL_STATUS_LABELS[c.status]}` }))}
        />
      </SectionCard>
    </div>
  );
}
