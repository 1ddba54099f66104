// `npm run db:restore FOLDER`: brings back a backup written by `npm run db:backup` — the
// database into an EMPTY database and the objects into a bucket that holds none of their keys.
// It checks every file against the backup's manifest.json (size and SHA-256) before writing
// anything and refuses, naming the object, when one is missing or differs. It refuses a
// database that has any table, so a restore never mixes with or overwrites live records; a
// failure part-way removes what the restore wrote (the database is emptied again, the objects
// deleted). The database is created when it does not exist.
// `npm run db:restore FILE.sql.gz` still loads a database-only dump of an earlier version.
// Target: MIGRATION_DATABASE_URL / DATABASE_URL and S3_*, else the development server under
// .data/ (npm start). After a restore into the development server, `npm start` re-grants the
// application user.
import { spawn } from "node:child_process";
import { createReadStream, existsSync, statSync } from "node:fs";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { createGunzip } from "node:zlib";
import { attachmentProblems, clientOptionFile, ownerConnection, plural, readAttachmentRecords, resolveTarget, sizeInWords, type DbTarget } from "./backup";
import { existingKeys, readManifest, resolveStore, restoreObjects, verifyBackup, type StoreTarget } from "./backup-objects";

/** Tables in `database` (0 = empty, safe to restore into). */
export async function countTables(target: DbTarget): Promise<number> {
  const k = ownerConnection(target);
  try {
    const [rows] = (await k.raw("SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = ?", [target.database])) as [{ n: number }[]];
    return Number(rows[0]?.n ?? 0);
  } finally {
    await k.destroy();
  }
}

/** Pipes a dump (.sql or .sql.gz) into the `mariadb` client for `target`'s database. */
async function loadDump(target: DbTarget, file: string): Promise<void> {
  const { file: optionFile, cleanup } = clientOptionFile(target);
  try {
    const child = spawn("mariadb", [`--defaults-extra-file=${optionFile}`, "--binary-mode", target.database], { stdio: ["pipe", "ignore", "pipe"] });
    let stderr = "";
    child.stderr.on("data", (d: Buffer) => (stderr += d.toString()));
    const exited = new Promise<number>((resolve, reject) => {
      child.on("error", reject);
      child.on("close", (code) => resolve(code ?? 1));
    });
    const source = createReadStream(file);
    if (file.endsWith(".gz")) await pipeline(source, createGunzip(), child.stdin);
    else await pipeline(source, child.stdin);
    const code = await exited;
    if (code !== 0) throw new Error(`mariadb failed to load the dump (exit ${code}): ${stderr.trim()}`);
  } finally {
    cleanup();
  }
}

export type RestoreResult = { database: string; tables: number; ms: number };

export async function restoreDatabase({ file, url }: { file: string; url?: string }): Promise<RestoreResult> {
  const started = Date.now();
  if (!file) throw new Error("Name the dump to restore: npm run db:restore .data/backups/<file>.sql.gz");
  if (!existsSync(file)) throw new Error(`No such file: ${file}`);
  const target = resolveTarget(url);
  const k = ownerConnection(target);
  try {
    await k.raw("CREATE DATABASE IF NOT EXISTS ?? CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci", [target.database]);
  } finally {
    await k.destroy();
  }
  const existing = await countTables(target);
  if (existing > 0) {
    throw new Error(`Refusing to restore: database "${target.database}" is not empty (${existing} tables). Restore into a new, empty database (set DATABASE_URL / MIGRATION_DATABASE_URL to it).`);
  }
  await loadDump(target, file);
  return { database: target.database, tables: await countTables(target), ms: Date.now() - started };
}

async function databaseExists(target: DbTarget): Promise<boolean> {
  const k = ownerConnection(target);
  try {
    const [rows] = (await k.raw("SELECT COUNT(*) AS n FROM information_schema.schemata WHERE schema_name = ?", [target.database])) as [{ n: number }[]];
    return Number(rows[0]?.n ?? 0) > 0;
  } finally {
    await k.destroy();
  }
}

/**
 * Undoes a failed load: drops the database when the restore created it, else drops every
 * table, view and routine in it (it was empty before the restore began).
 */
async function emptyDatabase(target: DbTarget, created: boolean): Promise<void> {
  const k = ownerConnection(target);
  try {
    if (created) {
      await k.raw("DROP DATABASE IF EXISTS ??", [target.database]);
      return;
    }
    const [objects] = (await k.raw("SELECT table_name AS name, table_type AS type FROM information_schema.tables WHERE table_schema = ?", [target.database])) as [{ name: string; type: string }[]];
    const [routines] = (await k.raw("SELECT routine_name AS name, routine_type AS type FROM information_schema.routines WHERE routine_schema = ?", [target.database])) as [{ name: string; type: string }[]];
    // One connection (pool of one), so the session setting covers every DROP below.
    await k.raw("SET FOREIGN_KEY_CHECKS = 0");
    for (const o of objects) await k.raw(`DROP ${o.type === "VIEW" ? "VIEW" : "TABLE"} IF EXISTS ??.??`, [target.database, o.name]);
    for (const r of routines) await k.raw(`DROP ${r.type === "FUNCTION" ? "FUNCTION" : "PROCEDURE"} IF EXISTS ??.??`, [target.database, r.name]);
  } finally {
    await k.destroy();
  }
}

