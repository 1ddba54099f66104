// Today for a fuser: their open jobs, their drafts on this device, their qualification
// status. A fuser who may not record on any open job sees that first, and no offer to record.
import { listOpenJobsForFuser } from "@/database/queries/jobs";
import { qualificationStatusOverview } from "@/database/queries/qualifications";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { QualificationStatusList } from "@/components/qualifications/qualification-lists";
import { jobsQualifiedFor } from "@/domain/qualifications/overview";
import { TodayDrafts } from "./today-drafts";
import { TodayPanel } from "./today-panel";

export async function TodayFuser({ userId, crewId, now }: { userId: number; crewId: number | null; now: Date }) {
  const [jobs, statuses] = await Promise.all([listOpenJobsForFuser({ userId, crewId }), qualificationStatusOverview({ userId, now, timeZone: await organisationTimeZone() })]);
  const anyQualified = statuses.some((s) => s.status.qualified);
  const recordable = jobsQualifiedFor(jobs, statuses);
  const blocked = jobs.length > 0 && recordable.length === 0;
  return (
    <>
      {blocked ? (
        <TodayPanel id="today-blocked" title="You cannot record joints" tone="attention">
          <p className="font-semibold">Your qualification does not cover the procedure of any of your open jobs ({[...new Set(jobs.map((j) => j.procedureCode))].join(", ")}). Ask an administrator to record your requalification.</p>
        </TodayPanel>
      ) : null}
      <TodayPanel id="today-qualification" title="Your qualification" tone={anyQualified ? "plain" : "attention"}>
        <QualificationStatusList statuses={statuses} empty="No qualification on record: you may not make joints until an administrator records one." />
      </TodayPanel>
      <TodayPanel id="today-jobs" title="Your jobs" href={recordable.length ? "/trench" : undefined} linkText="Record a joint">
        {jobs.length ? (
          <ul className="flex flex-col gap-1">
            {jobs.map((j) => (
              <li key={j.id}>
                <span className="font-semibold">{j.code}</span> {j.name}
                {j.place ? ` · ${j.place}` : ""} · {j.procedureCode}
                {recordable.includes(j) ? "" : <span className="font-semibold text-fail"> · not qualified for {j.procedureCode}</span>}
              </li>
            ))}
          </ul>
        ) : (
          <p>No open jobs for your crew.</p>
        )}
      </TodayPanel>
      <TodayPanel id="today-drafts" title="Your open drafts">
        <TodayDrafts userId={userId} />
      </TodayPanel>
    </>
  );
}
