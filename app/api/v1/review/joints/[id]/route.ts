// GET /api/v1/review/joints/:id — one joint's evidence and its revisions (inspector).
import { z } from "zod";
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { findReviewItem, listJointRevisions } from "@/database/queries/reviews";
import { toQueueItemView } from "@/app/_server/review/queue-item-view";

export const dynamic = "force-dynamic";
const idSchema = z.coerce.number().int().positive();

export const GET = defineRoute<z.ZodTypeAny, { id: string }>({ audience: ["inspector"], input: "none" }, async (_input, { user, params }) => {
  const id = idSchema.safeParse(params.id);
  if (!id.success) return errorResponse("not-found", "No such joint.");
  const item = await findReviewItem({ jointId: id.data });
  if (!item) return errorResponse("not-found", "No such joint.");
  const revisions = await listJointRevisions({ jointId: id.data });
  return Response.json({ item: toQueueItemView(item, user.unitSystem), revisions }, { headers: { "cache-control": "no-store" } });
});
