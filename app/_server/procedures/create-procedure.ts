// Add a procedure from a published standard's windows: the procedure, its version 1 and the
// audit entry in one transaction.
import "server-only";
import { procedureVersionsChanged } from "@/app/_server/reference/procedure-versions";
import { db, isDuplicateKey } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { insertProcedure, insertProcedureVersion } from "@/database/queries/procedures";
import { builtInProcedure, type FusionStandard } from "@/domain/procedures";
import type { CreateProcedureInput } from "@/domain/procedures/schemas";
import { AppError } from "@/domain/result";

type Ctx = { user: { id: number }; requestId: string };

export async function createProcedure(input: CreateProcedureInput, ctx: Ctx): Promise<{ id: number; versionId: number }> {
  try {
    const created = await db().transaction(async (trx) => {
      const standard = input.standard as FusionStandard;
      const id = await insertProcedure({ code: input.code, name: input.name, standard }, trx);
      const definition = builtInProcedure(standard);
      const versionId = await insertProcedureVersion(
        { procedureId: id, versionNo: 1, definition, notes: input.notes ?? `First version: the windows of ${definition.label}, not tightened.`, publishedBy: ctx.user.id },
        trx,
      );
      await insertAuditEntry({ actorUserId: ctx.user.id, action: "procedure-added", entityType: "procedure", entityId: id, details: { code: input.code, standard, versionId }, requestId: ctx.requestId }, trx);
      return { id, versionId };
    });
    procedureVersionsChanged();
    return created;
  } catch (error) {
    if (isDuplicateKey(error)) throw new AppError("invalid", `A procedure with code ${input.code} already exists.`, { code: [`A procedure with code ${input.code} already exists.`] });
    throw error;
  }
}
