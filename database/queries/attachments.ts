// Attachments: the rows that describe objects in the S3-compatible store (bead photos,
// pressure traces, qualification evidence). The object key is a generated id; the file's
// own name is kept for display only.
import { conn, type Db } from "../client";
import type { AttachmentRow as AttachmentTableRow } from "../tables";

export type AttachmentKind = "bead-photo" | "pressure-trace" | "qualification-evidence";

export type Attachment = {
  id: number;
  kind: AttachmentKind;
  objectKey: string;
  contentType: string;
  sizeBytes: number;
  sha256: string;
  originalName: string | null;
  jointId: number | null;
  uploadedBy: number | null;
  uploadedAt: Date;
};

/** An attachments row; kind holds an AttachmentKind (written from it only). */
type AttachmentRow = AttachmentTableRow & { kind: AttachmentKind };

function toAttachment(row: AttachmentRow): Attachment {
  return {
    id: Number(row.id),
    kind: row.kind,
    objectKey: row.object_key,
    contentType: row.content_type,
    sizeBytes: Number(row.size_bytes),
    sha256: row.sha256,
    originalName: row.original_name,
    jointId: row.joint_id == null ? null : Number(row.joint_id),
    uploadedBy: row.uploaded_by,
    uploadedAt: row.uploaded_at,
  };
}

export async function insertAttachment(
  a: { kind: AttachmentKind; objectKey: string; contentType: string; sizeBytes: number; sha256: string; originalName: string | null; uploadedBy: number; jointId?: number | null },
  trx?: Db,
): Promise<number> {
  const [id] = await conn(trx)("attachments").insert({
    kind: a.kind,
    object_key: a.objectKey,
    content_type: a.contentType,
    size_bytes: a.sizeBytes,
    sha256: a.sha256,
    original_name: a.originalName,
    joint_id: a.jointId ?? null,
    uploaded_by: a.uploadedBy,
  });
  return Number(id);
}

export async function findAttachmentById({ id }: { id: number }, trx?: Db): Promise<Attachment | null> {
  const row = (await conn(trx)("attachments").where({ id }).first()) as AttachmentRow | undefined;
  return row ? toAttachment(row) : null;
}

export type TraceOwner = { attachmentId: number; jointId: number; jobCode: string; jointNo: number };

/**
 * The joint a pressure-trace file (by the SHA-256 of its bytes) is already attached to;
 * null when none. Reads the attachments_sha256 index.
 */
export async function findTraceAttachmentBySha256({ sha256 }: { sha256: string }, trx?: Db): Promise<TraceOwner | null> {
  const row = (await conn(trx)("attachments as a")
    .join("joints as j", "j.id", "a.joint_id")
    .join("jobs", "jobs.id", "j.job_id")
    .where({ "a.sha256": sha256, "a.kind": "pressure-trace" })
    .orderBy("a.id")
    .first("a.id", "a.joint_id", "j.joint_no", "jobs.code as job_code")) as { id: number; joint_id: number; joint_no: number; job_code: string } | undefined;
  return row ? { attachmentId: Number(row.id), jointId: Number(row.joint_id), jobCode: row.job_code, jointNo: Number(row.joint_no) } : null;
}

export async function listAttachmentsForJoint({ jointId }: { jointId: number }, trx?: Db): Promise<Attachment[]> {
  const rows = (await conn(trx)("attachments").where({ joint_id: jointId }).orderBy("id")) as AttachmentRow[];
  return rows.map(toAttachment);
}

/**
 * Ties uploaded bead photos to their joint. Only photos the same person uploaded and that
 * belong to no joint yet are taken; returns how many were tied (the caller compares).
 */
export async function attachPhotosToJoint({ ids, jointId, userId }: { ids: number[]; jointId: number; userId: number }, trx?: Db): Promise<number> {
  if (ids.length === 0) return 0;
  return conn(trx)("attachments")
    .whereIn("id", ids)
    .andWhere({ kind: "bead-photo", uploaded_by: userId })
    .whereNull("joint_id")
    .update({ joint_id: jointId });
}

export async function countAttachments(trx?: Db): Promise<number> {
  const row = (await conn(trx)("attachments").count({ n: "*" }).first()) as { n: number | string } | undefined;
  return Number(row?.n ?? 0);
}
