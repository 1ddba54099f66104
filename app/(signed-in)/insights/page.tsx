import { requireUser } from "@/app/_lib/page-guard";
import { listJobs } from "@/database/queries/jobs";
import {
  coolingRecordedVersusRequired,
  findingsByParameter,
  firstPassYieldByFuser,
  firstPassYieldByMachine,
  firstPassYieldByWeek,
  heaterTemperatures,
  insightsSummary,
} from "@/database/queries/insights";
import { PARAMETER_LABELS } from "@/domain/fusion/parameters";
import { FieldShell } from "@/components/form/field-shell";
import { TimeDisplay } from "@/components/ui/time-display";
import { InsightsCharts } from "./_components/insights-charts";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { isoDateIn, localDayRange } from "@/domain/dates/zone";
import { addDays } from "@/domain/dates/civil";
import { parseId } from "@/domain/form-fields";

export const dynamic = "force-dynamic";

const PERIODS = [4, 12, 26, 52] as const;

// Insights: trends of the joint records as charts (first-pass yield, findings, heater
// temperatures, cooling), each with the numbers behind it.
export default async function InsightsPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("viewInsights");
  const params = await searchParams;
  const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);
  const weeks = PERIODS.find((p) => String(p) === one(params.weeks)) ?? 12;
  const jobText = one(params.job)?.trim() ?? "";
  // A job filter that is not a job id (1e309, hex, a fraction) is shown as refused, never queried.
  const jobId = parseId(jobText) ?? undefined;
  const badJob = jobText !== "" && jobId === undefined;
  // The period is whole local days in the organisation's zone, ending with today.
  const timeZone = await organisationTimeZone();
  const today = isoDateIn(new Date(), timeZone);
  const to = localDayRange(today, timeZone).nextStart;
  const from = localDayRange(addDays(today, 1 - weeks * 7), timeZone).start;
  const filter = { from, to, jobId };
  const [jobs, summary, byWeek, byFuser, byMachine, findings, heater, cooling] = await Promise.all([
    listJobs(),
    insightsSummary(filter),
    firstPassYieldByWeek({ ...filter, timeZone }),
    firstPassYieldByFuser(filter),
    firstPassYieldByMachine(filter),
    findingsByParameter(filter),
    heaterTemperatures(filter),
    coolingRecordedVersusRequired(filter),
  ]);
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Insights</h1>
      <form method="get" className="flex flex-wrap items-end gap-3" aria-label="Choose the period and job">
        <FieldShell id="weeks" label="Period">
          {(control) => (
            <select {...control} name="weeks" defaultValue={String(weeks)} className="min-h-touch rounded-md border-2 border-slate-400 bg-white px-2">
              {PERIODS.map((p) => (
                <option key={p} value={p}>
                  Last {p} weeks
                </option>
              ))}
            </select>
          )}
        </FieldShell>
        <FieldShell id="job" label="Job" className="min-w-0 max-w-full">
          {(control) => (
            <select {...control} name="job" defaultValue={jobId ? String(jobId) : ""} className="min-h-touch max-w-full rounded-md border-2 border-slate-400 bg-white px-2">
              <option value="">All jobs</option>
              {jobs.map((j) => (
                <option key={j.id} value={j.id}>
                  {j.code} {j.name}
                </option>
              ))}
            </select>
          )}
        </FieldShell>
        <button type="submit" className="min-h-touch rounded-md bg-brand px-4 font-semibold text-white">
          Show
        </button>
      </form>
      {badJob ? (
        <p role="alert" className="rounded-md border-2 border-fail bg-fail-light p-3 font-semibold text-fail">
          The job in the address is not a job on file; showing every job.
        </p>
      ) : null}
      <p>
        <TimeDisplay at={from} precision="date" /> to <TimeDisplay at={to.getTime() - 1} precision="date" />: <strong>{summary.joints}</strong> joints, first-pass yield{" "}
        <strong>{summary.joints ? `${summary.yieldPct} %` : "—"}</strong>, {summary.outOfLimits} out of limits, {summary.cutOut} cut out, {summary.pending} waiting for review.
      </p>
      <p className="text-sm text-slate-700">First-pass yield: joints within limits (when recorded and, where a pressure trace is attached, by the trace) and not cut out, as a share of all joints made.</p>
      <InsightsCharts
        unitSystem={user.unitSystem}
        byWeek={byWeek}
        byFuser={byFuser}
        byMachine={byMachine}
        findings={findings.map((f) => ({ label: PARAMETER_LABELS[f.parameter] ?? f.parameter, joints: f.joints }))}
        heater={heater.map((h) => ({ t: h.madeAt.getTime(), c: h.heaterTemperatureC, min: h.minC, max: h.maxC, jointId: h.jointId, heaterTag: h.heaterTag }))}
        cooling={cooling.map((c) => ({ label: c.label, recorded: c.coolingS, required: c.minCoolingS }))}
      />
    </div>
  );
}
