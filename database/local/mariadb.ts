// Private MariaDB server for development (`npm start`) and tests (`npm test`): its own
// data directory, socket and port on 127.0.0.1, never the system service.
import { execFileSync, spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";

export type MariadbServer = {
  dir: string;
  port: number;
  socket: string;
  pid: number;
  process: ChildProcess;
  stop: () => Promise<void>;
};

function which(binary: string): string | null {
  const result = spawnSync("sh", ["-c", `command -v ${binary}`], { encoding: "utf8" });
  const found = result.stdout.trim();
  return result.status === 0 && found ? found : null;
}

/** Finds mariadbd; installs Debian's package as root when missing, or says what to install. */
export function ensureMariadbInstalled(log: (line: string) => void = console.log): void {
  const candidates = ["mariadbd", "/usr/sbin/mariadbd"];
  if (candidates.some((c) => (c.startsWith("/") ? existsSync(c) : which(c)))) return;
  const isRoot = typeof process.getuid === "function" && process.getuid() === 0;
  if (!isRoot || !which("apt-get")) {
    throw new Error(
      "MariaDB server is not installed. Install Debian's packages first:\n  sudo apt-get install -y mariadb-server mariadb-client\n(or set DATABASE_URL to an existing MariaDB server).",
    );
  }
  log("MariaDB server not found: installing Debian's mariadb-server (the system service is not started) …");
  const env = { ...process.env, DEBIAN_FRONTEND: "noninteractive" };
  execFileSync("apt-get", ["update"], { stdio: "inherit", env });
  // policy-rc.d exit 101 keeps apt from starting the system service on machines that allow it.
  const policy = "/usr/sbin/policy-rc.d";
  const hadPolicy = existsSync(policy);
  if (!hadPolicy) writeFileSync(policy, "#!/bin/sh\nexit 101\n", { mode: 0o755 });
  try {
    execFileSync("apt-get", ["install", "-y", "--no-install-recommends", "mariadb-server", "mariadb-client"], { stdio: "inherit", env });
  } finally {
    if (!hadPolicy) spawnSync("rm", ["-f", policy]);
  }
}

/** A free TCP port on 127.0.0.1 (the OS picks one). */
export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.unref();
    server.on("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const address = server.address();
      const port = typeof address === "object" && address ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}

export async function isPortInUse(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ port, host: "127.0.0.1" });
    socket.once("connect", () => {
      socket.destroy();
      resolve(true);
    });
    socket.once("error", () => resolve(false));
  });
}

function writeConfig(dir: string, port: number): string {
  const file = path.join(dir, "my.cnf");
  const user = typeof process.getuid === "function" && process.getuid() === 0 ? "user=root\n" : "";
  writeFileSync(
    file,
    `[mysqld]
datadir=${dir}/data
socket=${dir}/mysqld.sock
pid-file=${dir}/mysqld.pid
port=${port}
bind-address=127.0.0.1
${user}log-error=${dir}/error.log
skip-name-resolve
character-set-server=utf8mb4
collation-server=utf8mb4_unicode_ci
innodb_buffer_pool_size=${process.env.BEADLINE_DB_BUFFER_POOL || "256M"}
max_connections=300
[client]
socket=${dir}/mysqld.sock
port=${port}
`,
  );
  return file;
}

/** Runs SQL as root over the private socket (root has no password on a private server). */
export function rootSql(dir: string, sql: string): string {
  return execFileSync("mariadb", [`--defaults-file=${path.join(dir, "my.cnf")}`, "-uroot", "-N", "-B", "-e", sql], { encoding: "utf8" });
}

