// Runs the knex migrations with the owner connection (MIGRATION_DATABASE_URL, else DATABASE_URL).
import { readdirSync } from "node:fs";
import path from "node:path";
import knexFactory, { type Knex } from "knex";

// eslint-disable-next-line @typescript-eslint/no-require-imports
const baseConfig = require("../knexfile.js") as Knex.Config;

type Migration = { up: (k: Knex) => Promise<void>; down: (k: Knex) => Promise<void> };

/**
 * Loads migrations with dynamic import() so the same TypeScript files run under tsx
 * scripts and under vitest (knex's own loader uses require()).
 */
const migrationSource: Knex.MigrationSource<string> = {
  async getMigrations() {
    const dir = path.join(__dirname, "migrations");
    return readdirSync(dir)
      .filter((f) => /\.ts$/.test(f) && !f.endsWith(".d.ts"))
      .sort();
  },
  getMigrationName: (name) => name,
  async getMigration(name) {
    return (await import(path.join(__dirname, "migrations", name))) as Migration;
  },
};

export function ownerKnex(url = process.env.MIGRATION_DATABASE_URL || process.env.DATABASE_URL): Knex {
  if (!url) throw new Error("MIGRATION_DATABASE_URL or DATABASE_URL must be set");
  const saved = process.env.DATABASE_URL;
  process.env.DATABASE_URL = url;
  const connection = (baseConfig.connection as () => Knex.ConnectionConfig)();
  process.env.DATABASE_URL = saved;
  return knexFactory({ ...baseConfig, migrations: { tableName: "knex_migrations", migrationSource }, connection: { ...connection, multipleStatements: true } as Knex.MySql2ConnectionConfig, pool: { min: 0, max: 4 } });
}

export async function migrateLatest(url?: string): Promise<string[]> {
  const k = ownerKnex(url);
  try {
    const [, applied] = await k.migrate.latest();
    return applied as string[];
  } finally {
    await k.destroy();
  }
}

export async function migrateRollbackAll(url?: string): Promise<void> {
  const k = ownerKnex(url);
  try {
    await k.migrate.rollback(undefined, true);
  } finally {
    await k.destroy();
  }
}
