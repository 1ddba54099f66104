// /api/v1/joints/:id — one joint with its revisions, photos and the overrides it was made
// under. Any signed-in person may read a joint (traceability is open inside the operator).
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { idParams } from "@/app/_lib/params";
import { listAttachmentsForJoint } from "@/database/queries/attachments";
import { findJointById, listJointRevisions, listOverrideUsesForJoint } from "@/database/queries/joints";
import { jointJson } from "@/app/_server/joints/joint-json";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "signed-in", params: idParams("A joint id is a whole number."), badParams: "bad-request", input: "none" }, async (_input, { user, params: { id } }) => {
  const joint = await findJointById({ id });
  if (!joint) return errorResponse("not-found", `Joint ${id} does not exist.`);
  const [revisions, photos, overrides] = await Promise.all([listJointRevisions({ jointId: id }), listAttachmentsForJoint({ jointId: id }), listOverrideUsesForJoint({ jointId: id })]);
  return Response.json({
    joint: {
      ...jointJson(joint, user.unitSystem),
      revisions: revisions.map((r) => ({ revisionNo: r.revisionNo, kind: r.kind, by: { id: r.byUserId, name: r.byUserName }, at: r.at.toISOString(), reason: r.reason, changes: r.changes, reviewState: r.reviewState })),
      photos: photos.map((p) => ({ id: p.id, kind: p.kind, contentType: p.contentType, sizeBytes: p.sizeBytes, sha256: p.sha256, url: `/api/v1/attachments/${p.id}` })),
      overrides: overrides.map((o) => ({ id: o.id, blockKind: o.blockKind, message: o.message, reason: o.reason, grantedBy: { id: o.grantedById, name: o.grantedByName }, grantedAt: o.grantedAt.toISOString(), expiresAt: o.expiresAt.toISOString() })),
    },
  });
});