async function waitForPing(cnf: string, child: ChildProcess, timeoutMs: number): Promise<void> {
  const started = Date.now();
  while (Date.now() - started < timeoutMs) {
    if (child.exitCode !== null) throw new Error(`mariadbd exited with code ${child.exitCode}; see the error log beside ${cnf}`);
    const ping = spawnSync("mariadb-admin", [`--defaults-file=${cnf}`, "-uroot", "ping"], { stdio: "ignore" });
    if (ping.status === 0) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error("MariaDB did not accept connections within the time limit");
}

/** A server left running by a launcher that crashed holds the data directory: shut it down first. */
function stopOrphan(dir: string, cnf: string): void {
  const pidFile = path.join(dir, "mysqld.pid");
  if (!existsSync(pidFile)) return;
  const pid = Number(readFileSync(pidFile, "utf8").trim());
  if (!pid) return;
  try {
    process.kill(pid, 0);
  } catch {
    return; // not running: a stale pid file, which mariadbd replaces itself
  }
  spawnSync("mariadb-admin", [`--defaults-file=${cnf}`, "-uroot", "shutdown"], { stdio: "ignore" });
  const deadline = Date.now() + 15_000;
  while (Date.now() < deadline) {
    try {
      process.kill(pid, 0);
    } catch {
      return;
    }
    spawnSync("sleep", ["0.1"]);
  }
}

/**
 * Starts mariadbd on `dir` (initialised on first use) bound to 127.0.0.1:`port`.
 * Returns once the server accepts connections; `stop()` shuts it down and waits for the process.
 */
export async function startMariadb({ dir, port }: { dir: string; port: number }): Promise<MariadbServer> {
  mkdirSync(dir, { recursive: true });
  const cnf = writeConfig(dir, port);
  if (!existsSync(path.join(dir, "data", "mysql"))) {
    execFileSync("mariadb-install-db", [`--defaults-file=${cnf}`, "--auth-root-authentication-method=normal", "--skip-test-db"], { stdio: "ignore" });
  }
  stopOrphan(dir, cnf);
  // Its own process group: a Ctrl-C in the terminal reaches our launcher, which shuts the
  // server down in order, instead of hitting mariadbd directly.
  const child = spawn("mariadbd", [`--defaults-file=${cnf}`], { stdio: "ignore", detached: true });
  await waitForPing(cnf, child, 30_000);
  const socket = path.join(dir, "mysqld.sock");
  const stop = async () => {
    if (child.exitCode !== null) return;
    spawnSync("mariadb-admin", [`--defaults-file=${cnf}`, "-uroot", "shutdown"], { stdio: "ignore" });
    const deadline = Date.now() + 15_000;
    while (child.exitCode === null && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
    if (child.exitCode === null) child.kill("SIGKILL");
  };
  return { dir, port, socket, pid: child.pid ?? 0, process: child, stop };
}

/** Tables whose rows are evidence: the application user may not delete from them. */
export const APPEND_ONLY_TABLES = ["joints", "joint_revisions", "audit_log", "joint_overrides", "joint_override_uses"] as const;

/**
 * Creates the database, an owner user (migrations: all rights on the schema) and the
 * application user (rights granted by `grantApplicationRights` after migrating). Idempotent.
 */
export function provisionDatabase(
  dir: string,
  { database, user, password, ownerUser, ownerPassword }: { database: string; user: string; password: string; ownerUser: string; ownerPassword: string },
): void {
  const esc = (s: string) => s.replace(/\\/g, "\\\\").replace(/'/g, "\\'");
  const statements = [`CREATE DATABASE IF NOT EXISTS \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`];
  for (const host of ["127.0.0.1", "localhost"]) {
    for (const [name, pw] of [
      [user, password],
      [ownerUser, ownerPassword],
    ]) {
      statements.push(`CREATE USER IF NOT EXISTS '${esc(name)}'@'${host}' IDENTIFIED BY '${esc(pw)}'`);
      statements.push(`ALTER USER '${esc(name)}'@'${host}' IDENTIFIED BY '${esc(pw)}'`);
    }
    statements.push(`GRANT ALL PRIVILEGES ON \`${database}\`.* TO '${esc(ownerUser)}'@'${host}'`);
  }
  rootSql(dir, statements.join(";\n") + ";");
}

/**
 * Grants the application user everything on its schema except DELETE on the evidence
 * tables (run after migrations, so the table list is complete). A migration user with
 * full rights is the root account of the private server.
 */
export function grantApplicationRights(dir: string, { database, user }: { database: string; user: string }): void {
  const tables = rootSql(dir, `SELECT table_name FROM information_schema.tables WHERE table_schema='${database}'`)
    .split("\n")
    .map((s) => s.trim())
    .filter(Boolean);
  const statements: string[] = [];
  for (const host of ["127.0.0.1", "localhost"]) {
    statements.push(`REVOKE ALL PRIVILEGES, GRANT OPTION FROM '${user}'@'${host}'`);
    for (const table of tables) {
      const appendOnly = (APPEND_ONLY_TABLES as readonly string[]).includes(table);
      const rights = appendOnly ? "SELECT, INSERT" : "SELECT, INSERT, UPDATE, DELETE";
      statements.push(`GRANT ${rights} ON \`${database}\`.\`${table}\` TO '${user}'@'${host}'`);
    }
  }
  rootSql(dir, statements.join(";\n") + ";");
}

/** Reads a value kept under the data directory, or creates it with `make` on first use. */
export function keptSecret(file: string, make: () => string): string {
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  mkdirSync(path.dirname(file), { recursive: true });
  const value = make();
  writeFileSync(file, value + "\n", { mode: 0o600 });
  return value;
}
