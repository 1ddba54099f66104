// Evidence tables are append-only, twice over: no code path updates or deletes joints, joint
// revisions (which carry the reviews) or audit entries, and the application's database user
// has no UPDATE, DELETE, DROP or ALTER right on them — so even a bug or an injected statement
// in the app cannot change the record. joint_states is the updatable projection.
// source: MariaDB documentation, GRANT (table privileges) and error 1142
// ER_TABLEACCESS_DENIED_ERROR; 49 CFR 192.283/192.285 record keeping (records kept unaltered).
import { readFileSync, readdirSync, statSync } from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/database/client";
import { APPEND_ONLY_TABLES } from "@/database/local/mariadb";
import { ownerDb } from "../support/db";

// Joints, their revisions (reviews), the audit log, and the overrides that cleared blocking warnings.
const EVIDENCE = ["joints", "joint_revisions", "audit_log", "joint_overrides", "joint_override_uses"] as const;
/** A key column of each evidence table, for statements that match no row. */
const KEY_COLUMN: Record<(typeof EVIDENCE)[number], string> = { joints: "id", joint_revisions: "id", audit_log: "id", joint_overrides: "id", joint_override_uses: "joint_id" };

function sourceFiles(dir: string, skip: RegExp): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(dir)) {
    const full = path.join(dir, entry);
    if (skip.test(full)) continue;
    if (statSync(full).isDirectory()) out.push(...sourceFiles(full, skip));
    else if (/\.(ts|tsx|js)$/.test(entry)) out.push(full);
  }
  return out;
}

