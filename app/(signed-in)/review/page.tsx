import { requireUser } from "@/app/_lib/page-guard";
import { findReviewItem, latestJointRevision, listQueueFilterOptions } from "@/database/queries/reviews";
import { reviewQueueFilterSchema } from "@/domain/review/schemas";
import { parseId } from "@/domain/form-fields";
import { PARAMETER_LABELS } from "@/domain/fusion/parameters";
import { describeFieldErrors, fieldErrorsFromIssues } from "@/domain/result";
import { ReviewQueue, type Landing, type QueueFilterText } from "./_components/review-queue";
import { toQueueItemView } from "@/app/_server/review/queue-item-view";
import { loadQueuePage } from "@/app/_server/review/queue-page";

export const dynamic = "force-dynamic";

const FILTER_KEYS = ["job", "fuser", "machine", "outcome", "finding", "waiting", "from", "to", "order"] as const;
const FILTER_LABELS = { job: "Job", fuser: "Fuser", machine: "Machine", outcome: "Outcome", finding: "Finding", waiting: "Waiting more than", from: "Made from", to: "Made to", order: "Order" };

/** Where `/review?joint=N` lands: the joint when it waits, else what became of it. */
async function landingOf(jointId: number, unitSystem: Parameters<typeof toQueueItemView>[1]): Promise<Landing> {
  const item = await findReviewItem({ jointId });
  if (!item) return { kind: "unknown", jointId };
  if (item.reviewState === "pending-review") return { kind: "pending", item: toQueueItemView(item, unitSystem) };
  const latest = await latestJointRevision({ jointId });
  return { kind: "decided", jointId, label: `${item.jobCode} joint ${item.jointNo}`, reviewState: item.reviewState, byName: latest?.byName ?? null, at: latest ? latest.at.toISOString() : null };
}

// Review: the inspector's queue of joints waiting for a decision, every one of them paged by
// keyset through the JSON API, filtered from the URL, kept current by polling (a joint
// recorded at the trench appears without a reload).
export default async function ReviewPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("viewReview");
  const params = await searchParams;
  const one = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v);
  const raw = Object.fromEntries(FILTER_KEYS.map((k) => [k, one(params[k]) ?? ""]));
  const parsed = reviewQueueFilterSchema.safeParse(raw);
  const filter = parsed.success ? parsed.data : reviewQueueFilterSchema.parse({});
  const linkProblem = parsed.success ? null : `The link's filter was not understood (${describeFieldErrors(fieldErrorsFromIssues(parsed.error.issues), FILTER_LABELS)}); the whole queue is shown.`;
  const jointId = parseId(one(params.joint), "bigint");
  const [options, page, landing] = await Promise.all([
    listQueueFilterOptions(),
    loadQueuePage(filter, { user }),
    jointId !== null ? landingOf(jointId, user.unitSystem) : Promise.resolve(null),
  ]);
  const text = (v: unknown) => (v === undefined || v === null ? "" : String(v));
  const initialFilter = Object.fromEntries(FILTER_KEYS.map((k) => [k, k === "order" ? filter.order : text(filter[k])])) as QueueFilterText;
  return (
    <div className="flex min-w-0 flex-col gap-4">
      <h1 className="text-2xl font-bold">Review</h1>
      <p className="max-w-3xl text-slate-700">
        Joints waiting for a decision, the oldest first. Open a joint to compare the plan with what was recorded, look at the photos and the pressure trace, and accept it or cut it out;
        tick joints within limits to accept them together. You cannot decide joints you made yourself.
      </p>
      {linkProblem ? (
        <p role="alert" className="rounded-md border-2 border-fail bg-fail-light p-2 font-semibold text-fail">
          {linkProblem}
        </p>
      ) : null}
      <ReviewQueue
        initial={page}
        initialFilter={initialFilter}
        options={{ ...options, findings: Object.entries(PARAMETER_LABELS).map(([id, label]) => ({ id, label })) }}
        unitSystem={user.unitSystem}
        userId={user.id}
        landing={landing}
      />
    </div>
  );
}
