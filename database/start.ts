// `npm start`: brings Beadline up with demo data on http://127.0.0.1:3000.
// Private MariaDB under .data/ (installed from Debian's packages if missing and root),
// migrations, demo scenario into an empty database, build when missing or stale, next start.
// Ctrl-C stops the web server and the database cleanly. With DATABASE_URL set, it uses that
// server and starts none.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import { randomBytes } from "node:crypto";
import { ensureMariadbInstalled, isPortInUse, keptSecret, privateDir } from "./local/mariadb";
import { failureLine } from "./local/redact";
import { startLocalStack, type LocalStack } from "./local/stack";
import { migrateLatest, ownerKnex } from "./migrate";

const ROOT = path.resolve(__dirname, "..");
const DATA = path.join(ROOT, ".data");
const LOCK = path.join(DATA, "start.lock");
const PORT = Number(process.env.PORT || 3000);
const HOST = process.env.HOST || "127.0.0.1";
const isDev = process.argv.includes("--dev");
const log = (line: string) => console.log(`[beadline] ${line}`);

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

function takeLock(): void {
  // .data holds the database, objects, mail and secrets: only the launcher's user may enter.
  privateDir(DATA);
  if (existsSync(LOCK)) {
    const pid = Number(readFileSync(LOCK, "utf8").trim());
    if (pid && isAlive(pid)) {
      console.error(`Beadline is already running from this folder (process ${pid}). Stop it with Ctrl-C there first; nothing was changed.`);
      process.exit(1);
    }
  }
  writeFileSync(LOCK, String(process.pid));
}

function newestMtime(dir: string, skip: Set<string>): number {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    if (skip.has(entry.name) || entry.name.startsWith(".")) continue;
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) newest = Math.max(newest, newestMtime(full, skip));
    else newest = Math.max(newest, statSync(full).mtimeMs);
  }
  return newest;
}

/** The build is stale when any source file is newer than the build's id file. */
function buildIsStale(distDir: string): boolean {
  const buildId = path.join(ROOT, distDir, "BUILD_ID");
  if (!existsSync(buildId)) return true;
  const built = statSync(buildId).mtimeMs;
  const sources = ["app", "components", "domain", "database", "fixtures"].map((d) => newestMtime(path.join(ROOT, d), new Set(["node_modules", "migrations", "seeds", "local"])));
  const configs = ["next.config.js", "tailwind.config.js", "package.json", "proxy.ts", "instrumentation.ts", "tsconfig.json"]
    .map((f) => path.join(ROOT, f))
    .filter(existsSync)
    .map((f) => statSync(f).mtimeMs);
  return Math.max(...sources, ...configs) > built;
}

async function seedIfEmpty(env: Record<string, string>): Promise<void> {
  const k = ownerKnex(env.MIGRATION_DATABASE_URL);
  try {
    const row = await k("users").count({ n: "*" }).first();
    if (Number(row?.n ?? 0) > 0) {
      log("Database has data: keeping it (demo data is loaded only into an empty database).");
      return;
    }
    log("Empty database: loading the demo scenario …");
    const seedFiles = readdirSync(path.join(ROOT, "database", "seeds")).filter((f) => f.endsWith(".ts")).sort();
    for (const file of seedFiles) {
      const mod = (await import(path.join(ROOT, "database", "seeds", file))) as { seed: (k: typeof knexType) => Promise<void> };
      await mod.seed(k);
    }
  } finally {
    await k.destroy();
  }
}
declare const knexType: import("knex").Knex;

async function main(): Promise<void> {
  takeLock();
  let stack: LocalStack | null = null;
  let server: ChildProcess | null = null;
  let stopping = false;
  const shutdown = async (code: number) => {
    if (stopping) return;
    stopping = true;
    log("Stopping …");
    if (server && server.exitCode === null) {
      server.kill("SIGTERM");
      const deadline = Date.now() + 8000;
      while (server.exitCode === null && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
      if (server.exitCode === null) server.kill("SIGKILL");
    }
    if (stack) await stack.stop();
    rmSync(LOCK, { force: true });
    log("Stopped.");
    process.exit(code);
  };
  process.on("SIGINT", () => void shutdown(0));
  process.on("SIGTERM", () => void shutdown(0));

  try {
    let env: Record<string, string>;
    if (process.env.DATABASE_URL) {
      log("DATABASE_URL is set: using that database server, starting none.");
      env = {};
      if (!process.env.SESSION_SECRET) {
        env.SESSION_SECRET = keptSecret(path.join(DATA, "secrets", "session-secret"), () => randomBytes(48).toString("base64url"));
      }
      await migrateLatest(process.env.MIGRATION_DATABASE_URL || process.env.DATABASE_URL);
      await seedIfEmpty({ MIGRATION_DATABASE_URL: process.env.MIGRATION_DATABASE_URL || process.env.DATABASE_URL });
    } else {
      ensureMariadbInstalled(log);
      const dbPort = Number(process.env.BEADLINE_DB_PORT || 3307);
      if (await isPortInUse(dbPort)) {
        throw new Error(`Port ${dbPort} is already in use by another program. Set BEADLINE_DB_PORT to a free port, or stop that program.`);
      }
      if (await isPortInUse(PORT)) throw new Error(`Port ${PORT} is already in use. Set PORT to a free port, or stop that program.`);
      log("Starting the private MariaDB server, object store and mail catcher …");
      stack = await startLocalStack({ dir: DATA, ports: "fixed", log });
      env = stack.env;
      const applied = await migrateLatest(env.MIGRATION_DATABASE_URL);
      if (applied.length) log(`Applied ${applied.length} migration(s).`);
      stack.grantRights();
      await seedIfEmpty(env);
    }

    const childEnv = { ...process.env, ...env, NEXT_TELEMETRY_DISABLED: "1", BEADLINE_PUBLIC_URL: process.env.BEADLINE_PUBLIC_URL || `http://${HOST}:${PORT}` };
    const nextBin = path.join(ROOT, "node_modules", "next", "dist", "bin", "next");
    if (isDev) {
      server = spawn(process.execPath, [nextBin, "dev", "-H", HOST, "-p", String(PORT)], { cwd: ROOT, env: { ...childEnv, NODE_ENV: "development" }, stdio: "inherit" });
    } else {
      const distDir = process.env.BEADLINE_DIST_DIR || ".next";
      if (buildIsStale(distDir)) {
        log("Building the app (first start, or sources changed) …");
        const build = spawnSync(process.execPath, [nextBin, "build"], { cwd: ROOT, env: { ...childEnv, NODE_ENV: "production" }, stdio: "inherit" });
        if (build.status !== 0) throw new Error("next build failed");
      }
      server = spawn(process.execPath, [nextBin, "start", "-H", HOST, "-p", String(PORT)], { cwd: ROOT, env: { ...childEnv, NODE_ENV: "production" }, stdio: "inherit" });
    }
    log(`Beadline on http://${HOST}:${PORT}  (Ctrl-C stops it)`);
    server.on("exit", (code) => {
      if (!stopping) {
        log(`Web server exited (${code}).`);
        void shutdown(code ?? 1);
      }
    });
  } catch (error) {
    // One line, secrets masked (SQL and addresses may carry generated passwords).
    console.error(`[beadline] ${failureLine(error)}`);
    await shutdown(1);
  }
}

void main();