const WRITE_METHODS = /\.(update|del|delete|truncate|increment|decrement|merge|upsert)\s*\(/;
const ROOT_TABLE = /(?:\b(?:k|trx|knex|tx|db\(\)|conn\([^()]*\)|this\.db))\(\s*["'`]([a-z_]+)(?:\s+as\s+\w+)?["'`]\s*\)|\.(?:from|table|into)\(\s*["'`]([a-z_]+)/;
const RAW_WRITE = new RegExp(String.raw`\b(?:UPDATE(?:\s+IGNORE)?|DELETE\s+(?:\w+\s+)?FROM|TRUNCATE(?:\s+TABLE)?|REPLACE(?:\s+INTO)?|DROP\s+TABLE|ALTER\s+TABLE)\s+\\?\x60?(${EVIDENCE.join("|")})\\?\x60?\b`, "i");

/** Statements (split at `;`) whose root table is an evidence table and that update or delete. */
function findEvidenceWrites(source: string): string[] {
  const hits: string[] = [];
  for (const statement of source.split(";")) {
    if (RAW_WRITE.test(statement)) {
      hits.push(statement.trim());
      continue;
    }
    if (!WRITE_METHODS.test(statement)) continue;
    const root = ROOT_TABLE.exec(statement);
    const table = root?.[1] ?? root?.[2];
    if (table && (EVIDENCE as readonly string[]).includes(table)) hits.push(statement.trim());
  }
  return hits;
}

describe("append-only at the query layer", () => {
  it("the detector finds updates and deletes of evidence tables, and only those", () => {
    // These snippets are the shapes a forbidden write would take; the detector must flag them.
    expect(findEvidenceWrites(`await conn(trx)("joints").where({ id }).update({ outcome: "within-limits" });`)).toHaveLength(1);
    expect(findEvidenceWrites(`await trx("joint_revisions as r").where("r.id", 1).del();`)).toHaveLength(1);
    expect(findEvidenceWrites(`await k("audit_log").truncate();`)).toHaveLength(1);
    expect(findEvidenceWrites(`await k.raw("DELETE FROM audit_log WHERE id < ?", [5]);`)).toHaveLength(1);
    expect(findEvidenceWrites("await k.raw(`UPDATE \\`joints\\` SET bead_mm = 1`);")).toHaveLength(1);
    expect(findEvidenceWrites(`await k("joints").insert(row).onConflict("client_id").merge();`)).toHaveLength(1);
    // Allowed: the projection, inserts, reads that join evidence tables.
    expect(findEvidenceWrites(`await trx("joint_states as s").join("joints as j", "j.id", "s.joint_id").where("s.joint_id", 1).update({ review_state: "accepted" });`)).toHaveLength(0);
    expect(findEvidenceWrites(`const [id] = await conn(trx)("joints").insert({ client_id: "x" });`)).toHaveLength(0);
    expect(findEvidenceWrites(`await k("coils").where({ id }).update({ remaining_m: 3 }); const j = await k("joints").where({ id }).first();`)).toHaveLength(0);
  });

  it("no module in database/ (queries, scripts) or app/ updates or deletes joints, revisions or audit entries", () => {
    const root = process.cwd();
    const files = [
      ...sourceFiles(path.join(root, "database"), /[\\/](migrations|seeds)([\\/]|$)/),
      ...sourceFiles(path.join(root, "app"), /node_modules/),
    ];
    expect(files.some((f) => f.endsWith(path.join("queries", "joints.ts")))).toBe(true);
    const offenders: string[] = [];
    for (const file of files) {
      for (const hit of findEvidenceWrites(readFileSync(file, "utf8"))) offenders.push(`${path.relative(root, file)}: ${hit.slice(0, 160)}`);
    }
    expect(offenders).toEqual([]);
  });

  it("no query function is named as if it changed or removed evidence", () => {
    const dir = path.join(process.cwd(), "database", "queries");
    const names = readdirSync(dir).flatMap((f) => [...readFileSync(path.join(dir, f), "utf8").matchAll(/export\s+(?:async\s+)?function\s+(\w+)/g)].map((m) => m[1]));
    expect(names.length).toBeGreaterThan(10);
    expect(names.filter((n) => /^(update|delete|remove|edit|purge|truncate|overwrite)(Joint|JointRevision|Revision|Review|Audit)/i.test(n) && !/JointState/i.test(n))).toEqual([]);
  });
});

describe("append-only in the database rights", () => {
  afterAll(closeDb);

  const appErrno = async (sql: string, bindings: string[] = []): Promise<string | null> => {
    try {
      await db().raw(sql, bindings);
      return null;
    } catch (error) {
      return (error as { code?: string }).code ?? String(error);
    }
  };

  it("the launcher's list of evidence tables covers joints, revisions (reviews), the audit log and overrides", () => {
    expect([...APPEND_ONLY_TABLES].sort()).toEqual([...EVIDENCE].sort());
  });

  it.each(EVIDENCE)("the application user cannot DELETE, UPDATE, REPLACE, TRUNCATE, ALTER or DROP %s", async (table) => {
    const key = KEY_COLUMN[table];
    const denied = ["ER_TABLEACCESS_DENIED_ERROR", "ER_COLUMNACCESS_DENIED_ERROR"];
    expect(denied).toContain(await appErrno("DELETE FROM ?? WHERE ?? = -1", [table, key]));
    expect(denied).toContain(await appErrno("UPDATE ?? SET ?? = ?? WHERE ?? = -1", [table, key, key, key]));
    expect(denied).toContain(await appErrno("TRUNCATE TABLE ??", [table]));
    expect(denied).toContain(await appErrno("ALTER TABLE ?? COMMENT = 'x'", [table]));
    expect(denied).toContain(await appErrno("DROP TABLE ??", [table]));
    // REPLACE deletes the old row first: it needs the DELETE right.
    expect(denied).toContain(await appErrno("REPLACE INTO ?? (??) SELECT ?? FROM ?? WHERE ?? = -1", [table, key, key, table, key]));
    // The same statements are valid SQL: the owner may run them (nothing matches key -1).
    await ownerDb().raw("DELETE FROM ?? WHERE ?? = -1", [table, key]);
    await ownerDb().raw("UPDATE ?? SET ?? = ?? WHERE ?? = -1", [table, key, key, key]);
  });

  it("the application user can still read and append, and update the joint_states projection", async () => {
    expect(await appErrno("INSERT INTO audit_log (action, entity_type, entity_id) VALUES ('rights-check', 'test', NULL)")).toBeNull();
    expect(await appErrno("SELECT COUNT(*) FROM joints")).toBeNull();
    expect(await appErrno("SELECT COUNT(*) FROM joint_revisions")).toBeNull();
    expect(await appErrno("UPDATE joint_states SET revision_no = revision_no WHERE joint_id = -1")).toBeNull();
  });

  it("holds no database-wide grant that would cover the evidence tables", async () => {
    const [rows] = (await db().raw("SHOW GRANTS FOR CURRENT_USER()")) as [Record<string, string>[]];
    const grants = rows.map((r) => Object.values(r)[0]);
    expect(grants.length).toBeGreaterThan(1);
    for (const g of grants) {
      if (g.includes(" ON *.* ")) expect(g).toMatch(/^GRANT USAGE ON \*\.\*/);
      expect(g).not.toMatch(/ ON `[^`]+`\.\* TO/);
      for (const t of EVIDENCE) if (g.includes(`.\`${t}\` TO`)) expect(g).toMatch(/^GRANT SELECT, INSERT ON/);
    }
    expect(grants.filter((g) => EVIDENCE.some((t) => g.includes(`.\`${t}\` TO`)))).toHaveLength(EVIDENCE.length);
  });
});
