// Use cases of the Jobs screen: create, edit, close/reopen a job and assign its coils.
// Each change and its audit entry are one transaction; edits use optimistic locking.
import "server-only";
import { db, isDuplicateKey, type Db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { coilAssignmentProblems, findJobById, insertJob, setCoilsForJob, updateJob, updateJobStatus } from "@/database/queries/jobs";
import { findProcedureById } from "@/database/queries/procedures";
import { listCrews } from "@/database/queries/users";
import type { CreateJobInput, SetJobStatusInput, UpdateJobInput } from "@/domain/office/schemas";
import { AppError } from "@/domain/result";

type Ctx = { user: { id: number }; requestId: string };

export const CONFLICT_MESSAGE = (what: string) => `${what} was changed by someone else while you were editing; reload the page to see the latest and make your change again.`;

async function checkReferences(input: CreateJobInput, jobId: number | null, trx: Db): Promise<void> {
  const fields: Record<string, string[]> = {};
  const procedure = await findProcedureById({ id: input.procedureId }, trx);
  if (!procedure) fields.procedureId = ["Procedure does not exist."];
  else if (!procedure.isActive) fields.procedureId = [`Procedure ${procedure.code} is retired; choose an active procedure.`];
  if (input.crewId) {
    const crews = await listCrews({}, trx);
    if (!crews.some((c) => c.id === input.crewId)) fields.crewId = ["Crew does not exist."];
  }
  const coilProblems = await coilAssignmentProblems({ jobId, coilIds: input.coilIds }, trx);
  if (coilProblems.length) fields.coilIds = coilProblems;
  if (Object.keys(fields).length) throw new AppError("invalid", `Check ${Object.keys(fields).join(", ")}: ${Object.values(fields)[0]![0]}`, fields);
}

function duplicateCode(code: string): AppError {
  return new AppError("invalid", `A job with code ${code} already exists.`, { code: [`A job with code ${code} already exists.`] });
}

export async function createJob(input: CreateJobInput, ctx: Ctx): Promise<{ id: number }> {
  try {
    return await db().transaction(async (trx) => {
      await checkReferences(input, null, trx);
      const id = await insertJob(input, trx);
      const coils = await setCoilsForJob({ jobId: id, coilIds: input.coilIds, byUserId: ctx.user.id }, trx);
      await insertAuditEntry({ actorUserId: ctx.user.id, action: "job-created", entityType: "job", entityId: id, details: { code: input.code, procedureId: input.procedureId, crewId: input.crewId ?? null, coilsAdded: coils.added }, requestId: ctx.requestId }, trx);
      return { id };
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw duplicateCode(input.code);
    throw error;
  }
}

export async function editJob(input: UpdateJobInput, ctx: Ctx): Promise<{ id: number; version: number }> {
  try {
    return await db().transaction(async (trx) => {
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
  } catch (error) {
    if (isDuplicateKey(error)) throw duplicateCode(input.code);
    throw error;
  }
}

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
