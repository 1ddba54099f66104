// `npm run cluster`: Beadline on a three-node MariaDB Galera cluster behind HAProxy, with two
// `next start` instances, all on loopback and private under .data/cluster/. Needs Debian's
// mariadb-server, galera-4, mariadb-backup and haproxy. First start: node 1 bootstraps, the
// others join by state transfer, migrations and the demo scenario load once; later starts
// reuse the data. Ctrl-C stops the instances, HAProxy and the nodes (node 1 last).
import path from "node:path";
import { buildIfStale, stopOnSignals, takeLock } from "../local/app-server";
import { ensureMariadbInstalled, isPortInUse } from "../local/mariadb";
import { failureLine } from "../local/redact";
import { clusterAddresses, clusterPorts, startCluster, type Cluster } from "./cluster";
import { galeraMissing } from "./galera";
import { haproxyMissing } from "./haproxy";

const ROOT = path.resolve(__dirname, "..", "..");
const DATA = path.join(ROOT, ".data");
const DIR = path.join(DATA, "cluster");
const LOCK = path.join(DATA, "cluster.lock");
const log = (line: string) => console.log(`[cluster] ${line}`);

async function main(): Promise<void> {
  const releaseLock = takeLock(DATA, LOCK, "The Beadline cluster");
  let cluster: Cluster | null = null;
  const { shutdown, isStopping } = stopOnSignals({
    log,
    message: "Stopping the instances, HAProxy and the nodes (node 1 last) …",
    releaseLock,
    stop: async () => {
      if (cluster) await cluster.stop();
    },
  });

  try {
    ensureMariadbInstalled(log);
    const missing = galeraMissing() ?? haproxyMissing();
    if (missing) throw new Error(`Cannot start the cluster: ${missing}. Install Debian's packages: sudo apt-get install -y galera-4 mariadb-backup socat haproxy`);
    const ports = await clusterPorts("fixed");
    const taken: number[] = [];
    for (const port of [ports.web, ports.db, ports.stats, ports.s3, ports.smtp, ...ports.apps, ...ports.nodes.flatMap((n) => [n.client, n.gmcast, n.ist, n.sst, n.check])]) {
      if (await isPortInUse(port)) taken.push(port);
    }
    if (taken.length) throw new Error(`Port(s) ${taken.join(", ")} already in use by another program. Stop it (or set PORT for the web port) and start again.`);
    const distDir = process.env.BEADLINE_DIST_DIR || ".next";
    buildIfStale(distDir, { ...process.env, NEXT_TELEMETRY_DISABLED: "1" }, log);
    cluster = await startCluster({ dir: DIR, ports, distDir, log });
    for (const app of cluster.apps) {
      app?.on("exit", (code, signal) => {
        if (!isStopping()) {
          log(`An app instance exited (${code ?? signal}); stopping the cluster.`);
          void shutdown(1);
        }
      });
    }
    log("Up:");
    for (const line of clusterAddresses(ports)) log(`  ${line}`);
    log("Ctrl-C stops everything; the next start reuses the data in .data/cluster/.");
  } catch (error) {
    console.error(`[cluster] ${failureLine(error)}`);
    await shutdown(1);
  }
}

void main();
