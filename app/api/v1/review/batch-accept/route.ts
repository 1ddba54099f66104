// POST /api/v1/review/batch-accept { note, joints: [{ jointId, expectedRevisionNo }] } or
// { note, matching: { job, fuser, … } } — accepts joints within limits, each in its own
// transaction through the single decision; answers which were accepted and which skipped, why.
import { defineRoute } from "@/app/_lib/guard";
import { batchAcceptSchema } from "@/domain/review/schemas";
import { acceptBatch } from "@/app/_server/review/accept-batch";

export const POST = defineRoute({ permission: "decideJoint", schema: batchAcceptSchema, input: "json", labels: { joints: "Joints", note: "Note" } }, async (input, { user, requestId }) => {
  return Response.json(await acceptBatch(input, { user, requestId }));
});
