// Open or close a job under optimistic locking, with the audit entry.
import "server-only";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { findJobById, updateJobStatus } from "@/database/queries/jobs";
import type { SetJobStatusInput } from "@/domain/jobs/schemas";
import { AppError } from "@/domain/result";
import { CONFLICT_MESSAGE } from "@/app/_server/edit-conflict";

type Ctx = { user: { id: number }; requestId: string };

/** Close (no new joints) or reopen a job. */
export async function setJobStatus(input: SetJobStatusInput, ctx: Ctx): Promise<{ id: number; version: number; status: "open" | "closed" }> {
  return db().transaction(async (trx) => {
    const before = await findJobById({ id: input.id, forUpdate: true }, trx);
    if (!before) throw new AppError("not-found", "That job does not exist.");
    if (!(await updateJobStatus(input, trx))) throw new AppError("conflict", CONFLICT_MESSAGE(`Job ${before.code}`));
    await insertAuditEntry(
      { actorUserId: ctx.user.id, action: input.status === "closed" ? "job-closed" : "job-reopened", entityType: "job", entityId: input.id, details: { from: before.status, to: input.status }, requestId: ctx.requestId },
      trx,
    );
    return { id: input.id, version: input.version + 1, status: input.status };
  });
}
