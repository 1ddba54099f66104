// GET /api/v1/review/queue?job=&fuser=&machine=&outcome=&finding=&waiting=&from=&to=&order=&after=&limit=
// — one page of the inspector's review queue as JSON (polled by the review screen so new
// joints appear without a reload). `next` is the cursor for `after` of the following page
// (keyset paging), null on the last; `facets` (first page only) counts each filter choice.
import { defineRoute } from "@/app/_lib/guard";
import { reviewQueueFilterSchema } from "@/domain/review/schemas";
import { loadQueuePage } from "@/app/_server/review/queue-page";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "viewReview", schema: reviewQueueFilterSchema, input: "query" }, async (input, { user }) => {
  return Response.json(await loadQueuePage(input, { user }), { headers: { "cache-control": "no-store" } });
});
