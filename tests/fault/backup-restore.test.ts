// Backup and restore round trip: the demo scenario in a fresh database, `db:backup` while a
// writer keeps adding records, `db:restore` into another empty database; every table has the
// same rows (count and CHECKSUM TABLE) and the snapshot is consistent (each record written in
// one transaction with its audit entry is restored with it, or not at all).
// source: MariaDB documentation, mariadb-dump --single-transaction ("consistent state of the
// database at the time when START TRANSACTION was issued") and CHECKSUM TABLE.
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { gunzipSync } from "node:zlib";
import type { Knex } from "knex";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { backupDatabase, dumpArguments, resolveTarget } from "@/database/backup";
import { rootSql } from "@/database/local/mariadb";
import { migrateLatest, ownerKnex } from "@/database/migrate";
import { restoreDatabase } from "@/database/restore";

const suffix = `${process.pid}`;
const SRC = `bl_backup_src_${suffix}`;
const DST = `bl_backup_dst_${suffix}`;
const DST2 = `bl_backup_dst2_${suffix}`;

function urlFor(database: string): string {
  const u = new URL(process.env.MIGRATION_DATABASE_URL!);
  u.pathname = `/${database}`;
  return u.toString();
}

async function tableFacts(k: Knex, database: string): Promise<Record<string, { rows: number; checksum: string }>> {
  const [tables] = (await k.raw("SELECT table_name AS t FROM information_schema.tables WHERE table_schema = ? AND table_type = 'BASE TABLE' ORDER BY table_name", [database])) as [{ t: string }[]];
  const facts: Record<string, { rows: number; checksum: string }> = {};
  for (const { t } of tables) {
    const [[count]] = (await k.raw("SELECT COUNT(*) AS n FROM ??", [t])) as [{ n: number }[]];
    const [[sum]] = (await k.raw("CHECKSUM TABLE ??", [t])) as [{ Checksum: string | number | null }[]];
    facts[t] = { rows: Number(count.n), checksum: String(sum.Checksum) };
  }
  return facts;
}

