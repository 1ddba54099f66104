// Use case: attach a pressure-trace CSV to a joint. The file is parsed (our own columns,
// see README "Pressure trace files"), its phases read and their values checked against the
// joint's plan like typed values; then the file goes to the object store and, in one
// transaction, the attachment row, the trace reading, a "trace-attached" revision, the
// projection (out of limits when the trace is) and the audit entry are written.
import "server-only";
import { createHash, randomUUID } from "node:crypto";
import { db } from "@/database/client";
import { findTraceAttachmentBySha256, insertAttachment, type TraceOwner } from "@/database/queries/attachments";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { enqueueJointAlert } from "@/app/_server/mail/joint-alert";
import { findReviewItem, insertJointRevision, insertJointTrace, lockJointState, updateJointState } from "@/database/queries/reviews";
import type { UserRecord } from "@/database/queries/users";
import { putObject } from "@/app/_server/storage/object-store";
import { parsePressureTraceCsv } from "@/domain/pressure-trace/parse";
import { readPressureTrace } from "@/domain/pressure-trace/read";
import type { JointOutcome } from "@/domain/joints/outcomes";
import { AppError } from "@/domain/result";
import { checkTraceReading, downsampleTrace } from "@/domain/pressure-trace/check";
import { can, canAttachTraceTo } from "@/domain/roles";
import { MAX_TRACE_FILE_BYTES } from "@/domain/review/schemas";

export type AttachTraceResult = { jointId: number; traceId: number; attachmentId: number; revisionNo: number; outcome: JointOutcome; findings: string[] };

export async function attachTrace(
  { jointId, fileName, bytes }: { jointId: number; fileName: string | null; bytes: Uint8Array },
  { user, requestId, now = new Date() }: { user: UserRecord; requestId: string; now?: Date },
): Promise<AttachTraceResult> {
  if (bytes.byteLength === 0) throw new AppError("invalid", "Check file: the file is empty.", { file: ["The file is empty"] });
  if (bytes.byteLength > MAX_TRACE_FILE_BYTES) throw new AppError("too-large", `The trace file is ${(bytes.byteLength / 1e6).toFixed(1)} MB; at most ${MAX_TRACE_FILE_BYTES / 1e6} MB is accepted.`, { file: ["The file is too large"] });
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new AppError("invalid", "Check file: it is not a text (CSV) file.", { file: ["The file is not UTF-8 text; save it as CSV"] });
  }
  const item = await findReviewItem({ jointId });
  if (!item || !canAttachTraceTo(user, item)) {
    if (item && can(user, "attachTrace")) throw new AppError("forbidden", "A fuser may attach a trace only to a joint they made.");
    throw new AppError("not-found", `Joint ${jointId} was not found.`);
  }
  if (!item.plan) throw new AppError("invalid", "This joint has no pressure plan to check a trace against.", { jointId: ["The joint has no plan"] });

  const parsed = parsePressureTraceCsv(text);
  if (!parsed.ok) {
    const lines = parsed.errors.map((e) => `Line ${e.line}: ${e.message}`);
    const first = parsed.errors[0]!;
    throw new AppError("invalid", `The trace file could not be read: line ${first.line}: ${first.message}${parsed.errors.length > 1 ? ` (and ${parsed.errors.length - 1} more)` : ""}.`, { file: lines });
  }
  const read = readPressureTrace(parsed.samples, { dragPressureMpa: item.recorded.dragPressureMpa ?? item.plan.dragPressureMpa, plan: item.plan });
  if (!read.ok) throw new AppError("invalid", `The trace was read but its phases could not be found: ${read.error}.`, { file: [read.error] });
  const check = checkTraceReading(item.plan, read.reading, item.recorded, "si");

  // One trace file, one joint: the same bytes already attached anywhere are refused before
  // anything is stored (and again inside the transaction, for two uploads at once).
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  const refuseDuplicate = (owner: TraceOwner | null) => {
    if (!owner) return;
    const where = owner.jointId === jointId ? "this joint" : `${owner.jobCode} joint ${owner.jointNo} (/joints/${owner.jointId})`;
    throw new AppError("conflict", `This trace file is already attached to ${where}. A trace belongs to one joint: attach the file logged for ${item.jobCode} joint ${item.jointNo}.`, {
      file: [`The same file is attached to ${owner.jobCode} joint ${owner.jointNo}`],
    });
  };
  refuseDuplicate(await findTraceAttachmentBySha256({ sha256 }));

  const objectKey = `pressure-trace/${randomUUID()}.csv`;
  // Stored before the transaction; if the transaction then fails, the object is an orphan
  // that nothing refers to (never served), which is safer than a row without its file.
  await putObject({ key: objectKey, body: bytes, contentType: "text/csv" });

  return db().transaction(async (trx) => {
    const state = await lockJointState({ jointId }, trx);
    if (!state) throw new AppError("not-found", `Joint ${jointId} was not found.`);
    refuseDuplicate(await findTraceAttachmentBySha256({ sha256 }, trx));
    const attachmentId = await insertAttachment({ kind: "pressure-trace", objectKey, contentType: "text/csv", sizeBytes: bytes.byteLength, sha256, originalName: fileName ? fileName.slice(0, 200) : null, uploadedBy: user.id, jointId }, trx);
    const revisionNo = state.revisionNo + 1;
    const becomesOut = check.outcome === "out-of-limits" && state.outcome === "within-limits";
    // New evidence out of limits re-opens an accepted joint; a cut-out joint stays cut out.
    const reviewState = check.outcome === "out-of-limits" && state.reviewState === "accepted" ? "pending-review" : state.reviewState;
    await insertJointRevision(
      {
        jointId,
        revisionNo,
        kind: "trace-attached",
        byUserId: user.id,
        at: now,
        reason: fileName ? `Pressure trace ${fileName.slice(0, 200)}` : "Pressure trace",
        reviewState,
        changes: { attachmentId, outcome: check.outcome, findings: check.findings.map((f) => f.parameter), heatSoakS: read.reading.heatSoakS, changeoverS: read.reading.changeoverS, coolingS: read.reading.coolingS },
      },
      trx,
    );
    const traceId = await insertJointTrace(
      { jointId, attachmentId, revisionNo, sampleCount: parsed.samples.length, pressureUnit: parsed.pressureUnit, reading: read.reading, chart: downsampleTrace(parsed.samples), outcome: check.outcome, findings: check.findings, uploadedBy: user.id, at: now },
      trx,
    );
    await updateJointState({ jointId, expectedRevisionNo: state.revisionNo, revisionNo, reviewState, outcome: becomesOut ? "out-of-limits" : undefined, at: now }, trx);
    await insertAuditEntry({ actorUserId: user.id, action: "joint-trace-attached", entityType: "joint", entityId: jointId, details: { revisionNo, attachmentId, traceId, outcome: check.outcome, sha256 }, requestId }, trx);
    if (becomesOut) await enqueueJointAlert({ jointId }, trx);
    return { jointId, traceId, attachmentId, revisionNo, outcome: check.outcome, findings: check.findings.map((f) => f.message) };
  });
}
