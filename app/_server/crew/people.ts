// Use cases of the Crew screen's people part: add a person, set roles / crew / active
// flag, reset a password. Nobody can remove the last active admin (domain/roles
// wouldRemoveLastAdmin, checked with the admins' rows locked). Deactivation and password
// resets bump the session version, so the person's open sessions end at once.
import "server-only";
import { db, isDuplicateKey } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { findUserById, insertUser, isEmailTaken, listCrews, lockActiveAdminIds, updateUserAccess, updateUserPassword } from "@/database/queries/users";
import { passwordProblem } from "@/domain/crew/password-policy";
import type { AddPersonInput, ResetPasswordInput, UpdatePersonInput } from "@/domain/crew/schemas";
import { wouldRemoveLastAdmin } from "@/domain/roles";
import { AppError } from "@/domain/result";
import { hashPassword } from "@/app/_lib/auth";
import { assertPasswordAllowed } from "@/app/_lib/common-passwords";
import { logger } from "@/app/_lib/log";
import { CONFLICT_MESSAGE } from "@/app/_server/jobs/jobs";

type Ctx = { user: { id: number }; requestId: string };

/**
 * The house password policy (length, common passwords, own name). If the common-password
 * list is not installed, the length and own-name rules still apply and a warning is logged.
 */
function checkPassword(password: string, who: { name: string; email: string }): void {
  try {
    assertPasswordAllowed(password, who);
  } catch (error) {
    if (error instanceof AppError) throw error;
    logger.warn({ err: String((error as Error).message) }, "common-password list unavailable; checking length and own name only");
    const problem = passwordProblem(password, { commonPasswords: [], userInputs: [who.name, who.email, who.email.split("@")[0] ?? ""] });
    if (problem) throw new AppError("invalid", `Check password: ${problem}`, { password: [problem] });
  }
}

async function checkCrew(crewId: number | null | undefined): Promise<void> {
  if (!crewId) return;
  const crews = await listCrews();
  if (!crews.some((c) => c.id === crewId)) throw new AppError("invalid", "Check crewId: Crew does not exist.", { crewId: ["Crew does not exist."] });
}

export async function addPerson(input: AddPersonInput, ctx: Ctx): Promise<{ id: number }> {
  checkPassword(input.password, input);
  await checkCrew(input.crewId);
  if (await isEmailTaken({ email: input.email })) {
    throw new AppError("invalid", `Check email: ${input.email} already has an account.`, { email: [`${input.email} already has an account.`] });
  }
  const passwordHash = await hashPassword(input.password);
  try {
    return await db().transaction(async (trx) => {
      const id = await insertUser({ name: input.name, email: input.email, passwordHash, roles: input.roles, unitSystem: input.unitSystem, crewId: input.crewId ?? null }, trx);
      await insertAuditEntry({ actorUserId: ctx.user.id, action: "person-added", entityType: "user", entityId: id, details: { name: input.name, email: input.email, roles: input.roles, crewId: input.crewId ?? null }, requestId: ctx.requestId }, trx);
      return { id };
    });
  } catch (error) {
    if (isDuplicateKey(error)) throw new AppError("invalid", `Check email: ${input.email} already has an account.`, { email: [`${input.email} already has an account.`] });
    throw error;
  }
}

export async function updatePersonAccess(input: UpdatePersonInput, ctx: Ctx): Promise<{ id: number; version: number }> {
  await checkCrew(input.crewId);
  return db().transaction(async (trx) => {
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
}

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
