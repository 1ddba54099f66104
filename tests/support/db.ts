// Database helpers for tests: the owner connection (may truncate), a reset to empty tables
// and the demo seed. Tests run against the throw-away MariaDB that `npm test` starts.
import type { Knex } from "knex";
import { ownerKnex } from "@/database/migrate";

let owner: Knex | null = null;

/** The owner connection (full rights; the app's own user may not delete evidence rows). */
export function ownerDb(): Knex {
  owner ??= ownerKnex(process.env.MIGRATION_DATABASE_URL);
  return owner;
}

export async function closeOwnerDb(): Promise<void> {
  if (owner) await owner.destroy();
  owner = null;
}

/** Empties every table except the migration bookkeeping. */
export async function resetDatabase(): Promise<void> {
  const k = ownerDb();
  const [rows] = (await k.raw("SELECT table_name AS t FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE'")) as [{ t: string }[]];
  const tables = rows.map((r) => r.t).filter((t) => !t.startsWith("knex_migrations"));
  await k.raw(`SET FOREIGN_KEY_CHECKS = 0; ${tables.map((t) => `TRUNCATE TABLE \`${t}\``).join("; ")}; SET FOREIGN_KEY_CHECKS = 1;`);
  await forgetKeptSettings(); // the app keeps the settings row for a few seconds; it is gone now
}

/**
 * Drops the organisation settings the app keeps in this process. Only under vitest do the
 * app's modules run in the test's process (the demo-seed CLI and the browser tests' server
 * do not, and the server-only module cannot be imported there).
 */
async function forgetKeptSettings(): Promise<void> {
  if (!process.env.VITEST) return;
  const { forgetOrganisationSettings } = await import("@/app/_server/organisation/get-time-zone");
  forgetOrganisationSettings();
}

/** Writes the organisation's time zone straight into its row (null: none chosen) and drops the app's kept copy. */
export async function setOrganisationZoneRow(timeZone: string | null): Promise<void> {
  if (timeZone === null) await ownerDb()("organisation_settings").where({ id: 1 }).delete();
  else await ownerDb()("organisation_settings").insert({ id: 1, time_zone: timeZone });
  await forgetKeptSettings();
}

/** Loads the demo scenario (all seed files, in order) into the current — empty — database. */
export async function seedDemo(today = new Date()): Promise<void> {
  const { readdirSync } = await import("node:fs");
  const path = await import("node:path");
  const dir = path.join(process.cwd(), "database", "seeds");
  for (const file of readdirSync(dir).filter((f) => f.endsWith(".ts")).sort()) {
    const mod = (await import(path.join(dir, file))) as { seed: (k: Knex, today?: Date) => Promise<void> };
    await mod.seed(ownerDb(), today);
  }
}

export async function userIdByEmail(email: string): Promise<number> {
  const row = await ownerDb()("users").where({ email }).first("id");
  if (!row) throw new Error(`no user ${email}`);
  return Number(row.id);
}

/** Moves a joint to another instant in every table that keeps a copy of made_at (day-filter tests). */
export async function moveJointMadeAt(id: number, at: string | Date): Promise<void> {
  const when = new Date(at);
  await ownerDb()("joints").where({ id }).update({ made_at: when });
  await ownerDb()("joint_states").where({ joint_id: id }).update({ made_at: when });
  await ownerDb()("joint_findings").where({ joint_id: id }).update({ made_at: when });
}
