// /api/v1/attachments/:id — the stored file, only through this authorised route: bead
// photos and traces of a joint to anyone signed in; a photo not yet tied to a joint, and
// qualification evidence, only to the uploader, inspectors and admins. The type comes from
// what was detected at upload, never from the request; nosniff stops browsers guessing. Its
// sandbox policy (security-policy.js) is also set for this path in next.config.js, where no
// site-wide policy replaces it.
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { idParams } from "@/app/_lib/params";
import { findAttachmentById } from "@/database/queries/attachments";
import { getObject } from "@/app/_server/storage/object-store";
import { can } from "@/domain/roles";
import { PHOTO_TYPES } from "@/app/_server/attachments/upload-photo";
import { attachmentPolicy } from "@/security-policy.js";

export const dynamic = "force-dynamic";

export const GET = defineRoute({ permission: "signed-in", params: idParams("An attachment id is a whole number."), badParams: "bad-request", input: "none" }, async (_input, { user, params: { id } }) => {
  const attachment = await findAttachmentById({ id });
  if (!attachment) return errorResponse("not-found", `Attachment ${id} does not exist.`);
  const open = attachment.kind !== "qualification-evidence" && attachment.jointId !== null;
  if (!open && attachment.uploadedBy !== user.id && !can(user, "openAnyFile")) {
    return errorResponse("forbidden", "You may not open this file.");
  }
  const object = await getObject({ key: attachment.objectKey });
  if (!object) return errorResponse("not-found", `The file of attachment ${id} is missing from storage.`);
  const ext = PHOTO_TYPES[attachment.contentType] ?? "bin";
  return new Response(object.body as BodyInit, {
    status: 200,
    headers: {
      "content-type": attachment.contentType,
      "content-length": String(object.body.byteLength),
      "content-disposition": `inline; filename="${attachment.kind}-${attachment.id}.${ext}"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, max-age=3600",
      "content-security-policy": attachmentPolicy(),
      etag: `"${attachment.sha256}"`,
    },
  });
});
