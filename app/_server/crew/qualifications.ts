// Use cases of the Crew screen's qualifications part: record a qualification or
// requalification (49 CFR 192.285(b): a specimen joint examined visually and tested by
// bend, tensile or ultrasonic), with optional evidence, and record production joints found
// unacceptable by test (which end the qualification until the person requalifies).
import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { db, isDuplicateKey } from "@/database/client";
import { insertAttachment } from "@/database/queries/attachments";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { findProcedureById } from "@/database/queries/procedures";
import { findJointFuserId, insertQualification, insertQualificationFailure, listQualificationFailuresForUser, listQualificationsForUser } from "@/database/queries/qualifications";
import { findUserById } from "@/database/queries/users";
import { putObject } from "@/app/_server/storage/object-store";
import { isoDateOf } from "@/domain/office/dates";
import type { RecordQualificationFailureInput, RecordQualificationInput } from "@/domain/office/schemas";
import { qualificationStatus, type QualificationStatus } from "@/domain/qualifications/status";
import { AppError } from "@/domain/result";

type Ctx = { user: { id: number }; requestId: string };

export type EvidenceFile = { bytes: Uint8Array; contentType: string; name: string };

/** Evidence may be a photo or a scanned report: PDF, JPEG or PNG, at most 10 MB. */
export const EVIDENCE_TYPES: Record<string, string> = { "application/pdf": "pdf", "image/jpeg": "jpg", "image/png": "png" };
export const MAX_EVIDENCE_BYTES = 10 * 1024 * 1024;

async function checkPersonAndProcedure(userId: number, procedureId: number) {
  const [person, procedure] = await Promise.all([findUserById({ id: userId }), findProcedureById({ id: procedureId })]);
  const fields: Record<string, string[]> = {};
  if (!person) fields.userId = ["Person does not exist."];
  else if (!person.isActive) fields.userId = [`${person.name} is deactivated.`];
  if (!procedure) fields.procedureId = ["Procedure does not exist."];
  if (Object.keys(fields).length) throw new AppError("invalid", `Check ${Object.keys(fields).join(", ")}: ${Object.values(fields)[0]![0]}`, fields);
  return { person: person!, procedure: procedure! };
}

function notInFuture(date: string, today: string, field: string, label: string): void {
  if (date > today) throw new AppError("invalid", `Check ${field}: ${label} ${date} is in the future.`, { [field]: [`${label} ${date} is in the future (today is ${today}).`] });
}

/** Reads the file's first bytes to confirm its type (the browser's claim is not trusted). */
export function sniffEvidenceType(bytes: Uint8Array): string | null {
  if (bytes.length >= 5 && bytes[0] === 0x25 && bytes[1] === 0x50 && bytes[2] === 0x44 && bytes[3] === 0x46 && bytes[4] === 0x2d) return "application/pdf"; // %PDF-
  if (bytes.length >= 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return "image/jpeg";
  if (bytes.length >= 8 && [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a].every((b, i) => bytes[i] === b)) return "image/png";
  return null;
}

export async function recordQualification(
  input: RecordQualificationInput,
  ctx: Ctx,
  { now = new Date(), evidence }: { now?: Date; evidence?: EvidenceFile | null } = {},
): Promise<{ id: number; status: QualificationStatus }> {
  const today = isoDateOf(now);
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

export async function recordQualificationFailure(input: RecordQualificationFailureInput, ctx: Ctx, { now = new Date() }: { now?: Date } = {}): Promise<{ id: number; status: QualificationStatus }> {
  const today = isoDateOf(now);
  notInFuture(input.failedOn, today, "failedOn", "Failure date");
  const { procedure } = await checkPersonAndProcedure(input.userId, input.procedureId);
  const id = await db().transaction(async (trx) => {
    if (input.jointId) {
      const fuserId = await findJointFuserId({ jointId: input.jointId }, trx);
      if (fuserId === null) throw new AppError("invalid", "Check jointId: that joint does not exist.", { jointId: ["That joint does not exist."] });
      if (fuserId !== input.userId) throw new AppError("invalid", "Check jointId: that joint was made by someone else.", { jointId: ["That joint was made by someone else."] });
    }
    const fid = await insertQualificationFailure({ ...input, recordedBy: ctx.user.id }, trx);
    await insertAuditEntry(
      { actorUserId: ctx.user.id, action: "qualification-failure-recorded", entityType: "user", entityId: input.userId, details: { failureId: fid, procedureId: input.procedureId, procedureCode: procedure.code, failedOn: input.failedOn, jointId: input.jointId ?? null }, requestId: ctx.requestId },
      trx,
    );
    return fid;
  });
  return { id, status: await statusFor(input.userId, input.procedureId, today) };
}

async function statusFor(userId: number, procedureId: number, on: string): Promise<QualificationStatus> {
  const [qs, fs] = await Promise.all([listQualificationsForUser({ userId, procedureId }), listQualificationFailuresForUser({ userId, procedureId })]);
  return qualificationStatus({ qualifiedOn: qs.map((q) => q.qualifiedOn), failedTestsOn: fs.map((f) => f.failedOn), on });
}
