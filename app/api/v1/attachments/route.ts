// /api/v1/attachments — POST uploads one bead photo (multipart/form-data, field "file";
// 10 MB at most; JPEG, PNG, WebP or HEIC by the file's bytes). 201 with the attachment.
import { defineRoute } from "@/app/_lib/guard";
import { uploadBeadPhoto } from "@/app/_server/attachments/upload-photo";

export const dynamic = "force-dynamic";

export const POST = defineRoute({ permission: "uploadPhoto", input: "raw" }, async (_input, { user, request, requestId }) => {
  const attachment = await uploadBeadPhoto({ request, user, requestId });
  return Response.json({ attachment }, { status: 201, headers: { location: attachment.url } });
});
