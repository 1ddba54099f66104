// People: accounts, roles, unit preference, active flag and session version.
import type { Actor, Role } from "@/domain/roles";
import { isRole } from "@/domain/roles";
import { conn, type Db } from "../client";
import type { UserRow as UserTableRow } from "../tables";
import type { UnitSystem } from "@/domain/units/format";
import type { MailGrouping } from "@/domain/mail/grouping";

export type UserRecord = Actor & {
  crewId: number | null;
  crewName: string | null;
  sessionVersion: number;
  mailGrouping: MailGrouping;
  version: number;
  createdAt: Date;
};

/** A users row, with the crew's name where the query joins crews. */
type UserRow = UserTableRow & { crew_name?: string | null };

export function parseRoles(value: string): Role[] {
  return value
    .split(",")
    .map((r) => r.trim())
    .filter(isRole);
}

function toUser(row: UserRow): UserRecord {
  return {
    id: row.id,
    name: row.name,
    email: row.email,
    roles: parseRoles(row.roles),
    unitSystem: row.unit_system,
    isActive: Boolean(row.is_active),
    sessionVersion: row.session_version,
    crewId: row.crew_id,
    crewName: row.crew_name ?? null,
    mailGrouping: row.mail_grouping,
    version: row.version,
    createdAt: row.created_at,
  };
}

function baseQuery(trx?: Db) {
  return conn(trx)("users").leftJoin("crews", "crews.id", "users.crew_id").select("users.*", "crews.name as crew_name");
}

/**
 * baseQuery by primary key, written out once: every signed-in request runs it (the session
 * check), and knex's builder would compile the same text anew each time.
 */
const USER_BY_ID_SQL = "select `users`.*, `crews`.`name` as `crew_name` from `users` left join `crews` on `crews`.`id` = `users`.`crew_id` where `users`.`id` = ? limit 1";

export async function findUserById({ id }: { id: number }, trx?: Db): Promise<UserRecord | null> {
  const [rows] = (await conn(trx).raw(USER_BY_ID_SQL, [id])) as [UserRow[]];
  const row = rows[0];
  return row ? toUser(row) : null;
}

/** For sign-in only: includes the password hash. */
export async function findUserCredentialsByEmail({ email }: { email: string }, trx?: Db): Promise<(UserRecord & { passwordHash: string }) | null> {
  const row = (await baseQuery(trx).where("users.email", email.toLowerCase()).first()) as UserRow | undefined;
  return row ? { ...toUser(row), passwordHash: row.password_hash } : null;
}

export async function listUsers(_: Record<string, never> = {}, trx?: Db): Promise<UserRecord[]> {
  const rows = (await baseQuery(trx).orderBy("users.name")) as UserRow[];
  return rows.map(toUser);
}

export async function listUsersWithRole({ role, activeOnly = true }: { role: Role; activeOnly?: boolean }, trx?: Db): Promise<UserRecord[]> {
  const q = baseQuery(trx).whereRaw("FIND_IN_SET(?, users.roles) > 0", [role]);
  if (activeOnly) q.where("users.is_active", true);
  return ((await q.orderBy("users.name")) as UserRow[]).map(toUser);
}

/** People holding any of these roles, by name, in one query (activeOnly as listUsersWithRole). */
export async function listUsersWithRoles({ roles, activeOnly = true }: { roles: Role[]; activeOnly?: boolean }, trx?: Db): Promise<UserRecord[]> {
  if (roles.length === 0) return [];
  const q = baseQuery(trx).where((w) => {
    for (const role of roles) w.orWhereRaw("FIND_IN_SET(?, users.roles) > 0", [role]);
  });
  if (activeOnly) q.where("users.is_active", true);
  return ((await q.orderBy("users.name")) as UserRow[]).map(toUser);
}

export async function countActiveAdmins(_: Record<string, never> = {}, trx?: Db): Promise<number> {
  const row = await conn(trx)("users").where("is_active", true).whereRaw("FIND_IN_SET('admin', roles) > 0").count({ n: "*" }).first();
  return Number(row?.n ?? 0);
}

export async function insertUser(
  input: { name: string; email: string; passwordHash: string; roles: Role[]; unitSystem?: UnitSystem; crewId?: number | null; isActive?: boolean },
  trx?: Db,
): Promise<number> {
  const [id] = await conn(trx)("users").insert({
    name: input.name,
    email: input.email.toLowerCase(),
    password_hash: input.passwordHash,
    roles: input.roles.join(","),
    unit_system: input.unitSystem ?? "si",
    crew_id: input.crewId ?? null,
    is_active: input.isActive ?? true,
  });
  return Number(id);
}

/**
 * Updates roles/active/crew with optimistic locking: returns false when `version` is stale.
 * Deactivation bumps the session version so existing cookies stop working.
 */
export async function updateUserAccess(
  input: { id: number; version: number; roles: Role[]; isActive: boolean; crewId?: number | null },
  trx?: Db,
): Promise<boolean> {
  const k = conn(trx);
  const changed = await k("users")
    .where({ id: input.id, version: input.version })
    .update({
      roles: input.roles.join(","),
      is_active: input.isActive,
      crew_id: input.crewId ?? null,
      version: k.raw("version + 1"),
      session_version: input.isActive ? k.raw("session_version") : k.raw("session_version + 1"),
      updated_at: k.fn.now(3),
    });
  return changed === 1;
}

export async function updateUserPassword({ id, passwordHash }: { id: number; passwordHash: string }, trx?: Db): Promise<void> {
  const k = conn(trx);
  await k("users")
    .where({ id })
    .update({ password_hash: passwordHash, session_version: k.raw("session_version + 1"), version: k.raw("version + 1"), updated_at: k.fn.now(3) });
}

/** Sign-out everywhere: every cookie sealed with the old version stops working. */
export async function bumpSessionVersion({ id }: { id: number }, trx?: Db): Promise<void> {
  const k = conn(trx);
  await k("users").where({ id }).update({ session_version: k.raw("session_version + 1") });
}

export async function updateUnitSystem({ id, unitSystem }: { id: number; unitSystem: UnitSystem }, trx?: Db): Promise<void> {
  await conn(trx)("users").where({ id }).update({ unit_system: unitSystem });
}

export async function listCrews(_: Record<string, never> = {}, trx?: Db): Promise<{ id: number; name: string; trailer: string | null }[]> {
  return conn(trx)("crews").where("is_active", true).select("id", "name", "trailer").orderBy("name");
}

// --- Added for the Crew screen (issue 4) -----------------------------------------------

/**
 * Locks the rows of every active admin (SELECT … FOR UPDATE) and returns their ids, so two
 * admins removing each other at once cannot both succeed: the second waits, then sees one
 * admin left. Call inside the transaction that changes roles or the active flag.
 */
export async function lockActiveAdminIds(_: Record<string, never>, trx: Db): Promise<number[]> {
  const rows = (await conn(trx)("users").where("is_active", true).whereRaw("FIND_IN_SET('admin', roles) > 0").forUpdate().select("id")) as { id: number }[];
  return rows.map((r) => r.id);
}

export async function isEmailTaken({ email, exceptId }: { email: string; exceptId?: number }, trx?: Db): Promise<boolean> {
  const q = conn(trx)("users").where({ email: email.toLowerCase() });
  if (exceptId) q.whereNot({ id: exceptId });
  return Boolean(await q.first("id"));
}
