// Publish a new version that tightens the current one's windows (a version used by a joint
// is never edited), with the audit entry.
import "server-only";
import { procedureVersionsChanged } from "@/app/_server/reference/procedure-versions";
import { db, isDuplicateKey } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { currentProcedureVersion, findProcedureById, insertProcedureVersion, markVersionSuperseded } from "@/database/queries/procedures";
import { tightenFromForm } from "@/domain/procedures/form";
import { TIGHTEN_FORM_LABELS, type TightenProcedureInput } from "@/domain/procedures/schemas";
import { AppError, describeFieldErrors } from "@/domain/result";

type Ctx = { user: { id: number }; requestId: string };

/**
 * Publishes version n+1 of a procedure, tightened from the current version n. The admin's
 * form names the version they looked at; if someone published in between, this is a
 * conflict. Version n keeps its definition and gets superseded_at; joints checked against
 * it keep pointing at it.
 */
export async function publishTightenedVersion(input: TightenProcedureInput, ctx: Ctx): Promise<{ versionId: number; versionNo: number }> {
  try {
    const published = await db().transaction(async (trx) => {
      const procedure = await findProcedureById({ id: input.procedureId, forUpdate: true }, trx);
      if (!procedure) throw new AppError("not-found", "That procedure does not exist.");
      if (!procedure.isActive) throw new AppError("invalid", `Procedure ${procedure.code} is retired.`, { procedureId: [`Procedure ${procedure.code} is retired.`] });
      const current = await currentProcedureVersion({ procedureId: procedure.id }, trx);
      if (!current) throw new AppError("not-found", `Procedure ${procedure.code} has no published version.`);
      if (current.id !== input.basedOnVersionId) {
        throw new AppError("conflict", `Procedure ${procedure.code} now has version ${current.versionNo}, published while you were editing; reload the page and tighten the latest version.`);
      }
      const versionNo = current.versionNo + 1;
      const outcome = tightenFromForm(current.definition, input, { procedureCode: procedure.code, versionNo });
      if (!outcome.ok) throw new AppError("invalid", describeFieldErrors(outcome.fields, TIGHTEN_FORM_LABELS), outcome.fields);
      const versionId = await insertProcedureVersion({ procedureId: procedure.id, versionNo, definition: outcome.definition, notes: input.note, publishedBy: ctx.user.id }, trx);
      if (!(await markVersionSuperseded({ versionId: current.id }, trx))) {
        throw new AppError("conflict", `Version ${current.versionNo} of ${procedure.code} was superseded by someone else; reload the page.`);
      }
      await insertAuditEntry(
        {
          actorUserId: ctx.user.id,
          action: "procedure-version-published",
          entityType: "procedure",
          entityId: procedure.id,
          details: { versionId, versionNo, supersedes: current.id, note: input.note, enteredIn: input.units },
          requestId: ctx.requestId,
        },
        trx,
      );
      return { versionId, versionNo };
    });
    procedureVersionsChanged();
    return published;
  } catch (error) {
    if (isDuplicateKey(error)) throw new AppError("conflict", "Another version of this procedure was published at the same moment; reload the page and try again.");
    throw error;
  }
}
