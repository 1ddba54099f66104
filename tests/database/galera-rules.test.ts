// What MariaDB Galera Cluster needs of the schema and the code, checked on the migrated test
// database and on the source tree. source: MariaDB Galera Cluster "Known Limitations"
// (https://mariadb.com/docs/galera-cluster/reference/mariadb-galera-cluster-known-limitations):
// replication works only with the InnoDB storage engine (writes to other engines are not
// replicated); LOCK TABLES, FLUSH TABLES {table list} WITH READ LOCK and the lock functions
// GET_LOCK(), RELEASE_LOCK() are unsupported; all tables should have a primary key (DELETE
// is unsupported on a table without one, and its rows may differ in order between nodes).
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { db } from "@/database/client";
import { closeOwnerDb, ownerDb } from "../support/db";

type TableFacts = { name: string; engine: string | null; primaryKeys: number };

async function tableFacts(): Promise<TableFacts[]> {
  const [rows] = (await ownerDb().raw(
    `SELECT t.table_name AS name, t.engine AS engine,
            (SELECT COUNT(*) FROM information_schema.table_constraints c
              WHERE c.table_schema = t.table_schema AND c.table_name = t.table_name AND c.constraint_type = 'PRIMARY KEY') AS primaryKeys
       FROM information_schema.tables t
      WHERE t.table_schema = DATABASE() AND t.table_type = 'BASE TABLE'
      ORDER BY t.table_name`,
  )) as [TableFacts[]];
  return rows.map((r) => ({ name: String(r.name), engine: r.engine, primaryKeys: Number(r.primaryKeys) }));
}

/** Statements Galera does not support, and table engines it does not replicate. */
const UNSUPPORTED = [
  { what: "LOCK TABLES", pattern: /\bLOCK\s+TABLES?\s+[`\w]/i },
  { what: "FLUSH TABLES … WITH READ LOCK on named tables", pattern: /\bFLUSH\s+TABLES?\s+[`\w][^;]*\bWITH\s+READ\s+LOCK/i },
  { what: "GET_LOCK()", pattern: /\bGET_LOCK\s*\(/i },
  { what: "RELEASE_LOCK()", pattern: /\bRELEASE_(ALL_)?LOCKS?\s*\(/i },
  { what: "IS_FREE_LOCK() / IS_USED_LOCK()", pattern: /\bIS_(FREE|USED)_LOCK\s*\(/i },
  { what: "a non-transactional engine", pattern: /\bENGINE\s*=?\s*['"]?(MyISAM|Aria|MEMORY|HEAP|CSV|ARCHIVE)\b/i },
  { what: "knex's table engine option set to a non-InnoDB engine", pattern: /\.engine\(\s*['"](?!InnoDB)/i },
];

function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(dir)) {
    if (entry === "node_modules" || entry.startsWith(".")) continue;
    const full = path.join(dir, entry);
    if (statSync(full).isDirectory()) out.push(...sourceFiles(full));
    else if (/\.(ts|tsx|js|mjs|cjs|sql)$/.test(entry)) out.push(full);
  }
  return out;
}

function findUnsupported(text: string): string[] {
  return UNSUPPORTED.filter((u) => u.pattern.test(text)).map((u) => u.what);
}

describe("Galera's rules for tables and statements", () => {
  afterAll(async () => {
    await closeOwnerDb();
  });

  it("every base table of the migrated schema has a primary key", async () => {
    const tables = await tableFacts();
    // The schema the tests migrate: the application's tables and knex's own bookkeeping.
    expect(tables.map((t) => t.name)).toEqual(expect.arrayContaining(["joints", "job_counters", "mail_outbox", "sign_in_limits", "knex_migrations", "knex_migrations_lock"]));
    expect(tables.filter((t) => t.primaryKeys !== 1).map((t) => t.name)).toEqual([]);
  });

  it("every base table of the migrated schema is InnoDB", async () => {
    const tables = await tableFacts();
    expect(tables.filter((t) => (t.engine ?? "").toLowerCase() !== "innodb").map((t) => `${t.name}: ${t.engine}`)).toEqual([]);
  });

  it("every connection of the app's pool asks for causal reads (wsrep_sync_wait = 1)", async () => {
    // source: MariaDB documentation of wsrep_sync_wait — bit 1 makes reads (SELECT, BEGIN)
    // wait until the node has applied what the cluster committed before them.
    const [rows] = (await db().raw("SELECT @@SESSION.wsrep_sync_wait AS level")) as [{ level: number }[]];
    expect(Number(rows[0]!.level)).toBe(1);
  });

  it("the matcher below finds each unsupported statement it is meant to find", () => {
    // The statements as MariaDB's documentation spells them; each must be caught.
    expect(findUnsupported("LOCK TABLES joints WRITE")).toEqual(["LOCK TABLES"]);
    expect(findUnsupported("lock table `coils` read")).toEqual(["LOCK TABLES"]);
    expect(findUnsupported("FLUSH TABLES joints WITH READ LOCK")).toEqual(["FLUSH TABLES … WITH READ LOCK on named tables"]);
    expect(findUnsupported("SELECT GET_LOCK('beadline', 10)")).toEqual(["GET_LOCK()"]);
    expect(findUnsupported("SELECT RELEASE_LOCK('beadline')")).toEqual(["RELEASE_LOCK()"]);
    expect(findUnsupported("CREATE TABLE t (id INT PRIMARY KEY) ENGINE=MyISAM")).toEqual(["a non-transactional engine"]);
    expect(findUnsupported("CREATE TABLE t (id INT PRIMARY KEY) ENGINE = Aria")).toEqual(["a non-transactional engine"]);
    expect(findUnsupported('t.engine("MEMORY")')).toEqual(["knex's table engine option set to a non-InnoDB engine"]);
    // Ordinary words and row locks are not table locks.
    expect(findUnsupported("Lock the coils in id order; SELECT … FOR UPDATE SKIP LOCKED; ENGINE = InnoDB")).toEqual([]);
  });

  it("every transaction the app opens goes through the rerunning entry point", () => {
    // db().transaction (the wrapped pool) or writeTransaction(k, …); a bare knex.transaction on
    // another handle would not rerun after a certification failure. The seeds load the demo
    // data once through the owner's connection and are left out. common practice (no source).
    const root = process.cwd();
    const bare: string[] = [];
    for (const dir of ["app", "database"]) {
      for (const file of sourceFiles(path.join(root, dir))) {
        const rel = path.relative(root, file);
        if (rel.startsWith(path.join("database", "seeds")) || rel === path.join("database", "client.ts")) continue;
        readFileSync(file, "utf8")
          .split("\n")
          .forEach((line, i) => {
            if (/\.transaction\s*[(<]/.test(line) && !/\bdb\(\)\.transaction\s*[(<]/.test(line)) bare.push(`${rel}:${i + 1}: ${line.trim()}`);
          });
      }
    }
    expect(bare).toEqual([]);
  });

  it("no source under app/, database/ or domain/ uses table locks, lock functions or a non-InnoDB engine", () => {
    const root = process.cwd();
    const found: string[] = [];
    for (const dir of ["app", "database", "domain"]) {
      for (const file of sourceFiles(path.join(root, dir))) {
        for (const what of findUnsupported(readFileSync(file, "utf8"))) found.push(`${path.relative(root, file)}: ${what}`);
      }
    }
    expect(found).toEqual([]);
  });
});
