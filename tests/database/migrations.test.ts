// Migrations run up and down on a fresh schema (a second database on the test server).
import { afterAll, describe, expect, it } from "vitest";
import { rootSql } from "@/database/local/mariadb";
import { ownerKnex } from "@/database/migrate";

const dir = process.env.BEADLINE_DB_DIR!;
const url = new URL(process.env.MIGRATION_DATABASE_URL!);
const freshName = `beadline_fresh_${process.pid}`;

describe("migrations", () => {
  rootSql(dir, `CREATE DATABASE IF NOT EXISTS ${freshName}; GRANT ALL ON ${freshName}.* TO '${url.username}'@'127.0.0.1';`);
  url.pathname = `/${freshName}`;
  const k = ownerKnex(url.toString());

  afterAll(async () => {
    await k.destroy();
    rootSql(dir, `DROP DATABASE IF EXISTS ${freshName}`);
  });

  it("apply to an empty schema, roll back to nothing, and apply again", async () => {
    const [, applied] = await k.migrate.latest();
    expect(applied.length).toBeGreaterThan(0);
    for (const table of ["users", "joints", "joint_revisions", "coils", "audit_log", "mail_outbox"]) {
      expect(await k.schema.hasTable(table), table).toBe(true);
    }
    await k.migrate.rollback(undefined, true);
    const [rows] = (await k.raw("SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = ? AND table_name NOT LIKE 'knex_migrations%'", [freshName])) as [{ n: number }[]];
    expect(Number(rows[0].n)).toBe(0);
    const [, again] = await k.migrate.latest();
    expect(again).toEqual(applied);
  });
});