describe("backup and restore", () => {
  const dbDir = process.env.BEADLINE_DB_DIR!;
  const owner = new URL(process.env.MIGRATION_DATABASE_URL!).username;
  const tmp = mkdtempSync(path.join(os.tmpdir(), "beadline-backup-"));
  let src: Knex;
  let dst: Knex;

  beforeAll(async () => {
    expect(dbDir, "npm test exports BEADLINE_DB_DIR").toBeTruthy();
    const statements = [
      ...[SRC, DST, DST2].map((d) => `DROP DATABASE IF EXISTS \`${d}\``),
      `CREATE DATABASE \`${SRC}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
      ...[SRC, DST, DST2].flatMap((d) => ["127.0.0.1", "localhost"].map((h) => `GRANT ALL PRIVILEGES ON \`${d}\`.* TO '${owner}'@'${h}'`)),
    ];
    rootSql(dbDir, statements.join(";\n") + ";");
    await migrateLatest(urlFor(SRC));
    src = ownerKnex(urlFor(SRC));
    const seedDir = path.join(process.cwd(), "database", "seeds");
    const { readdirSync } = await import("node:fs");
    for (const file of readdirSync(seedDir).filter((f) => f.endsWith(".ts")).sort()) {
      const mod = (await import(path.join(seedDir, file))) as { seed: (k: Knex, today?: Date) => Promise<void> };
      await mod.seed(src, new Date("2026-11-20T09:00:00Z"));
    }
    // Text the dump must carry unchanged: accents, CJK, emoji, quotes, backslashes, a NUL-free binary-ish string.
    await src("crews").insert({ name: "Équipe Nord — 東 🚧 'quoted' \"double\" back\\slash", trailer: null });
  }, 180_000);

  afterAll(async () => {
    await src?.destroy();
    await dst?.destroy();
    rootSql(dbDir, [SRC, DST, DST2].map((d) => `DROP DATABASE IF EXISTS \`${d}\``).join(";\n") + ";");
    rmSync(tmp, { recursive: true, force: true });
  });

  it("dumps with one transaction, restores into an empty database and every table matches", async () => {
    // A writer adds a crew and its audit entry in one transaction, over and over, during the dump.
    let writing = true;
    let written = 0;
    const writer = (async () => {
      while (writing) {
        await src.transaction(async (trx) => {
          const [id] = await trx("crews").insert({ name: `writer-crew-${written}` });
          await trx("audit_log").insert({ action: "crew-added", entity_type: "crew", entity_id: String(id), details: JSON.stringify({ n: written }) });
        });
        written += 1;
      }
    })();
    await new Promise((r) => setTimeout(r, 150));
    const backup = await backupDatabase({ url: urlFor(SRC), dir: tmp, now: new Date("2026-11-20T10:11:12Z") });
    writing = false;
    await writer;
    expect(written).toBeGreaterThan(0);

    expect(path.basename(backup.file)).toBe(`beadline-${SRC}-20261120T101112Z.sql.gz`);
    const sql = gunzipSync(readFileSync(backup.file)).toString("utf8");
    expect(sql).toMatch(/-- Dump completed/);
    expect(sql).toContain("CREATE TABLE `joints`");
    expect(sql).not.toContain(new URL(process.env.MIGRATION_DATABASE_URL!).password); // no credentials in the dump

    const restored = await restoreDatabase({ file: backup.file, url: urlFor(DST) });
    expect(restored.database).toBe(DST);
    dst = ownerKnex(urlFor(DST));

    // Consistency: crews and their audit entries come from one snapshot.
    const [[crewsInDump]] = (await dst.raw("SELECT COUNT(*) AS n FROM crews WHERE name LIKE 'writer-crew-%'")) as [{ n: number }[]];
    const [[auditsInDump]] = (await dst.raw("SELECT COUNT(*) AS n FROM audit_log WHERE action = 'crew-added'")) as [{ n: number }[]];
    expect(Number(crewsInDump.n)).toBe(Number(auditsInDump.n));
    const [[orphans]] = (await dst.raw("SELECT COUNT(*) AS n FROM audit_log a LEFT JOIN crews c ON c.id = CAST(a.entity_id AS UNSIGNED) WHERE a.action = 'crew-added' AND c.id IS NULL")) as [{ n: number }[]];
    expect(Number(orphans.n)).toBe(0);

    // With the writer stopped, a second round trip must reproduce every table exactly.
    const second = await backupDatabase({ url: urlFor(SRC), dir: tmp, now: new Date("2026-11-20T10:11:13Z") });
    await restoreDatabase({ file: second.file, url: urlFor(DST2) });
    const dst2 = ownerKnex(urlFor(DST2));
    try {
      const before = await tableFacts(src, SRC);
      const after = await tableFacts(dst2, DST2);
      expect(Object.keys(after)).toEqual(Object.keys(before));
      expect(after).toEqual(before);
      // The comparison can fail: the demo tables hold rows with real checksums.
      for (const t of ["users", "coils", "procedure_versions", "crews", "audit_log"]) {
        expect(before[t].rows, t).toBeGreaterThan(0);
        expect(before[t].checksum, t).not.toBe("0");
      }
      const odd = await dst2("crews").where("name", "like", "Équipe Nord%").first("name");
      expect(odd?.name).toBe("Équipe Nord — 東 🚧 'quoted' \"double\" back\\slash");
    } finally {
      await dst2.destroy();
    }
  }, 180_000);

  it("refuses to restore into a database that has tables", async () => {
    const file = path.join(tmp, "tiny.sql");
    writeFileSync(file, "CREATE TABLE should_not_exist (id INT);\n");
    await expect(restoreDatabase({ file, url: urlFor(SRC) })).rejects.toThrow(/not empty/);
    const [[n]] = (await src.raw("SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = ? AND table_name = 'should_not_exist'", [SRC])) as [{ n: number }[]];
    expect(Number(n.n)).toBe(0);
  });

  it("refuses a missing file and never passes the password on the command line", async () => {
    await expect(restoreDatabase({ file: path.join(tmp, "nope.sql.gz"), url: urlFor(DST2) })).rejects.toThrow(/No such file/);
    const args = dumpArguments("/tmp/x.cnf", "beadline");
    expect(args[0]).toBe("--defaults-extra-file=/tmp/x.cnf");
    expect(args).toContain("--single-transaction");
    expect(args.join(" ")).not.toMatch(/password/i);
    expect(resolveTarget(urlFor(SRC))).toMatchObject({ database: SRC, user: owner });
  });
});
