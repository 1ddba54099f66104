// GET /api/v1/review/queue?job=&fuser=&machine=&finding=&limit= — the inspector's review
// queue as JSON (polled by the review screen so new joints appear without a reload).
import { defineRoute } from "@/app/_lib/guard";
import { listReviewQueue } from "@/database/queries/reviews";
import { reviewQueueFilterSchema } from "@/domain/review/schemas";
import { toQueueItemView } from "@/app/_server/review/queue-item-view";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "viewReview", schema: reviewQueueFilterSchema, input: "query" }, async (input, { user }) => {
  const queue = await listReviewQueue({ filter: { jobId: input.job, fuserId: input.fuser, machineId: input.machine, finding: input.finding }, limit: input.limit });
  return Response.json(
    { total: queue.total, outOfLimits: queue.outOfLimits, items: queue.items.map((item) => toQueueItemView(item, user.unitSystem)) },
    { headers: { "cache-control": "no-store" } },
  );
});