export type FullRestoreResult = {
  database: string;
  tables: number;
  objects: number;
  objectBytes: number;
  /** Attachment rows of the restored database checked against the restored objects. */
  attachmentsChecked: number;
  problems: string[];
  ms: number;
};

/** Lists up to five problems and how many more there are. */
function listed(problems: string[]): string {
  const shown = problems.slice(0, 5).map((p) => `  - ${p}`);
  if (problems.length > 5) shown.push(`  … and ${problems.length - 5} more`);
  return shown.join("\n");
}

/** Restores a backup folder (database and objects); see the top of this file. */
export async function restoreBackup({ folder, url, store }: { folder: string; url?: string; store?: Partial<StoreTarget> }): Promise<FullRestoreResult> {
  const started = Date.now();
  if (!folder) throw new Error("Name the backup to restore: npm run db:restore .data/backups/<folder>");
  if (!existsSync(folder) || !statSync(folder).isDirectory()) throw new Error(`No such backup folder: ${folder}`);

  // 1. The backup itself, before anything is written.
  const manifest = readManifest(folder);
  const problems = await verifyBackup(folder, manifest);
  if (problems.length) {
    throw new Error(`Refusing to restore: the backup does not match its manifest; nothing was restored.\n${listed(problems)}`);
  }
  // 2. The targets: an empty database, a bucket without any of the backup's keys.
  const target = resolveTarget(url);
  const storeTarget = resolveStore(store);
  const tables = await countTables(target);
  if (tables > 0) {
    throw new Error(`Refusing to restore: database "${target.database}" is not empty (${tables} tables); nothing was restored. Restore into a new, empty database (set DATABASE_URL / MIGRATION_DATABASE_URL to it).`);
  }
  const clashes = await existingKeys(storeTarget, manifest.objects.map((o) => o.key));
  if (clashes.length) {
    throw new Error(`Refusing to restore: bucket "${storeTarget.bucket}" already holds ${clashes.length} of the backup's objects (first: "${clashes[0]}"); nothing was restored. Restore into an empty bucket (set S3_BUCKET to it).`);
  }
  // 3. Write: objects, then the database; a failure removes both again.
  const created = !(await databaseExists(target));
  const objects = await restoreObjects(storeTarget, folder, manifest.objects);
  try {
    const k = ownerConnection(target);
    try {
      await k.raw("CREATE DATABASE IF NOT EXISTS ?? CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci", [target.database]);
    } finally {
      await k.destroy();
    }
    await loadDump(target, path.join(folder, manifest.database.file));
  } catch (error) {
    await objects.undo().catch(() => undefined);
    await emptyDatabase(target, created).catch(() => undefined);
    throw new Error(`Restore failed and was undone (objects deleted, database emptied): ${(error as Error).message}`);
  }
  // 4. Every attachment record of the restored database against the restored objects.
  const k = ownerConnection(target, target.database);
  let records;
  try {
    records = await readAttachmentRecords(k);
  } finally {
    await k.destroy();
  }
  return {
    database: target.database,
    tables: await countTables(target),
    objects: manifest.objects.length,
    objectBytes: manifest.objects.reduce((n, o) => n + o.size, 0),
    attachmentsChecked: records.length,
    problems: attachmentProblems(records, manifest.objects),
    ms: Date.now() - started,
  };
}

if (process.argv[1] && /database[\\/]restore\.ts$/.test(process.argv[1])) {
  const given = process.argv[2] ? path.resolve(process.argv[2]) : "";
  const dumpOnly = given && existsSync(given) && statSync(given).isFile();
  const done = dumpOnly
    ? restoreDatabase({ file: given }).then((r) => console.log(`Restored ${r.tables} tables into ${r.database} in ${r.ms} ms (database-only dump; no objects).`))
    : restoreBackup({ folder: given }).then((r) => {
        console.log(`Restored ${plural(r.tables, "table")} into ${r.database} and ${plural(r.objects, "object")} (${sizeInWords(r.objectBytes)}), each checked against the manifest's SHA-256 first, in ${r.ms} ms.`);
        if (r.problems.length) console.warn(`Warning: ${r.problems.length} of ${plural(r.attachmentsChecked, "attachment record")} do not match the restored objects:\n${listed(r.problems)}`);
        else if (r.attachmentsChecked > 0) console.log(`Every attachment record (${r.attachmentsChecked}) has its object, SHA-256 as recorded.`);
      });
  done.catch((error) => {
    const message = (error as Error).message;
    console.error(message.startsWith("Refusing to restore") ? message : `Restore failed: ${message}`);
    process.exit(1);
  });
}
