import type { Metadata } from "next";
import { requireUser } from "@/app/_lib/page-guard";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { listHeatersWithLastCheck } from "@/database/queries/equipment";
import { listJobs } from "@/database/queries/jobs";
import { listOverridesForJobs } from "@/database/queries/joints";
import { listCoils } from "@/database/queries/coils";
import { COIL_STATUS_LABELS } from "@/domain/coils/statuses";
import { crewPhrase } from "@/domain/joints/rules";
import { GrantOverrideForm } from "./_components/grant-override-form";
import { SectionCard } from "@/components/ui/section-card";
import { TimeDisplay } from "@/components/ui/time-display";

export const metadata: Metadata = { title: "Overrides · Trench" };
export const dynamic = "force-dynamic";

// Inspectors and admins clear blocking warnings at the trench for a job, for a few hours.
export default async function OverridesPage() {
  const user = await requireUser("grantOverride");
  const now = new Date();
  const timeZone = await organisationTimeZone();
  const [jobs, heaters, quarantined, usedUp, inUse] = await Promise.all([
    listJobs({ status: "open" }),
    listHeatersWithLastCheck({ now, timeZone, activeOnly: true }),
    listCoils({ status: "quarantined", limit: 200 }),
    listCoils({ status: "used-up", limit: 200 }),
    listCoils({ status: "in-use", limit: 200 }),
  ]);
  // A coil assigned to a crew's job blocks the fusers of every other crew.
  const crewOwned = inUse.filter((c) => c.jobId !== null && c.jobCrewId !== null);
  const active = await listOverridesForJobs({ jobIds: jobs.map((j) => j.id), at: now });
  const blockedHeaters = heaters.filter((h) => h.isCheckOverdue || h.isFlagged);
  return (
    <div className="mx-auto flex w-full max-w-xl flex-col gap-4">
      <h1 className="text-2xl font-bold">Clear a blocking warning at the trench</h1>
      <p>
        A heater plate whose surface-temperature check is overdue or failed, a coil that is quarantined or used up, or a coil assigned to another crew&apos;s job stops a fuser from recording a joint. Clear it for one job and a few hours only when you know it is safe; the override, your name and your reason go on every
        joint made under it.
      </p>
      <GrantOverrideForm
        userName={user.name}
        jobs={jobs.map((j) => ({ id: j.id, label: `${j.code} · ${j.name}` }))}
        heaters={blockedHeaters.map((h) => ({ id: h.id, label: `${h.assetTag}: ${h.problems.join(" ")}` }))}
        coils={[
          ...[...quarantined, ...usedUp].map((c) => ({ id: c.id, label: `${c.coilCode}: ${COIL_STATUS_LABELS[c.status].toLowerCase()}${c.statusReason ? ` (${c.statusReason})` : ""}` })),
          ...crewOwned.map((c) => ({ id: c.id, label: `${c.coilCode}: on job ${c.jobCode} of ${crewPhrase(c.jobCrewName)}` })),
        ]}
      />
      <SectionCard id="active-heading" title="Overrides in force" className="flex flex-col gap-2">
        {active.length === 0 ? <p>None.</p> : null}
        <ul className="flex flex-col gap-2">
          {active.map((o) => (
            <li key={o.id} className="rounded-md border-2 border-brand bg-brand-light p-3">
              <p className="font-semibold">
                {o.jobCode}: {o.subjectType === "heater" ? "heater plate" : "coil"} {o.subjectLabel}
              </p>
              <p className="text-sm">
                By {o.grantedByName} at <TimeDisplay at={o.grantedAt} />, until <TimeDisplay at={o.expiresAt} />: “{o.reason}”
              </p>
            </li>
          ))}
        </ul>
      </SectionCard>
    </div>
  );
}
