// POST /api/v1/review/joints/:id/decision { decision, note, expectedRevisionNo } — the same
// decision as the review screen's action, for API clients. 409 when the joint moved on.
import { z } from "zod";
import { defineRoute, parseInput } from "@/app/_lib/guard";
import { decideJointSchema } from "@/domain/review/schemas";
import { decideJoint } from "@/app/_server/review/decide-joint";

// The joint id is checked with the decision itself (decideJointSchema), so a bad id is
// named among the other fields (422), as the review screen's action names it.
const params = z.object({ id: z.string() });

export const POST = defineRoute({ permission: "decideJoint", params, input: "json" }, async (body, { user, requestId, params: { id } }) => {
  const input = parseInput(decideJointSchema, { ...(body as object), jointId: id });
  const result = await decideJoint(input, { user, requestId });
  return Response.json(result);
});
