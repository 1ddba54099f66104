// Deterministic builder for people in tests (bcrypt cost 10 keeps tests quick; the app uses 12).
import bcrypt from "bcryptjs";
import type { Role } from "@/domain/roles";
import { ownerDb } from "./db";
import type { UnitSystem } from "@/domain/units/format";

let counter = 0;
const hashCache = new Map<string, string>();

export const TEST_PASSWORD = "correct-horse-battery-staple-7";

export async function makeUser({ roles, name, email, isActive = true, password = TEST_PASSWORD, unitSystem = "si", crewId = null }: { roles: Role[]; name?: string; email?: string; isActive?: boolean; password?: string; unitSystem?: UnitSystem; crewId?: number | null }) {
  counter += 1;
  const hash = hashCache.get(password) ?? (await bcrypt.hash(password, 10));
  hashCache.set(password, hash);
  const mail = email ?? `${roles.join("-")}-${counter}-${process.pid}@test.example`;
  const [id] = await ownerDb()("users").insert({ name: name ?? `Test ${roles.join("/")} ${counter}`, email: mail, password_hash: hash, roles: roles.join(","), is_active: isActive, unit_system: unitSystem, crew_id: crewId });
  return { id: Number(id), email: mail, password, roles };
}
