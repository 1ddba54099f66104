// Three MariaDB nodes replicating with Galera on loopback, for `npm run cluster` and the
// cluster fault test. Each node is the private server of database/local/mariadb.ts (its own
// 0700 folder, socket, unix_socket administrators) with Galera settings added: its own
// client, group-communication (gmcast), incremental (IST) and snapshot (SST) ports.
// The first start bootstraps node 1 and the others join by snapshot transfer (mariabackup,
// signed in as the launcher's account through the donor's socket: no password exists; rsync
// cannot be used when the launcher is root, as its daemon then writes as "nobody"); a later
// start bootstraps the node Galera marked safe to bootstrap (the last one stopped) or, after
// a crash of all of them, the most advanced one.
// source: MariaDB Knowledge Base, "Galera Cluster System Variables", "Getting Started with
// MariaDB Galera Cluster" (mandatory settings: binlog_format=ROW, InnoDB, innodb_autoinc_lock_mode=2),
// "Galera Cluster Recovery" (grastate.dat, safe_to_bootstrap, --wsrep-recover).
import { spawnSync } from "node:child_process";
import { existsSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import path from "node:path";
import { adminUser, rootSql, startMariadb, type MariadbServer } from "../local/mariadb";
import { StackError } from "../local/redact";

export const GALERA_PROVIDER = "/usr/lib/galera/libgalera_smm.so";

export type NodePorts = { client: number; gmcast: number; ist: number; sst: number; check: number };

export type GaleraNode = {
  name: string;
  dir: string;
  ports: NodePorts;
  /** The running server, or null while the node is down. */
  server: MariadbServer | null;
};

export type GaleraState = { uuid: string; seqno: number; safeToBootstrap: boolean };

/** Why the cluster cannot run here (Galera or the state-transfer tools missing), or null when it can. */
export function galeraMissing(): string | null {
  if (!existsSync(GALERA_PROVIDER)) return `the Galera library ${GALERA_PROVIDER} is missing (Debian package galera-4)`;
  for (const [tool, pkg] of [["mariadb-backup", "mariadb-backup"], ["socat", "socat"]]) {
    if (spawnSync("sh", ["-c", `command -v ${tool}`]).status !== 0) return `${tool} is missing (Debian package ${pkg}, used for state transfer)`;
  }
  return null;
}

/** The node's `[mysqld]` lines: Galera's mandatory settings and small memory on a shared machine. */
function galeraConfig(node: GaleraNode, all: GaleraNode[]): string {
  const members = all.map((n) => `127.0.0.1:${n.ports.gmcast}`).join(",");
  return `wsrep_on=ON
wsrep_provider=${GALERA_PROVIDER}
wsrep_cluster_name=beadline
wsrep_cluster_address=gcomm://${members}
wsrep_node_name=${node.name}
wsrep_node_address=127.0.0.1:${node.ports.gmcast}
wsrep_node_incoming_address=127.0.0.1:${node.ports.client}
wsrep_provider_options="gmcast.listen_addr=tcp://127.0.0.1:${node.ports.gmcast};ist.recv_addr=127.0.0.1:${node.ports.ist};gcache.size=64M;gcache.page_size=16M"
wsrep_sst_method=mariabackup
wsrep_sst_auth=${adminUser()}:
wsrep_sst_receive_address=127.0.0.1:${node.ports.sst}
wsrep_slave_threads=1
binlog_format=ROW
# The schema's triggers are created by the owner account, which holds no SUPER privilege.
log_bin_trust_function_creators=1
default_storage_engine=InnoDB
enforce_storage_engine=InnoDB
innodb_autoinc_lock_mode=2
innodb_buffer_pool_size=${process.env.BEADLINE_DB_BUFFER_POOL || "64M"}
innodb_log_file_size=48M
innodb_flush_log_at_trx_commit=2
[sst]
sst-log-archive-dir=${node.dir}/sst-log-archive
`;
}

/** grastate.dat of a node (Galera's saved position), or null when the node has none yet. */
export function readGaleraState(node: GaleraNode): GaleraState | null {
  const file = path.join(node.dir, "data", "grastate.dat");
  if (!existsSync(file)) return null;
  const text = readFileSync(file, "utf8");
  const field = (name: string) => new RegExp(`^${name}:\\s*(\\S+)`, "m").exec(text)?.[1] ?? "";
  return { uuid: field("uuid"), seqno: Number(field("seqno") || -1), safeToBootstrap: field("safe_to_bootstrap") === "1" };
}

/**
 * The position InnoDB holds after a crash (grastate.dat says seqno -1 then): `mariadbd
 * --wsrep-recover` reads it and logs "WSREP: Recovered position: <uuid>:<seqno>".
 */
function recoverPosition(node: GaleraNode): { position: string; seqno: number } | null {
  const logFile = path.join(node.dir, "recover.log");
  rmSync(logFile, { force: true });
  spawnSync("mariadbd", [`--defaults-file=${path.join(node.dir, "my.cnf")}`, "--wsrep-recover", `--log-error=${logFile}`], { stdio: "ignore", env: { ...process.env, UMASK: "0600", UMASK_DIR: "0700" } });
  const text = existsSync(logFile) ? readFileSync(logFile, "utf8") : "";
  const found = [...text.matchAll(/Recovered position:\s*([0-9a-f-]+):(-?\d+)/g)].pop();
  return found ? { position: `${found[1]}:${found[2]}`, seqno: Number(found[2]) } : null;
}

/**
 * Which node starts the cluster: node 1 on a first start; later the one marked
 * safe_to_bootstrap (the last stopped), else the one with the highest seqno (recovered
 * from InnoDB when the node crashed), which is then marked safe to bootstrap.
 */
export function chooseBootstrapNode(nodes: GaleraNode[]): GaleraNode {
  const states = nodes.map((node) => ({ node, state: readGaleraState(node) }));
  const withData = states.filter((s) => s.state !== null);
  if (withData.length === 0) return nodes[0];
  const safe = withData.find((s) => s.state!.safeToBootstrap);
  if (safe) return safe.node;
  let best = withData[0];
  let bestSeqno = -Infinity;
  for (const s of withData) {
    const seqno = s.state!.seqno >= 0 ? s.state!.seqno : (recoverPosition(s.node)?.seqno ?? -1);
    if (seqno > bestSeqno) {
      best = s;
      bestSeqno = seqno;
    }
  }
  const file = path.join(best.node.dir, "data", "grastate.dat");
  writeFileSync(file, readFileSync(file, "utf8").replace(/^safe_to_bootstrap:.*$/m, "safe_to_bootstrap: 1"), { mode: 0o600 });
  return best.node;
}

/** wsrep status values of a running node (through its socket, as the administrator). */
export function wsrepStatus(node: GaleraNode): Record<string, string> {
  const out = rootSql(node.dir, "SHOW GLOBAL STATUS LIKE 'wsrep_%'");
  const status: Record<string, string> = {};
  for (const line of out.split("\n")) {
    const [name, value] = line.split("\t");
    if (name) status[name] = value ?? "";
  }
  return status;
}

/** Waits until the node reports Synced (it has caught up and takes queries). */
export async function waitSynced(node: GaleraNode, timeoutMs = 180_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  let last = "";
  while (Date.now() < deadline) {
    try {
      const s = wsrepStatus(node);
      last = `${s.wsrep_local_state_comment ?? "?"}, cluster size ${s.wsrep_cluster_size ?? "?"}`;
      if (s.wsrep_local_state_comment === "Synced" && s.wsrep_ready === "ON") return;
    } catch (error) {
      last = (error as Error).message;
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new StackError(`Galera ${node.name} did not reach Synced`, last, `See ${path.join(node.dir, "error.log")}.`);
}

/**
 * Starts one node: `bootstrap` makes it a new cluster's first member (--wsrep-new-cluster),
 * otherwise it joins the running members (snapshot transfer when new or far behind,
 * incremental transfer from a member's gcache when it was away briefly).
 */
export async function startGaleraNode(node: GaleraNode, all: GaleraNode[], { bootstrap }: { bootstrap: boolean }): Promise<MariadbServer> {
  const extraConfig = galeraConfig(node, all);
  const args = bootstrap ? ["--wsrep-new-cluster"] : [];
  // After a crash grastate.dat says seqno -1: without the position InnoDB holds, the node
  // would ask for a whole snapshot. Recovered and passed on, it asks only for what it missed (IST).
  const state = readGaleraState(node);
  if (!bootstrap && state && state.seqno < 0) {
    const recovered = recoverPosition(node);
    if (recovered) args.push(`--wsrep-start-position=${recovered.position}`);
  }
  const server = await startMariadb({
    dir: node.dir,
    port: node.ports.client,
    extraConfig,
    args,
    readyTimeoutMs: 180_000,
    // A joiner answers pings while it still applies what it missed: wait until it is Synced.
    whenListening: () => waitSynced(node),
  });
  node.server = server;
  return server;
}

/** SIGKILL: the node's process dies at once, as in a power cut (the fault test). */
export async function killGaleraNode(node: GaleraNode): Promise<void> {
  const child = node.server?.process;
  node.server = null;
  if (!child || child.exitCode !== null) return;
  child.kill("SIGKILL");
  while (child.exitCode === null && child.signalCode === null) await new Promise((r) => setTimeout(r, 50));
}

/** Clean shutdown, one node at a time in reverse order: the first node stops last and is marked safe to bootstrap. */
export async function stopGaleraNodes(nodes: GaleraNode[]): Promise<void> {
  for (const node of [...nodes].reverse()) {
    const server = node.server;
    node.server = null;
    if (server) await server.stop();
  }
}
