// Private MariaDB server for development (`npm start`) and tests (`npm test`): its own
// data directory, socket and port on 127.0.0.1, never the system service. Private to the
// launcher's user: directory and data 0700/0600, socket inside that directory, root and the
// launcher's account sign in by unix_socket only (no passwordless root over TCP).
import { execFileSync, spawn, spawnSync, type ChildProcess } from "node:child_process";
import { chmodSync, existsSync, lstatSync, mkdirSync, readFileSync, readdirSync, renameSync, rmSync, writeFileSync } from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { StackError, redact, rememberSecret } from "./redact";

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

/** The launcher's own account name: its MariaDB administrator signs in through the socket as it. */
export function adminUser(): string {
  return os.userInfo().username;
}

/** A directory only the launcher's user may enter (created, or tightened when it exists). */
export function privateDir(dir: string): void {
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  chmodSync(dir, 0o700);
}

function writeConfig(dir: string, port: number, extraConfig = ""): string {
  const file = path.join(dir, "my.cnf");
  const user = typeof process.getuid === "function" && process.getuid() === 0 ? "user=root\n" : "";
  // Temporary tables (large sorts, GROUP BY) in the server's own folder, not the shared /tmp,
  // where another program's clean-up can delete them under a running query.
  privateDir(path.join(dir, "tmp"));
  writeFileSync(
    file,
    `[mysqld]
datadir=${dir}/data
tmpdir=${dir}/tmp
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
${extraConfig ? `${extraConfig.trimEnd()}\n` : ""}[client]
socket=${dir}/mysqld.sock
port=${port}
`,
    { mode: 0o600 },
  );
  chmodSync(file, 0o600);
  return file;
}

// mariadbd creates its files with the modes in UMASK / UMASK_DIR (octal), not the process umask.
const SERVER_ENV = { ...process.env, UMASK: "0600", UMASK_DIR: "0700" };

function clientArgs(dir: string, user: string): string[] {
  return [`--defaults-file=${path.join(dir, "my.cnf")}`, `--user=${user}`, "--protocol=SOCKET"];
}

function runSql(dir: string, user: string, sql: string): { ok: true; out: string } | { ok: false; err: string } {
  // SQL goes in on stdin: never on a command line, which every user of the machine can read.
  const r = spawnSync("mariadb", [...clientArgs(dir, user), "-N", "-B"], { input: sql, encoding: "utf8", env: SERVER_ENV });
  if (r.status === 0) return { ok: true, out: r.stdout };
  // The client echoes the failing statement around its ERROR line: keep the ERROR line only.
  const errorLines = (r.stderr ?? "").split("\n").filter((line) => line.startsWith("ERROR"));
  const detail = errorLines.length ? errorLines.join(" ") : r.stderr || `mariadb exited with ${r.status ?? r.signal}`;
  return { ok: false, err: redact(`${r.error?.message ?? ""} ${detail}`.trim()) };
}

/**
 * Runs SQL as the private server's administrator: the launcher's own account, signed in by
 * unix_socket authentication over the private socket (no password exists to leak). Errors
 * are redacted: the SQL may carry generated passwords.
 */
export function rootSql(dir: string, sql: string): string {
  const r = runSql(dir, adminUser(), sql);
  if (!r.ok) throw new Error(`MariaDB statement failed: ${r.err}`);
  return r.out;
}

async function waitForPing(dir: string, child: ChildProcess, timeoutMs: number): Promise<void> {
  const started = Date.now();
  while (Date.now() - started < timeoutMs) {
    if (child.exitCode !== null) throw new Error(`mariadbd exited with code ${child.exitCode}; see ${path.join(dir, "error.log")}`);
    const ping = spawnSync("mariadb-admin", [...clientArgs(dir, adminUser()), "ping"], { stdio: "ignore" });
    if (ping.status === 0) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`MariaDB did not accept connections within ${timeoutMs / 1000} s; see ${path.join(dir, "error.log")}`);
}

