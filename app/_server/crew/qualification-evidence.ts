// What the qualification use cases share: the evidence file types and size limit, the
// evidence sniffing, the person/procedure and date checks, and the status on a date.
import "server-only";
import { findProcedureById } from "@/database/queries/procedures";
import { listQualificationFailuresForUser, listQualificationsForUser } from "@/database/queries/qualifications";
import { findUserById } from "@/database/queries/users";
import { qualificationStatus, type QualificationStatus } from "@/domain/qualifications/status";
import { AppError, describeFieldErrors } from "@/domain/result";

export type EvidenceFile = { bytes: Uint8Array; contentType: string; name: string };

/** Evidence may be a photo or a scanned report: PDF, JPEG or PNG, at most 10 MB. */
export const EVIDENCE_TYPES: Record<string, string> = { "application/pdf": "pdf", "image/jpeg": "jpg", "image/png": "png" };

export const MAX_EVIDENCE_BYTES = 10 * 1024 * 1024;

export async function checkPersonAndProcedure(userId: number, procedureId: number) {
  const [person, procedure] = await Promise.all([findUserById({ id: userId }), findProcedureById({ id: procedureId })]);
  const fields: Record<string, string[]> = {};
  if (!person) fields.userId = ["Person does not exist."];
  else if (!person.isActive) fields.userId = [`${person.name} is deactivated.`];
  if (!procedure) fields.procedureId = ["Procedure does not exist."];
  if (Object.keys(fields).length) throw new AppError("invalid", describeFieldErrors(fields), fields);
  return { person: person!, procedure: procedure! };
}

export function notInFuture(date: string, today: string, field: string, label: string): void {
  if (date > today) throw new AppError("invalid", `${label} ${date} is in the future (today is ${today}).`, { [field]: [`${label} ${date} is in the future (today is ${today}).`] });
}

/** Reads the file's first bytes to confirm its type (the browser's claim is not trusted). */
export function sniffEvidenceType(bytes: Uint8Array): string | null {
  if (bytes.length >= 5 && bytes[0] === 0x25 && bytes[1] === 0x50 && bytes[2] === 0x44 && bytes[3] === 0x46 && bytes[4] === 0x2d) return "application/pdf"; // %PDF-
  if (bytes.length >= 3 && bytes[0] === 0xff && bytes[1] === 0xd8 && bytes[2] === 0xff) return "image/jpeg";
  if (bytes.length >= 8 && [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a].every((b, i) => bytes[i] === b)) return "image/png";
  return null;
}

export async function statusFor(userId: number, procedureId: number, on: string): Promise<QualificationStatus> {
  const [qs, fs] = await Promise.all([listQualificationsForUser({ userId, procedureId }), listQualificationFailuresForUser({ userId, procedureId })]);
  return qualificationStatus({ qualifiedOn: qs.map((q) => q.qualifiedOn), failedTestsOn: fs.map((f) => f.failedOn), on });
}
