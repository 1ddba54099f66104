// An inspector or admin clears a blocking warning (a heater plate whose check is overdue or
// failed, a quarantined or used-up coil, a coil assigned to another crew's job) for one job
// for a few hours. The grant is its own
// record with who, why and until when, audited in the same transaction; every joint made
// under it names it (joint_override_uses), written by the record-joint transaction.
import "server-only";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { findCoilById } from "@/database/queries/coils";
import { findHeaterWithLastCheck } from "@/database/queries/equipment";
import { organisationTimeZone } from "@/app/_server/organisation/get-time-zone";
import { findJobById } from "@/database/queries/jobs";
import { insertJointOverride } from "@/database/queries/joints";
import type { UserRecord } from "@/database/queries/users";
import type { GrantOverrideInput } from "@/domain/joints/schemas";
import { jobBlockReason } from "@/domain/jobs/rules";
import { AppError } from "@/domain/result";

export type GrantedOverride = { id: number; jobCode: string; subjectLabel: string; expiresAt: string };

export async function grantOverride(input: GrantOverrideInput, ctx: { user: UserRecord; requestId?: string; now?: Date }): Promise<GrantedOverride> {
  const now = ctx.now ?? new Date();
  const job = await findJobById({ id: input.jobId });
  if (!job) throw new AppError("invalid", `Job ${input.jobId} does not exist.`, { jobId: [`Job ${input.jobId} does not exist.`] });
  const closed = jobBlockReason(job);
  if (closed) throw new AppError("conflict", closed, { jobId: [closed] });
  let subjectLabel: string;
  if (input.subject === "heater") {
    const heater = await findHeaterWithLastCheck({ id: input.subjectId, now, timeZone: await organisationTimeZone() });
    if (!heater) throw new AppError("invalid", `Heater plate ${input.subjectId} does not exist.`, { subjectId: ["No such heater plate."] });
    if (!heater.isActive) throw new AppError("invalid", `Heater plate ${heater.assetTag} is retired and cannot be cleared for use.`, { subjectId: ["The heater plate is retired."] });
    subjectLabel = `heater plate ${heater.assetTag}`;
  } else {
    const coil = await findCoilById({ id: input.subjectId });
    if (!coil) throw new AppError("invalid", `Coil ${input.subjectId} does not exist.`, { subjectId: ["No such coil."] });
    subjectLabel = `coil ${coil.coilCode}`;
  }
  const expiresAt = new Date(now.getTime() + input.hours * 3_600_000);
  const id = await db().transaction(async (trx) => {
    const overrideId = await insertJointOverride({ jobId: job.id, subjectType: input.subject, subjectId: input.subjectId, reason: input.reason, grantedBy: ctx.user.id, grantedAt: now, expiresAt }, trx);
    await insertAuditEntry(
      { actorUserId: ctx.user.id, action: "block-override-granted", entityType: "joint-override", entityId: overrideId, requestId: ctx.requestId ?? null, details: { jobCode: job.code, subject: input.subject, subjectId: input.subjectId, reason: input.reason, expiresAt: expiresAt.toISOString() } },
      trx,
    );
    return overrideId;
  });
  return { id, jobCode: job.code, subjectLabel, expiresAt: expiresAt.toISOString() };
}
