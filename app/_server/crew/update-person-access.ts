// Set a person's roles, crew and active flag (never removing the last active admin, checked
// with the admins' rows locked); deactivation bumps the session version so open sessions
// end at once.
import "server-only";
import { registerFilterOptionsChanged } from "@/app/_server/reference/register-filter-options";
import { db } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { findUserById, lockActiveAdminIds, updateUserAccess } from "@/database/queries/users";
import type { UpdatePersonInput } from "@/domain/crew/schemas";
import { wouldRemoveLastAdmin } from "@/domain/roles";
import { AppError } from "@/domain/result";
import { CONFLICT_MESSAGE } from "@/app/_server/edit-conflict";
import { checkCrew } from "./person-checks";

type Ctx = { user: { id: number }; requestId: string };

export async function updatePersonAccess(input: UpdatePersonInput, ctx: Ctx): Promise<{ id: number; version: number }> {
  await checkCrew(input.crewId);
  const updated = await db().transaction(async (trx) => {
    // Lock the admins first (same order in every transaction), then read the person.
    const adminIds = await lockActiveAdminIds({}, trx);
    const before = await findUserById({ id: input.id }, trx);
    if (!before) throw new AppError("not-found", "That person does not exist.");
    if (before.version !== input.version) throw new AppError("conflict", CONFLICT_MESSAGE(`${before.name}'s record`));
    const change = { isAdminBefore: before.isActive && before.roles.includes("admin"), isAdminAfter: input.roles.includes("admin"), isActiveAfter: input.isActive };
    if (wouldRemoveLastAdmin(change, adminIds.length)) {
      const field = input.isActive ? "roles" : "isActive";
      const message = `${before.name} is the last active administrator; make someone else an administrator first.`;
      throw new AppError("invalid", message, { [field]: [message] });
    }
    if (!(await updateUserAccess({ id: input.id, version: input.version, roles: input.roles, isActive: input.isActive, crewId: input.crewId ?? null }, trx))) {
      throw new AppError("conflict", CONFLICT_MESSAGE(`${before.name}'s record`));
    }
    const action = before.isActive && !input.isActive ? "person-deactivated" : !before.isActive && input.isActive ? "person-reactivated" : "person-access-changed";
    await insertAuditEntry(
      {
        actorUserId: ctx.user.id,
        action,
        entityType: "user",
        entityId: input.id,
        details: { before: { roles: before.roles, isActive: before.isActive, crewId: before.crewId }, after: { roles: input.roles, isActive: input.isActive, crewId: input.crewId ?? null } },
        requestId: ctx.requestId,
      },
      trx,
    );
    return { id: input.id, version: input.version + 1 };
  });
  registerFilterOptionsChanged();
  return updated;
}
