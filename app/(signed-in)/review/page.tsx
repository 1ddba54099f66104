import { requireUser } from "@/app/_lib/page-guard";
import { listQueueFilterOptions, listReviewQueue } from "@/database/queries/reviews";
import { reviewQueueFilterSchema } from "@/domain/review/schemas";
import { parseId } from "@/domain/form-fields";
import { PARAMETER_LABELS } from "@/domain/fusion/parameters";
import { ReviewQueue } from "./_components/review-queue";
import { toQueueItemView } from "@/app/_server/review/queue-item-view";
import { MailPreference } from "../_components/mail-preference";

export const dynamic = "force-dynamic";

// Review: the inspector's queue of joints waiting for a decision, kept current by polling
// the JSON API (a joint recorded at the trench appears without a reload).
export default async function ReviewPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("viewReview");
  const params = await searchParams;
  const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);
  const parsed = reviewQueueFilterSchema.safeParse({ job: one(params.job), fuser: one(params.fuser), machine: one(params.machine), finding: one(params.finding) });
  const filter = parsed.success ? parsed.data : reviewQueueFilterSchema.parse({});
  const [options, queue] = await Promise.all([
    listQueueFilterOptions(),
    listReviewQueue({ filter: { jobId: filter.job, fuserId: filter.fuser, machineId: filter.machine, finding: filter.finding }, limit: filter.limit }),
  ]);
  const selected = parseId(one(params.joint), "bigint");
  const filterErrors = parsed.success ? [] : [...new Set(parsed.error.issues.map((i) => i.message))];
  return (
    <div className="flex flex-col gap-4">
      <h1 className="text-2xl font-bold">Review</h1>
      <p className="max-w-3xl text-slate-700">
        Joints waiting for a decision: out of limits first, then the oldest. Open a joint to compare the plan with what was recorded, look at the photos and the
        pressure trace, and accept it or cut it out. You cannot decide joints you made yourself.
      </p>
      {filterErrors.length ? (
        <p role="alert" className="rounded-md border-2 border-fail bg-fail-light p-3 font-semibold text-fail">
          The filter in the address was not used: {filterErrors.join("; ")}.
        </p>
      ) : null}
      <ReviewQueue
        initial={{ total: queue.total, outOfLimits: queue.outOfLimits, items: queue.items.map((item) => toQueueItemView(item, user.unitSystem)) }}
        initialFilter={{ job: filter.job ? String(filter.job) : "", fuser: filter.fuser ? String(filter.fuser) : "", machine: filter.machine ? String(filter.machine) : "", finding: filter.finding ?? "" }}
        options={{ ...options, findings: Object.entries(PARAMETER_LABELS).map(([id, label]) => ({ id, label })) }}
        unitSystem={user.unitSystem}
        userId={user.id}
        initialSelected={selected}
      />
      <div className="max-w-md">
        <MailPreference dailyDigest={user.dailyDigest} />
      </div>
    </div>
  );
}
