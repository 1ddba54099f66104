// Move a coil to another status under the domain rules (optimistic locking on its
// version): one transaction with the coil event and the audit entry.
import "server-only";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { lockCoil, updateCoilStatus, type Coil } from "@/database/queries/coils";
import { statusMoveProblem } from "@/domain/coils/life";
import type { MoveCoil } from "@/domain/coils/schemas";
import { AppError } from "@/domain/result";
import type { Actor } from "./receive-coil";

/** Moves a coil to another status under the domain rules, with optimistic locking on its version. */
export async function moveCoil(input: MoveCoil, { user, requestId }: Actor): Promise<{ id: number; coilCode: string; status: Coil["status"] }> {
  return db().transaction(async (trx) => {
    const coil = await lockCoil({ id: input.coilId }, trx);
    if (!coil) throw new AppError("not-found", `Coil ${input.coilId} is not on file.`);
    if (coil.version !== input.version) throw new AppError("conflict", `${coil.coilCode} was changed by someone else since you opened it; reload the page and try again.`);
    const problem = statusMoveProblem({ from: coil.status, to: input.to, reason: input.reason, crewId: input.crewId ?? coil.crewId, jobId: input.jobId ?? coil.jobId });
    if (problem) throw new AppError("invalid", problem.message, { [problem.field]: [problem.message] });
    const moved = await updateCoilStatus({ coil, to: input.to, reason: input.reason ?? null, crewId: input.crewId, jobId: input.jobId, userId: user.id }, trx);
    if (!moved) throw new AppError("conflict", `${coil.coilCode} was changed by someone else; reload the page and try again.`);
    await insertAuditEntry(
      { actorUserId: user.id, action: "coil-status-changed", entityType: "coil", entityId: coil.id, details: { coilCode: coil.coilCode, from: coil.status, to: input.to, reason: input.reason ?? null, crewId: input.crewId ?? null, jobId: input.jobId ?? null }, requestId },
      trx,
    );
    return { id: coil.id, coilCode: coil.coilCode, status: input.to };
  });
}
