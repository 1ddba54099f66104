// Edit a job under optimistic locking, with the audit entry.
import "server-only";
import { registerFilterOptionsChanged } from "@/app/_server/reference/register-filter-options";
import { db, isDuplicateKey } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { findJobById, setCoilsForJob, updateJob } from "@/database/queries/jobs";
import type { UpdateJobInput } from "@/domain/jobs/schemas";
import { AppError } from "@/domain/result";
import { CONFLICT_MESSAGE } from "@/app/_server/edit-conflict";
import { checkReferences, duplicateCode } from "./job-checks";

type Ctx = { user: { id: number }; requestId: string };

export async function editJob(input: UpdateJobInput, ctx: Ctx): Promise<{ id: number; version: number }> {
  try {
    const edited = await db().transaction(async (trx) => {
      const before = await findJobById({ id: input.id, forUpdate: true }, trx);
      if (!before) throw new AppError("not-found", "That job does not exist.");
      if (before.version !== input.version) throw new AppError("conflict", CONFLICT_MESSAGE(`Job ${before.code}`));
      await checkReferences(input, input.id, trx);
      if (!(await updateJob(input, trx))) throw new AppError("conflict", CONFLICT_MESSAGE(`Job ${before.code}`));
      const coils = await setCoilsForJob({ jobId: input.id, coilIds: input.coilIds, byUserId: ctx.user.id }, trx);
      const changed = (["code", "name", "place", "latitude", "longitude", "startsOn", "endsOn", "procedureId", "crewId", "pipeSizes"] as const).filter(
        (k) => (before[k] ?? null) !== (input[k] ?? null),
      );
      await insertAuditEntry(
        { actorUserId: ctx.user.id, action: "job-updated", entityType: "job", entityId: input.id, details: { changed, coilsAdded: coils.added, coilsRemoved: coils.removed }, requestId: ctx.requestId },
        trx,
      );
      return { id: input.id, version: input.version + 1 };
    });
    registerFilterOptionsChanged();
    return edited;
  } catch (error) {
    if (isDuplicateKey(error)) throw duplicateCode(input.code);
    throw error;
  }
}
