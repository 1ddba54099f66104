// /api/v1/joints — POST records a joint (fuser; 201 new, 200 when the client id was seen
// before), GET lists joints newest first (fusers see their own; others every joint).
import { recordJoint } from "@/app/_server/joints/record-joint";
import { defineRoute } from "@/app/_lib/guard";
import { listJoints } from "@/database/queries/joints";
import { listJointsQuerySchema, recordJointSchema } from "@/domain/joints/schemas";
import { can } from "@/domain/roles";
import { jointJson } from "@/app/_server/joints/joint-json";

export const dynamic = "force-dynamic";

export const POST = defineRoute({ permission: "recordJoint", schema: recordJointSchema, input: "json" }, async (input, ctx) => {
  const result = await recordJoint(input, ctx);
  return Response.json({ joint: result.joint, created: result.created }, { status: result.created ? 201 : 200, headers: { location: `/api/v1/joints/${result.joint.id}` } });
});

export const GET = defineRoute({ permission: "signed-in", schema: listJointsQuerySchema, input: "query" }, async (q, { user }) => {
  const seesAll = can(user, "viewRegister");
  const mine = q.mine === "1" || q.mine === "true";
  const joints = await listJoints({ jobId: q.jobId, clientId: q.clientId, beforeId: q.before ? Number(q.before) : undefined, fuserId: !seesAll || mine ? user.id : undefined, limit: q.limit });
  const last = joints[joints.length - 1];
  return Response.json({ joints: joints.map((j) => jointJson(j, user.unitSystem)), next: joints.length === q.limit && last ? `/api/v1/joints?${new URLSearchParams({ ...(q.jobId ? { jobId: String(q.jobId) } : {}), ...(mine ? { mine: "1" } : {}), limit: String(q.limit), before: String(last.id) })}` : null });
});
