// `npm run db:restore FILE`: loads a dump written by `npm run db:backup` (.sql or .sql.gz)
// into an EMPTY database — it refuses a database that has any table, so a restore can never
// mix with or overwrite live records. The database is created when it does not exist.
// Target: MIGRATION_DATABASE_URL / DATABASE_URL, else the development database under .data/.
// After a restore into the development server, `npm start` re-grants the application user.
import { spawn } from "node:child_process";
import { createReadStream, existsSync } from "node:fs";
import path from "node:path";
import { pipeline } from "node:stream/promises";
import { createGunzip } from "node:zlib";
import knexFactory from "knex";
import { clientOptionFile, resolveTarget, type DbTarget } from "./backup";

function adminKnex(target: DbTarget, database?: string) {
  return knexFactory({
    client: "mysql2",
    connection: { host: target.host, port: target.port, user: target.user, password: target.password, database, charset: "utf8mb4" },
    pool: { min: 0, max: 1 },
  });
}

/** Tables in `database` (0 = empty, safe to restore into). */
export async function countTables(target: DbTarget): Promise<number> {
  const k = adminKnex(target);
  try {
    const [rows] = (await k.raw("SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = ?", [target.database])) as [{ n: number }[]];
    return Number(rows[0]?.n ?? 0);
  } finally {
    await k.destroy();
  }
}

export type RestoreResult = { database: string; tables: number; ms: number };

export async function restoreDatabase({ file, url }: { file: string; url?: string }): Promise<RestoreResult> {
  const started = Date.now();
  if (!file) throw new Error("Name the dump to restore: npm run db:restore .data/backups/<file>.sql.gz");
  if (!existsSync(file)) throw new Error(`No such file: ${file}`);
  const target = resolveTarget(url);
  const k = adminKnex(target);
  try {
    await k.raw("CREATE DATABASE IF NOT EXISTS ?? CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci", [target.database]);
  } finally {
    await k.destroy();
  }
  const existing = await countTables(target);
  if (existing > 0) {
    throw new Error(`Refusing to restore: database "${target.database}" is not empty (${existing} tables). Restore into a new, empty database (set DATABASE_URL / MIGRATION_DATABASE_URL to it).`);
  }
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
  return { database: target.database, tables: await countTables(target), ms: Date.now() - started };
}

if (process.argv[1] && /database[\\/]restore\.ts$/.test(process.argv[1])) {
  const file = process.argv[2] ? path.resolve(process.argv[2]) : "";
  restoreDatabase({ file })
    .then((r) => console.log(`Restored ${r.tables} tables into ${r.database} in ${r.ms} ms.`))
    .catch((error) => {
      console.error(`Restore failed: ${(error as Error).message}`);
      process.exit(1);
    });
}
