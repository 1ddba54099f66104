// Qualification evidence, served only to admins through this handler (the bucket is private).
import { defineRoute, errorResponse } from "@/app/_lib/guard";
import { idParams } from "@/app/_lib/params";
import { findAttachmentById } from "@/database/queries/attachments";
import { getObject } from "@/app/_server/storage/object-store";

export const GET = defineRoute({ permission: "manageCrew", params: idParams("No such evidence file."), input: "none" }, async (_input, { params: { id } }) => {
  const attachment = await findAttachmentById({ id });
  if (!attachment || attachment.kind !== "qualification-evidence") return errorResponse("not-found", "No such evidence file.");
  const object = await getObject({ key: attachment.objectKey });
  if (!object) return errorResponse("not-found", "The evidence file is missing from storage.");
  const extension = attachment.contentType === "application/pdf" ? "pdf" : attachment.contentType === "image/png" ? "png" : "jpg";
  return new Response(Buffer.from(object.body), {
    headers: {
      "content-type": attachment.contentType,
      "content-length": String(object.body.byteLength),
      "content-disposition": `attachment; filename="qualification-evidence-${attachment.id}.${extension}"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});
