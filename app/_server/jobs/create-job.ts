// Create a job (work order) and the audit entry.
import "server-only";
import { registerFilterOptionsChanged } from "@/app/_server/reference/register-filter-options";
import { db, isDuplicateKey } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { insertJob, setCoilsForJob } from "@/database/queries/jobs";
import type { CreateJobInput } from "@/domain/jobs/schemas";
import { checkReferences, duplicateCode } from "./job-checks";

type Ctx = { user: { id: number }; requestId: string };

export async function createJob(input: CreateJobInput, ctx: Ctx): Promise<{ id: number }> {
  try {
    const created = await db().transaction(async (trx) => {
      await checkReferences(input, null, trx);
      const id = await insertJob(input, trx);
      const coils = await setCoilsForJob({ jobId: id, coilIds: input.coilIds, byUserId: ctx.user.id }, trx);
      await insertAuditEntry({ actorUserId: ctx.user.id, action: "job-created", entityType: "job", entityId: id, details: { code: input.code, procedureId: input.procedureId, crewId: input.crewId ?? null, coilsAdded: coils.added }, requestId: ctx.requestId }, trx);
      return { id };
    });
    registerFilterOptionsChanged();
    return created;
  } catch (error) {
    if (isDuplicateKey(error)) throw duplicateCode(input.code);
    throw error;
  }
}
