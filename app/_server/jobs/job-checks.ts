// What the job use cases share: the reference checks and the duplicate-code refusal.
import "server-only";
import type { Db } from "@/database/client";
import { coilAssignmentProblems } from "@/database/queries/jobs";
import { findProcedureById } from "@/database/queries/procedures";
import { listCrews } from "@/database/queries/users";
import type { CreateJobInput } from "@/domain/jobs/schemas";
import { AppError, describeFieldErrors } from "@/domain/result";

export async function checkReferences(input: CreateJobInput, jobId: number | null, trx: Db): Promise<void> {
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
  if (Object.keys(fields).length) throw new AppError("invalid", describeFieldErrors(fields), fields);
}

export function duplicateCode(code: string): AppError {
  return new AppError("invalid", `A job with code ${code} already exists.`, { code: [`A job with code ${code} already exists.`] });
}
