// The health check HAProxy asks before it sends database connections to a Galera node: a
// small HTTP answer per node on loopback, 200 only when the node is Synced and ready
// (wsrep_local_state 4, wsrep_ready ON), 503 otherwise: a joining, donor, desynced or
// non-primary node accepts connections but must not take the application's writes.
// The same idea as the "clustercheck" script Galera installations run behind xinetd.
// source: Galera Cluster documentation, "Node State Changes" (state 4 = Synced);
// HAProxy 2.6 configuration manual, "option httpchk" and "port" server option.
import http from "node:http";
import mysql from "mysql2/promise";

export type NodeCheck = { port: number; stop: () => Promise<void> };

/** The monitor account only reads status variables: it holds no privilege beyond signing in. */
export const MONITOR_USER = "beadline_monitor";

/** Whether the node at 127.0.0.1:`port` answers as Synced and ready, with the state's name. */
export async function nodeIsSynced({ port, password }: { port: number; password: string }): Promise<{ synced: boolean; state: string }> {
  let connection: mysql.Connection | null = null;
  try {
    connection = await mysql.createConnection({ host: "127.0.0.1", port, user: MONITOR_USER, password, connectTimeout: 1000 });
    const [rows] = await connection.query("SHOW GLOBAL STATUS WHERE Variable_name IN ('wsrep_local_state', 'wsrep_local_state_comment', 'wsrep_ready')");
    const status = Object.fromEntries((rows as { Variable_name: string; Value: string }[]).map((r) => [r.Variable_name, r.Value]));
    return { synced: status.wsrep_local_state === "4" && status.wsrep_ready === "ON", state: status.wsrep_local_state_comment ?? "unknown" };
  } catch (error) {
    return { synced: false, state: `unreachable (${(error as { code?: string }).code ?? "error"})` };
  } finally {
    await connection?.end().catch(() => undefined);
  }
}

/** Serves the check for one node on 127.0.0.1:`checkPort`. */
export async function startNodeCheck({ checkPort, nodePort, password }: { checkPort: number; nodePort: number; password: string }): Promise<NodeCheck> {
  const server = http.createServer((req, res) => {
    void nodeIsSynced({ port: nodePort, password }).then(({ synced, state }) => {
      res.writeHead(synced ? 200 : 503, { "content-type": "text/plain", connection: "close" });
      res.end(`${state}\n`);
    });
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(checkPort, "127.0.0.1", () => resolve());
  });
  return {
    port: checkPort,
    stop: () =>
      new Promise<void>((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}
