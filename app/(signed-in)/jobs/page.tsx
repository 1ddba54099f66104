import Link from "next/link";
import { requireUser } from "@/app/_lib/page-guard";
import { listAssignableCoils, listJobs } from "@/database/queries/jobs";
import { listCurrentProcedureVersions } from "@/database/queries/procedures";
import { listCrews } from "@/database/queries/users";
import { JobForm } from "./_components/job-form";

export const dynamic = "force-dynamic";

// Jobs (admin): every work order with its procedure, crew and status; add a job.
export default async function JobsPage() {
  await requireUser("manageJobs");
  const [jobs, procedures, crews, coils] = await Promise.all([listJobs(), listCurrentProcedureVersions(), listCrews(), listAssignableCoils()]);
  return (
    <div className="flex flex-col gap-6">
      <h1 className="text-2xl font-bold">Jobs</h1>
      <section aria-labelledby="jobs-list">
        <h2 id="jobs-list" className="mb-2 text-xl font-bold">
          Work orders
        </h2>
        <div className="overflow-x-auto">
          <table className="w-full border-collapse text-left">
            <thead>
              <tr className="border-b-2 border-slate-400">
                <th className="p-2">Code</th>
                <th className="p-2">Name</th>
                <th className="p-2">Procedure</th>
                <th className="p-2">Crew</th>
                <th className="p-2">Pipe sizes</th>
                <th className="p-2">Status</th>
              </tr>
            </thead>
            <tbody>
              {jobs.map((j) => (
                <tr key={j.id} className="border-b border-slate-200">
                  <td className="p-2 font-semibold">
                    <Link className="text-brand underline" href={`/jobs/${j.id}`}>
                      {j.code}
                    </Link>
                  </td>
                  <td className="p-2">{j.name}</td>
                  <td className="p-2">{j.procedureCode}</td>
                  <td className="p-2">{j.crewName ?? "—"}</td>
                  <td className="p-2">{j.pipeSizes ?? "—"}</td>
                  <td className="p-2">{j.status === "open" ? "Open" : <span className="font-semibold text-fail">Closed: takes no new joints</span>}</td>
                </tr>
              ))}
            </tbody>
          </table>
          {jobs.length === 0 ? <p className="p-2">No jobs yet.</p> : null}
        </div>
      </section>
      <section aria-labelledby="add-job" className="rounded-md border-2 border-slate-300 bg-white p-4">
        <h2 id="add-job" className="mb-2 text-xl font-bold">
          Add a job
        </h2>
        <JobForm
          procedures={procedures.map((p) => ({ id: p.procedureId, label: `${p.procedureCode} — ${p.procedureName} (version ${p.versionNo})` }))}
          crews={crews.map((c) => ({ id: c.id, label: c.name }))}
          coils={coils.map((c) => ({ id: c.id, label: `${c.coilCode} · lot ${c.lot} · ${c.nominalSize}" SDR ${c.sdr} · ${c.status}` }))}
        />
      </section>
    </div>
  );
}
