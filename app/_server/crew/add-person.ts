// Add a person (Crew screen): checks, hashes the password, writes the user and the audit
// entry in one transaction.
import "server-only";
import { registerFilterOptionsChanged } from "@/app/_server/reference/register-filter-options";
import { db, isDuplicateKey } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { insertUser, isEmailTaken } from "@/database/queries/users";
import type { AddPersonInput } from "@/domain/crew/schemas";
import { AppError } from "@/domain/result";
import { hashPassword } from "@/app/_lib/auth";
import { checkPassword, checkCrew } from "./person-checks";

type Ctx = { user: { id: number }; requestId: string };

export async function addPerson(input: AddPersonInput, ctx: Ctx): Promise<{ id: number }> {
  checkPassword(input.password, input);
  await checkCrew(input.crewId);
  if (await isEmailTaken({ email: input.email })) {
    throw new AppError("invalid", `Check email: ${input.email} already has an account.`, { email: [`${input.email} already has an account.`] });
  }
  const passwordHash = await hashPassword(input.password);
  try {
    const added = await db().transaction(async (trx) => {
      const id = await insertUser({ name: input.name, email: input.email, passwordHash, roles: input.roles, unitSystem: input.unitSystem, crewId: input.crewId ?? null }, trx);
      await insertAuditEntry({ actorUserId: ctx.user.id, action: "person-added", entityType: "user", entityId: id, details: { name: input.name, email: input.email, roles: input.roles, crewId: input.crewId ?? null }, requestId: ctx.requestId }, trx);
      return { id };
    });
    registerFilterOptionsChanged();
    return added;
  } catch (error) {
    if (isDuplicateKey(error)) throw new AppError("invalid", `Check email: ${input.email} already has an account.`, { email: [`${input.email} already has an account.`] });
    throw error;
  }
}
