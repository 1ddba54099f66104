// Record a failed qualification test and the audit entry; returns the person's status
// afterwards.
import "server-only";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { findJointFuserId, insertQualificationFailure } from "@/database/queries/qualifications";
import { isoDateIn } from "@/domain/dates/zone";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import type { RecordQualificationFailureInput } from "@/domain/qualifications/schemas";
import type { QualificationStatus } from "@/domain/qualifications/status";
import { AppError } from "@/domain/result";
import { checkPersonAndProcedure, notInFuture, statusFor } from "./qualification-evidence";

type Ctx = { user: { id: number }; requestId: string };

export async function recordQualificationFailure(input: RecordQualificationFailureInput, ctx: Ctx, { now = new Date() }: { now?: Date } = {}): Promise<{ id: number; status: QualificationStatus }> {
  // "Today" is the organisation's local day (a date typed in the form is a local date).
  const today = isoDateIn(now, await organisationTimeZone());
  notInFuture(input.failedOn, today, "failedOn", "Failure date");
  const { procedure } = await checkPersonAndProcedure(input.userId, input.procedureId);
  const id = await db().transaction(async (trx) => {
    if (input.jointId) {
      const fuserId = await findJointFuserId({ jointId: input.jointId }, trx);
      if (fuserId === null) throw new AppError("invalid", "That joint does not exist.", { jointId: ["That joint does not exist."] });
      if (fuserId !== input.userId) throw new AppError("invalid", "That joint was made by someone else.", { jointId: ["That joint was made by someone else."] });
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
