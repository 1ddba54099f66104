// What `npm start` and `npm run cluster` share to bring the app up: one launcher per data
// folder (a lock file), the demo scenario loaded into an empty database only, a build when
// missing or stale, and `next start` (or `next dev`) as a child process.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from "node:fs";
import path from "node:path";
import type { Knex } from "knex";
import { privateDir } from "./mariadb";
import { ownerKnex } from "../migrate";

const ROOT = path.resolve(__dirname, "..", "..");
const NEXT_BIN = path.join(ROOT, "node_modules", "next", "dist", "bin", "next");

function isAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/**
 * Takes `lock` for this process, or exits when a live launcher holds it. The folder holds the
 * database, objects, mail and secrets: only the launcher's user may enter. Returns the release.
 */
export function takeLock(dataDir: string, lock: string, what = "Beadline"): () => void {
  privateDir(dataDir);
  if (existsSync(lock)) {
    const pid = Number(readFileSync(lock, "utf8").trim());
    if (pid && isAlive(pid)) {
      console.error(`${what} is already running from this folder (process ${pid}). Stop it with Ctrl-C there first; nothing was changed.`);
      process.exit(1);
    }
  }
  writeFileSync(lock, String(process.pid));
  return () => rmSync(lock, { force: true });
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
export function buildIsStale(distDir: string): boolean {
  const buildId = path.join(ROOT, distDir, "BUILD_ID");
  if (!existsSync(buildId)) return true;
  const built = statSync(buildId).mtimeMs;
  const sources = ["app", "components", "domain", "database", "fixtures"].map((d) => newestMtime(path.join(ROOT, d), new Set(["node_modules", "migrations", "seeds", "local", "cluster"])));
  const configs = ["next.config.js", "tailwind.config.js", "package.json", "proxy.ts", "instrumentation.ts", "tsconfig.json"]
    .map((f) => path.join(ROOT, f))
    .filter(existsSync)
    .map((f) => statSync(f).mtimeMs);
  return Math.max(...sources, ...configs) > built;
}

/** Builds the app into `distDir` when it is missing or older than the sources. */
export function buildIfStale(distDir: string, env: Record<string, string | undefined>, log: (line: string) => void): void {
  if (!buildIsStale(distDir)) return;
  log("Building the app (first start, or sources changed) …");
  const build = spawnSync(process.execPath, [NEXT_BIN, "build"], { cwd: ROOT, env: { ...env, BEADLINE_DIST_DIR: distDir, NODE_ENV: "production" }, stdio: "inherit" });
  if (build.status !== 0) throw new Error("next build failed");
}

/** Loads the demo scenario (every seed file, in order) when the database has no users yet. */
export async function seedIfEmpty(migrationUrl: string, log: (line: string) => void): Promise<void> {
  const k = ownerKnex(migrationUrl);
  try {
    const row = await k("users").count({ n: "*" }).first();
    if (Number(row?.n ?? 0) > 0) {
      log("Database has data: keeping it (demo data is loaded only into an empty database).");
      return;
    }
    log("Empty database: loading the demo scenario …");
    const seedFiles = readdirSync(path.join(ROOT, "database", "seeds")).filter((f) => f.endsWith(".ts")).sort();
    for (const file of seedFiles) {
      const mod = (await import(path.join(ROOT, "database", "seeds", file))) as { seed: (k: Knex) => Promise<void> };
      await mod.seed(k);
    }
  } finally {
    await k.destroy();
  }
}

/**
 * `next start` (or `next dev`) on HOST:port as a child. `detached` gives it its own process
 * group, so a launcher can kill the whole server (next may fork) with one signal.
 */
export function spawnNext({
  mode,
  host,
  port,
  env,
  detached = false,
  stdio = "inherit",
}: {
  mode: "start" | "dev";
  host: string;
  port: number;
  env: Record<string, string | undefined>;
  detached?: boolean;
  stdio?: "inherit" | "ignore" | ["ignore", number, number];
}): ChildProcess {
  return spawn(process.execPath, [NEXT_BIN, mode, "-H", host, "-p", String(port)], { cwd: ROOT, env: { ...env, NODE_ENV: mode === "dev" ? "development" : "production" }, stdio, detached });
}

/** Stops a `next` child: SIGTERM (to its group when detached), SIGKILL after `graceMs`. */
export async function stopNext(server: ChildProcess | null, { graceMs = 8000, detached = false }: { graceMs?: number; detached?: boolean } = {}): Promise<void> {
  if (!server || server.exitCode !== null || server.signalCode !== null) return;
  const signal = (name: NodeJS.Signals) => {
    try {
      if (detached && server.pid) process.kill(-server.pid, name);
      else server.kill(name);
    } catch {
      /* already gone */
    }
  };
  signal("SIGTERM");
  const deadline = Date.now() + graceMs;
  while (server.exitCode === null && server.signalCode === null && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
  if (server.exitCode === null && server.signalCode === null) signal("SIGKILL");
}

/**
 * Ctrl-C (SIGINT) or SIGTERM stops a launcher once: says `message`, runs `stop`, releases the
 * data folder's lock and exits. Returns the same shutdown for the launcher's own failures,
 * and whether it has begun (a child exiting then is expected, not a failure).
 */
export function stopOnSignals({ log, message, stop, releaseLock }: { log: (line: string) => void; message: string; stop: () => Promise<void>; releaseLock: () => void }): { shutdown: (code: number) => Promise<void>; isStopping: () => boolean } {
  let stopping = false;
  const shutdown = async (code: number) => {
    if (stopping) return;
    stopping = true;
    log(message);
    await stop();
    releaseLock();
    log("Stopped.");
    process.exit(code);
  };
  process.on("SIGINT", () => void shutdown(0));
  process.on("SIGTERM", () => void shutdown(0));
  return { shutdown, isStopping: () => stopping };
}
