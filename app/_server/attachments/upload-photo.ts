// Bead-photo uploads: at most 10 MB, the type read from the file's own bytes (file-type),
// JPEG, PNG, WebP or HEIC/HEIF only, stored privately in the S3-compatible store under a
// generated key (never the file's name), then described by an attachments row. Nothing is
// written when any check fails; a store that fails leaves no row behind.
import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { fileTypeFromBuffer } from "file-type";
import { db } from "@/database/client";
import { insertAttachment, type AttachmentKind } from "@/database/queries/attachments";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { putObject } from "@/app/_server/storage/object-store";
import type { UserRecord } from "@/database/queries/users";
import { AppError } from "@/domain/result";
import { readFormLimited } from "@/app/_lib/body";

export const MAX_PHOTO_BYTES = 10 * 1024 * 1024;
/** Multipart framing around the file (boundaries, headers, the kind field). */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;

export const PHOTO_TYPES: Record<string, string> = {
  "image/jpeg": "jpg",
  "image/png": "png",
  "image/webp": "webp",
  "image/heic": "heic",
  "image/heif": "heif",
};

const tooLarge = () => new AppError("too-large", "The photo is larger than 10 MB; take it again at a lower resolution.", { file: ["Larger than 10 MB."] });

function safeName(name: string | undefined): string | null {
  if (!name) return null;
  // Shown only: strip any path and control characters.
  const base = name.split(/[\\/]/).pop()!.replace(/[\u0000-\u001f\u007f]/g, "").trim();
  return base ? base.slice(0, 200) : null;
}

export type UploadedAttachment = { id: number; kind: AttachmentKind; contentType: string; sizeBytes: number; sha256: string; url: string };

export async function uploadBeadPhoto({ request, user, requestId }: { request: Request; user: UserRecord; requestId?: string }): Promise<UploadedAttachment> {
  const contentType = request.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data/i.test(contentType)) {
    throw new AppError("bad-request", "Send the photo as multipart/form-data with the file in the field \"file\".", { file: ["Send the photo in a form field named file."] });
  }
  // Counted while it arrives: refused (413) the moment it passes the photo's limit plus the form's framing.
  const form = await readFormLimited(request, { max: MAX_PHOTO_BYTES + MULTIPART_OVERHEAD_BYTES, what: "photo", field: "file", limitText: "10 MB" }, { message: "The upload is not a readable multipart form.", fields: { file: ["Not a readable multipart form."] } });
  const kind = String(form.get("kind") ?? "bead-photo");
  if (kind !== "bead-photo") throw new AppError("invalid", "Only bead photos can be uploaded here.", { kind: ["Only bead-photo is accepted."] });
  const file = form.get("file");
  if (!file || typeof file === "string") throw new AppError("invalid", "Choose a photo to upload.", { file: ["Choose a photo to upload."] });
  if (file.size === 0) throw new AppError("invalid", "The photo is empty.", { file: ["The file is empty."] });
  if (file.size > MAX_PHOTO_BYTES) throw tooLarge();
  const bytes = new Uint8Array(await file.arrayBuffer());
  const detected = await fileTypeFromBuffer(bytes);
  if (!detected || !PHOTO_TYPES[detected.mime]) {
    const what = detected ? `a ${detected.ext.toUpperCase()} file` : "not a picture Beadline can read";
    throw new AppError("unsupported-type", `That file is ${what}, whatever its name says. Upload a JPEG, PNG, WebP or HEIC photo.`, { file: ["Only JPEG, PNG, WebP or HEIC photos."] });
  }
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  const objectKey = `bead-photos/${randomUUID()}`;
  await putObject({ key: objectKey, body: bytes, contentType: detected.mime });
  const id = await db().transaction(async (trx) => {
    const attachmentId = await insertAttachment({ kind: "bead-photo", objectKey, contentType: detected.mime, sizeBytes: bytes.byteLength, sha256, originalName: safeName(file.name), uploadedBy: user.id }, trx);
    await insertAuditEntry({ actorUserId: user.id, action: "attachment-uploaded", entityType: "attachment", entityId: attachmentId, requestId: requestId ?? null, details: { kind, contentType: detected.mime, sizeBytes: bytes.byteLength, sha256 } }, trx);
    return attachmentId;
  });
  return { id, kind: "bead-photo", contentType: detected.mime, sizeBytes: bytes.byteLength, sha256, url: `/api/v1/attachments/${id}` };
}
