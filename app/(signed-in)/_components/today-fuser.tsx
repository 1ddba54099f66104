// Today for a fuser: their open jobs, their drafts on this device, their qualification status.
import { listOpenJobsForFuser } from "@/database/queries/jobs";
import { qualificationStatusOverview } from "@/database/queries/qualifications";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { QualificationStatusList } from "@/components/qualifications/qualification-lists";
import { TodayDrafts } from "./today-drafts";
import { TodayPanel } from "./today-panel";

export async function TodayFuser({ userId, now }: { userId: number; now: Date }) {
  const [jobs, statuses] = await Promise.all([listOpenJobsForFuser({ userId }), qualificationStatusOverview({ userId, now, timeZone: await organisationTimeZone() })]);
  const anyQualified = statuses.some((s) => s.status.qualified);
  return (
    <>
      <TodayPanel id="today-qualification" title="Your qualification" tone={anyQualified ? "plain" : "attention"}>
        <QualificationStatusList statuses={statuses} empty="No qualification on record: you may not make joints until an administrator records one." />
      </TodayPanel>
      <TodayPanel id="today-jobs" title="Your jobs" href="/trench" linkText="Record a joint">
        {jobs.length ? (
          <ul className="flex flex-col gap-1">
            {jobs.map((j) => (
              <li key={j.id}>
                <span className="font-semibold">{j.code}</span> {j.name}
                {j.place ? ` · ${j.place}` : ""} · {j.procedureCode}
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
