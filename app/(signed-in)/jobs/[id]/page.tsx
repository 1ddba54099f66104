import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/page-header";
import { requirePageId, requireUser } from "@/app/_lib/page-guard";
import { countJointsOnJob, findJobById, listAssignableCoils, listCoilsForJob } from "@/database/queries/jobs";
import { listCurrentProcedureVersions } from "@/database/queries/procedures";
import { listCrews } from "@/database/queries/users";
import { canRecordOnJob } from "@/domain/jobs/rules";
import { COIL_STATUS_LABELS, type CoilStatus } from "@/domain/coils/statuses";
import { JobForm } from "../_components/job-form";
import { JobStatusButton } from "../_components/job-status-button";
import { SectionCard } from "@/components/ui/section-card";

export const dynamic = "force-dynamic";

export default async function JobPage({ params }: { params: Promise<{ id: string }> }) {
  await requireUser("manageJobs");
  const id = await requirePageId(params);
  const job = await findJobById({ id });
  if (!job) notFound();
  const [procedures, crews, assignable, assigned, joints] = await Promise.all([
    listCurrentProcedureVersions(),
    listCrews(),
    listAssignableCoils({ jobId: id }),
    listCoilsForJob({ jobId: id }),
    countJointsOnJob({ jobId: id }),
  ]);
  const coilLabel = (c: { coilCode: string; lot: string; nominalSize: string; sdr: number; status: CoilStatus }) => `${c.coilCode} · lot ${c.lot} · ${c.nominalSize}" SDR ${c.sdr} · ${COIL_STATUS_LABELS[c.status]}`;
  const coils = [...new Map([...assigned, ...assignable].map((c) => [c.id, { id: c.id, label: coilLabel(c) }])).values()];
  return (
    <div className="flex flex-col gap-6">
      <PageHeader backHref="/jobs" backText="All jobs" title={`Job ${job.code}: ${job.name}`} />
      <p>
        {canRecordOnJob(job) ? "Open: fusers of the crew can record joints on it." : "Closed: this job takes no new joints."} {joints} joint{joints === 1 ? "" : "s"} recorded.
      </p>
      <JobStatusButton job={{ id: job.id, version: job.version, code: job.code, status: job.status }} />
      <SectionCard id="edit-job" title="Edit job" tone="card">
        <JobForm
          key={job.version}
          procedures={procedures.map((p) => ({ id: p.procedureId, label: `${p.procedureCode} — ${p.procedureName} (version ${p.versionNo})` }))}
          crews={crews.map((c) => ({ id: c.id, label: c.name }))}
          coils={coils}
          job={{
            id: job.id,
            version: job.version,
            values: {
              code: job.code,
              name: job.name,
              place: job.place ?? "",
              latitude: job.latitude ?? "",
              longitude: job.longitude ?? "",
              startsOn: job.startsOn ?? "",
              endsOn: job.endsOn ?? "",
              procedureId: job.procedureId,
              crewId: job.crewId ?? "",
              pipeSizes: job.pipeSizes ?? "",
              coilIds: assigned.map((c) => c.id),
            },
          }}
        />
      </SectionCard>
    </div>
  );
}
