// Reset a person's password: the house policy, a new hash, a session-version bump (open
// sessions end) and the audit entry.
import "server-only";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { findUserById, updateUserPassword } from "@/database/queries/users";
import type { ResetPasswordInput } from "@/domain/crew/schemas";
import { AppError } from "@/domain/result";
import { hashPassword } from "@/app/_lib/auth";
import { checkPassword } from "./person-checks";

type Ctx = { user: { id: number }; requestId: string };

export async function resetPassword(input: ResetPasswordInput, ctx: Ctx): Promise<{ id: number }> {
  const person = await findUserById({ id: input.id });
  if (!person) throw new AppError("not-found", "That person does not exist.");
  checkPassword(input.password, person);
  const passwordHash = await hashPassword(input.password);
  return db().transaction(async (trx) => {
    await updateUserPassword({ id: input.id, passwordHash }, trx);
    await insertAuditEntry({ actorUserId: ctx.user.id, action: "password-reset", entityType: "user", entityId: input.id, details: { byAdmin: true }, requestId: ctx.requestId }, trx);
    return { id: input.id };
  });
}
