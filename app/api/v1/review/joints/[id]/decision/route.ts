// POST /api/v1/review/joints/:id/decision { decision, note, expectedRevisionNo } — the same
// decision as the review screen's action, for API clients. 409 when the joint moved on.
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { decideJointSchema } from "@/domain/review/schemas";
import { fieldErrorsFromIssues, describeFieldErrors } from "@/domain/result";
import { decideJoint } from "@/app/_server/review/decide-joint";

export const POST = defineRoute<typeof decideJointSchema, { id: string }>({ audience: ["inspector"], input: "raw" }, async (_input, { user, requestId, params, request }) => {
  let body: unknown;
  try {
    body = await request.json();
  } catch {
    return errorResponse("bad-request", "The request body is not valid JSON.", { _body: ["The request body is not valid JSON."] });
  }
  const parsed = decideJointSchema.safeParse({ ...(body as object), jointId: params.id });
  if (!parsed.success) {
    const fields = fieldErrorsFromIssues(parsed.error.issues);
    return errorResponse("invalid", describeFieldErrors(fields), fields);
  }
  const result = await decideJoint(parsed.data, { user, requestId });
  return Response.json(result);
});