function shutdownServer(dir: string): void {
  spawnSync("mariadb-admin", [...clientArgs(dir, adminUser()), "shutdown"], { stdio: "ignore" });
}

/** A server left running by a launcher that crashed holds the data directory: shut it down first. */
function stopOrphan(dir: string): void {
  const pidFile = path.join(dir, "mysqld.pid");
  if (!existsSync(pidFile)) return;
  const pid = Number(readFileSync(pidFile, "utf8").trim());
  if (!pid) return;
  try {
    process.kill(pid, 0);
  } catch {
    return; // not running: a stale pid file, which mariadbd replaces itself
  }
  shutdownServer(dir);
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

/** Where a first start builds the data directory before renaming it into place. */
export function initialisingDir(dir: string): string {
  return path.join(dir, "data.initialising");
}

/**
 * Creates `dir/data` on first use. mariadb-install-db writes into a directory next to the
 * target, which is renamed into place only once it finished: a killed or failed first start
 * leaves no half-made data directory behind (a leftover from one is removed and redone).
 * The administrator accounts are root and the launcher's user, both by unix_socket only.
 */
function initialiseDataDir(dir: string, cnf: string): void {
  const data = path.join(dir, "data");
  const partial = initialisingDir(dir);
  if (existsSync(data)) return;
  rmSync(partial, { recursive: true, force: true });
  const logFile = path.join(dir, "initialise.log");
  const r = spawnSync(
    "mariadb-install-db",
    [
      `--defaults-file=${cnf}`,
      `--datadir=${partial}`,
      "--auth-root-authentication-method=socket",
      `--auth-root-socket-user=${adminUser()}`,
      "--skip-test-db",
    ],
    { encoding: "utf8", env: SERVER_ENV },
  );
  writeFileSync(logFile, redact(`${r.stdout ?? ""}${r.stderr ?? ""}`), { mode: 0o600 });
  if (r.status !== 0 || !existsSync(path.join(partial, "mysql"))) {
    rmSync(partial, { recursive: true, force: true });
    throw new StackError(
      `Could not initialise the private MariaDB data directory ${data}`,
      r.error ?? `mariadb-install-db exited with ${r.status ?? r.signal}`,
      `Nothing was kept; see ${logFile}, fix the cause and start again.`,
    );
  }
  chmodSync(partial, 0o700);
  renameSync(partial, data);
}

/**
 * Root and the launcher's user sign in by unix_socket only; no account named root is
 * reachable over TCP. Idempotent; also converts data directories made before this rule
 * (root without a password, root@127.0.0.1, root@::1, root@<host>).
 */
function hardenAdministrators(dir: string): void {
  const admin = adminUser();
  const esc = (s: string) => s.replace(/\\/g, "\\\\").replace(/'/g, "\\'");
  const statements = [
    `CREATE USER IF NOT EXISTS '${esc(admin)}'@'localhost' IDENTIFIED VIA unix_socket`,
    `GRANT ALL PRIVILEGES ON *.* TO '${esc(admin)}'@'localhost' WITH GRANT OPTION`,
    `CREATE USER IF NOT EXISTS 'root'@'localhost' IDENTIFIED VIA unix_socket`,
    `ALTER USER 'root'@'localhost' IDENTIFIED VIA unix_socket`,
    `ALTER USER '${esc(admin)}'@'localhost' IDENTIFIED VIA unix_socket`,
  ];
  let r = runSql(dir, admin, `SELECT CONCAT("'", user, "'@'", host, "'") FROM mysql.global_priv WHERE user='root' AND host<>'localhost'`);
  if (!r.ok && admin !== "root") {
    // A data directory made before unix_socket sign-in: root still has no password on the socket.
    r = runSql(dir, "root", `SELECT CONCAT("'", user, "'@'", host, "'") FROM mysql.global_priv WHERE user='root' AND host<>'localhost'`);
    if (r.ok) {
      const created = runSql(dir, "root", statements.slice(0, 2).join(";\n") + ";");
      if (!created.ok) throw new Error(`MariaDB administrator set-up failed: ${created.err}`);
    }
  }
  if (!r.ok) throw new Error(`MariaDB administrator check failed: ${r.err}`);
  const remote = r.out.split("\n").map((s) => s.trim()).filter(Boolean);
  rootSql(dir, [...statements, ...remote.map((account) => `DROP USER IF EXISTS ${account}`), "FLUSH PRIVILEGES"].join(";\n") + ";");
}

/**
 * Starts mariadbd on `dir` (initialised on first use) bound to 127.0.0.1:`port`.
 * `dir` and the data directory are private to the launcher's user (0700) and the socket lives
 * inside `dir`. Returns once the server accepts connections; `stop()` shuts it down.
 */
export async function startMariadb({
  dir,
  port,
  extraConfig,
  args = [],
  readyTimeoutMs = 30_000,
  whenListening,
}: {
  dir: string;
  port: number;
  /** More `[mysqld]` lines (a later line overrides an earlier one), e.g. a Galera node's settings. */
  extraConfig?: string;
  /** More command-line options for this start only, e.g. `--wsrep-new-cluster`. */
  args?: string[];
  /** How long to wait for connections (a joining cluster node first receives a state transfer). */
  readyTimeoutMs?: number;
  /** Awaited once the server answers and before the administrators are set up (a cluster node catching up). */
  whenListening?: () => Promise<void>;
}): Promise<MariadbServer> {
  privateDir(dir);
  const cnf = writeConfig(dir, port, extraConfig);
  initialiseDataDir(dir, cnf);
  tightenTree(dir);
  stopOrphan(dir);
  // Its own process group: a Ctrl-C in the terminal reaches our launcher, which shuts the
  // server down in order, instead of hitting mariadbd directly.
  const child = spawn("mariadbd", [`--defaults-file=${cnf}`, ...args], { stdio: "ignore", detached: true, env: SERVER_ENV });
  const stop = async () => {
    if (child.exitCode !== null) return;
    shutdownServer(dir);
    const deadline = Date.now() + 15_000;
    while (child.exitCode === null && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
    if (child.exitCode === null) child.kill("SIGKILL");
  };
  try {
    await waitForPing(dir, child, readyTimeoutMs);
    await whenListening?.();
    hardenAdministrators(dir);
  } catch (error) {
    await stop();
    throw new StackError("The private MariaDB server did not start", error, `Its log is ${path.join(dir, "error.log")}; fix the cause and start again.`);
  }
  const socket = path.join(dir, "mysqld.sock");
  return { dir, port, socket, pid: child.pid ?? 0, process: child, stop };
}

/**
 * Clears the group and other bits of everything under `dir` (files 0600 or tighter, folders
 * 0700): files written before the stack ran with umask 077 are closed too.
 */
export function tightenTree(dir: string): void {
  const walk = (p: string) => {
    const st = lstatSync(p);
    if (st.isSymbolicLink()) return;
    if ((st.mode & 0o077) !== 0 && (st.isFile() || st.isDirectory())) chmodSync(p, st.mode & 0o700);
    if (st.isDirectory()) for (const name of readdirSync(p)) walk(path.join(p, name));
  };
  if (existsSync(dir)) walk(dir);
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
  privateDir(path.dirname(file));
  if (existsSync(file)) {
    chmodSync(file, 0o600);
    const kept = readFileSync(file, "utf8").trim();
    rememberSecret(kept);
    return kept;
  }
  const value = make();
  rememberSecret(value);
  // Written whole under a temporary name, then renamed: a crash never leaves half a secret.
  const temporary = `${file}.${process.pid}.tmp`;
  writeFileSync(temporary, value + "\n", { mode: 0o600 });
  renameSync(temporary, file);
  return value;
}
