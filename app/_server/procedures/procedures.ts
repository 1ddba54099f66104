// Use cases of the Procedures screen: add an operator procedure based on a published
// standard (version 1 = the standard's windows), publish a tightened version (deriveProcedure
// refuses any loosening; the previous version is superseded, never changed), and correct
// the notes of a version no joint uses yet.
import "server-only";
import { db, isDuplicateKey } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import {
  countJointsUsingVersion,
  currentProcedureVersion,
  findProcedureById,
  findProcedureVersionById,
  insertProcedure,
  insertProcedureVersion,
  markVersionSuperseded,
  updateVersionNotes,
} from "@/database/queries/procedures";
import { builtInProcedure, type FusionStandard } from "@/domain/fusion/procedures";
import { tightenFromForm } from "@/domain/office/procedures";
import type { CreateProcedureInput, EditVersionNotesInput, TightenProcedureInput } from "@/domain/office/schemas";
import { AppError, describeFieldErrors } from "@/domain/result";

type Ctx = { user: { id: number }; requestId: string };

export async function createProcedure(input: CreateProcedureInput, ctx: Ctx): Promise<{ id: number; versionId: number }> {
  try {
    return await db().transaction(async (trx) => {
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
  } catch (error) {
    if (isDuplicateKey(error)) throw new AppError("invalid", `A procedure with code ${input.code} already exists.`, { code: [`A procedure with code ${input.code} already exists.`] });
    throw error;
  }
}

/**
 * Publishes version n+1 of a procedure, tightened from the current version n. The admin's
 * form names the version they looked at; if someone published in between, this is a
 * conflict. Version n keeps its definition and gets superseded_at; joints checked against
 * it keep pointing at it.
 */
export async function publishTightenedVersion(input: TightenProcedureInput, ctx: Ctx): Promise<{ versionId: number; versionNo: number }> {
  try {
    return await db().transaction(async (trx) => {
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
      if (!outcome.ok) throw new AppError("invalid", describeFieldErrors(outcome.fields), outcome.fields);
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
  } catch (error) {
    if (isDuplicateKey(error)) throw new AppError("conflict", "Another version of this procedure was published at the same moment; reload the page and try again.");
    throw error;
  }
}

/**
 * Corrects the notes of a version — only while no joint has been checked against it.
 * A version in use is never changed; publish a new version instead.
 */
export async function editVersionNotes(input: EditVersionNotesInput, ctx: Ctx): Promise<{ versionId: number }> {
  return db().transaction(async (trx) => {
    // The row lock also waits for any joint insert that references this version (FK check).
    const version = await findProcedureVersionById({ id: input.versionId, forUpdate: true }, trx);
    if (!version) throw new AppError("not-found", "That procedure version does not exist.");
    const joints = await countJointsUsingVersion({ versionId: version.id }, trx);
    if (joints > 0) {
      throw new AppError(
        "conflict",
        `Version ${version.versionNo} of ${version.procedureCode} has been used for ${joints} joint${joints === 1 ? "" : "s"}, so it cannot be changed; publish a new version instead.`,
      );
    }
    await updateVersionNotes({ versionId: version.id, notes: input.notes }, trx);
    await insertAuditEntry(
      { actorUserId: ctx.user.id, action: "procedure-version-notes-corrected", entityType: "procedure", entityId: version.procedureId, details: { versionId: version.id, before: version.notes, after: input.notes }, requestId: ctx.requestId },
      trx,
    );
    return { versionId: version.id };
  });
}
