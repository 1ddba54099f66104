// Edit a version's notes (not its windows), with the audit entry.
import "server-only";
import { procedureVersionsChanged } from "@/app/_server/reference/procedure-versions";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { countJointsUsingVersion, findProcedureVersionById, updateVersionNotes } from "@/database/queries/procedures";
import type { EditVersionNotesInput } from "@/domain/procedures/schemas";
import { AppError } from "@/domain/result";

type Ctx = { user: { id: number }; requestId: string };

/**
 * Corrects the notes of a version — only while no joint has been checked against it.
 * A version in use is never changed; publish a new version instead.
 */
export async function editVersionNotes(input: EditVersionNotesInput, ctx: Ctx): Promise<{ versionId: number }> {
  const edited = await db().transaction(async (trx) => {
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
  procedureVersionsChanged();
  return edited;
}
