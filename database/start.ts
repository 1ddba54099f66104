// `npm start`: brings Beadline up with demo data on http://127.0.0.1:3000.
// Private MariaDB under .data/ (installed from Debian's packages if missing and root),
// migrations, demo scenario into an empty database, build when missing or stale, next start.
// Ctrl-C stops the web server and the database cleanly. With DATABASE_URL set, it uses that
// server and starts none.
import type { ChildProcess } from "node:child_process";
import path from "node:path";
import { randomBytes } from "node:crypto";
import { buildIfStale, seedIfEmpty, spawnNext, stopNext, stopOnSignals, takeLock } from "./local/app-server";
import { ensureMariadbInstalled, isPortInUse, keptSecret } from "./local/mariadb";
import { failureLine } from "./local/redact";
import { startLocalStack, type LocalStack } from "./local/stack";
import { migrateLatest } from "./migrate";

const ROOT = path.resolve(__dirname, "..");
const DATA = path.join(ROOT, ".data");
const LOCK = path.join(DATA, "start.lock");
const PORT = Number(process.env.PORT || 3000);
const HOST = process.env.HOST || "127.0.0.1";
const isDev = process.argv.includes("--dev");
const log = (line: string) => console.log(`[beadline] ${line}`);

async function main(): Promise<void> {
  const releaseLock = takeLock(DATA, LOCK);
  let stack: LocalStack | null = null;
  let server: ChildProcess | null = null;
  const { shutdown, isStopping } = stopOnSignals({
    log,
    message: "Stopping …",
    releaseLock,
    stop: async () => {
      await stopNext(server);
      if (stack) await stack.stop();
    },
  });

  try {
    let env: Record<string, string>;
    if (process.env.DATABASE_URL) {
      log("DATABASE_URL is set: using that database server, starting none.");
      env = {};
      if (!process.env.SESSION_SECRET) {
        env.SESSION_SECRET = keptSecret(path.join(DATA, "secrets", "session-secret"), () => randomBytes(48).toString("base64url"));
      }
      await migrateLatest(process.env.MIGRATION_DATABASE_URL || process.env.DATABASE_URL);
      await seedIfEmpty(process.env.MIGRATION_DATABASE_URL || process.env.DATABASE_URL, log);
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
      await seedIfEmpty(env.MIGRATION_DATABASE_URL, log);
    }

    const childEnv = { ...process.env, ...env, NEXT_TELEMETRY_DISABLED: "1", BEADLINE_PUBLIC_URL: process.env.BEADLINE_PUBLIC_URL || `http://${HOST}:${PORT}` };
    if (isDev) {
      server = spawnNext({ mode: "dev", host: HOST, port: PORT, env: childEnv });
    } else {
      const distDir = process.env.BEADLINE_DIST_DIR || ".next";
      buildIfStale(distDir, childEnv, log);
      server = spawnNext({ mode: "start", host: HOST, port: PORT, env: childEnv });
    }
    log(`Beadline on http://${HOST}:${PORT}  (Ctrl-C stops it)`);
    server.on("exit", (code) => {
      if (!isStopping()) {
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
