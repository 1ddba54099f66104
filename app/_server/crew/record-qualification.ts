// Record a qualification (with its evidence file in the object store) and the audit entry.
import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { db, isDuplicateKey } from "@/database/client";
import { insertAttachment } from "@/database/queries/attachments";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { insertQualification } from "@/database/queries/qualifications";
import { putObject } from "@/app/_server/storage/object-store";
import { isoDateIn } from "@/domain/dates/zone";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import type { RecordQualificationInput } from "@/domain/qualifications/schemas";
import type { QualificationStatus } from "@/domain/qualifications/status";
import { AppError } from "@/domain/result";
import { type EvidenceFile, EVIDENCE_TYPES, MAX_EVIDENCE_BYTES, checkPersonAndProcedure, notInFuture, sniffEvidenceType, statusFor } from "./qualification-evidence";

type Ctx = { user: { id: number }; requestId: string };

export async function recordQualification(
  input: RecordQualificationInput,
  ctx: Ctx,
  { now = new Date(), evidence }: { now?: Date; evidence?: EvidenceFile | null } = {},
): Promise<{ id: number; status: QualificationStatus }> {
  // "Today" is the organisation's local day (a date typed in the form is a local date).
  const today = isoDateIn(now, await organisationTimeZone());
  notInFuture(input.qualifiedOn, today, "qualifiedOn", "Qualification date");
  const { person, procedure } = await checkPersonAndProcedure(input.userId, input.procedureId);

  let evidenceKey: string | null = null;
  let evidenceMeta: { contentType: string; size: number; sha256: string; name: string } | null = null;
  if (evidence && evidence.bytes.byteLength > 0) {
    if (evidence.bytes.byteLength > MAX_EVIDENCE_BYTES) throw new AppError("too-large", "The evidence file is larger than 10 MB.", { evidence: ["The evidence file is larger than 10 MB."] });
    const type = sniffEvidenceType(evidence.bytes);
    if (!type) throw new AppError("unsupported-type", "Evidence must be a PDF, JPEG or PNG file.", { evidence: ["Evidence must be a PDF, JPEG or PNG file."] });
    evidenceKey = `qualification-evidence/${randomUUID()}.${EVIDENCE_TYPES[type]}`;
    evidenceMeta = { contentType: type, size: evidence.bytes.byteLength, sha256: createHash("sha256").update(evidence.bytes).digest("hex"), name: evidence.name.slice(0, 200) };
    // Stored before the rows: if the transaction fails, an unreferenced object is left, never a row without its file.
    await putObject({ key: evidenceKey, body: evidence.bytes, contentType: type });
  }

  try {
    const id = await db().transaction(async (trx) => {
      const attachmentId =
        evidenceKey && evidenceMeta
          ? await insertAttachment({ kind: "qualification-evidence", objectKey: evidenceKey, contentType: evidenceMeta.contentType, sizeBytes: evidenceMeta.size, sha256: evidenceMeta.sha256, originalName: evidenceMeta.name, uploadedBy: ctx.user.id }, trx)
          : null;
      const qid = await insertQualification({ ...input, evidenceAttachmentId: attachmentId, recordedBy: ctx.user.id }, trx);
      await insertAuditEntry(
        {
          actorUserId: ctx.user.id,
          action: "qualification-recorded",
          entityType: "user",
          entityId: input.userId,
          details: { qualificationId: qid, procedureId: input.procedureId, procedureCode: procedure.code, qualifiedOn: input.qualifiedOn, method: input.method, evaluator: input.evaluator, evidenceAttachmentId: attachmentId },
          requestId: ctx.requestId,
        },
        trx,
      );
      return qid;
    });
    return { id, status: await statusFor(input.userId, input.procedureId, today) };
  } catch (error) {
    if (isDuplicateKey(error)) {
      throw new AppError("conflict", `A qualification of ${person.name} for ${procedure.code} on ${input.qualifiedOn} is already on record (perhaps recorded by someone else just now); reload the page.`);
    }
    throw error;
  }
}
