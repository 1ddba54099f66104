// GET /api/v1/review/joints/:id — one joint's evidence and its revisions (inspector).
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { idParams } from "@/app/_lib/params";
import { findReviewItem, listJointRevisions } from "@/database/queries/reviews";
import { toQueueItemView } from "@/app/_server/review/queue-item-view";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "viewReview", params: idParams("No such joint."), input: "none" }, async (_input, { user, params: { id } }) => {
  const item = await findReviewItem({ jointId: id });
  if (!item) return errorResponse("not-found", "No such joint.");
  const revisions = await listJointRevisions({ jointId: id });
  return Response.json({ item: toQueueItemView(item, user.unitSystem), revisions }, { headers: { "cache-control": "no-store" } });
});
