// The one knex instance (mysql2 client) for the whole server. Cached on globalThis so
// development reloads and test files reuse one pool instead of opening more.
//
// Every `db().transaction(callback)` is a write transaction that reruns as a whole when the
// database answers that it could not commit it but a second try may (writeTransaction
// below): a deadlock, which on a MariaDB Galera cluster is also how a certification failure
// (a conflicting write committed first on another node) and a brute-force abort are
// reported, and a node that is not serving (not synced, or cut off from the primary
// component). So a callback must do nothing outside the database that it could not do
// twice: files go to object storage before the transaction, mail goes through the outbox.
import { randomInt } from "node:crypto";
import knexFactory, { type Knex } from "knex";
import { tallyQuery } from "./query-count";

// eslint-disable-next-line @typescript-eslint/no-require-imports
const config = require("../knexfile.js") as Knex.Config;
// eslint-disable-next-line @typescript-eslint/no-require-imports
const Mysql2Dialect = require("knex/lib/dialects/mysql2") as new (config: Knex.Config) => { _query(connection: unknown, obj: unknown): Promise<unknown> };

/**
 * knex's mysql2 dialect, with one addition: a connection whose server answered that it is
 * not serving (Galera node not synced or not in the primary component, errno 1047) is marked
 * disposed, knex's own marker, so the pool drops it instead of handing it out again; the
 * rerun gets a fresh connection, which the load balancer (or the driver's host list) sends
 * to a node that serves.
 */
class BeadlineMysql2Client extends Mysql2Dialect {
  _query(connection: unknown, obj: unknown): Promise<unknown> {
    return super._query(connection, obj).catch((error: unknown) => {
      if (writeRetryReason(error) === "node-not-ready" && connection) (connection as { __knex__disposed?: unknown }).__knex__disposed = error;
      throw error;
    });
  }
}

/**
 * wsrep_sync_wait for every connection of the pool (BEADLINE_WSREP_SYNC_WAIT, default 1):
 * on a Galera node, a read (SELECT, and BEGIN) first waits until the node has applied every
 * write the cluster committed before it, so a request sees what an earlier request saw or
 * wrote, whichever app instance and database node each landed on — e.g. the joint a
 * duplicate client id points at, just committed through another node. Source: MariaDB
 * documentation of wsrep_sync_wait (bitmask; 1 = causality checks on reads). The cost is
 * one cluster round trip per read. On a server without Galera the setting does nothing, and
 * a server built without wsrep does not know the variable (errno 1193): then it is skipped.
 */
function syncWaitLevel(): number {
  const text = process.env.BEADLINE_WSREP_SYNC_WAIT?.trim();
  const set = text ? Number(text) : 1;
  return Number.isInteger(set) && set >= 0 && set <= 15 ? set : 1;
}

type RawConnection = { query: (sql: string, values: unknown[], cb: (error: { errno?: number } | null) => void) => void };
type AfterCreate = (connection: RawConnection, done: (error: unknown, connection: RawConnection) => void) => void;

function poolWithSyncWait(pool: Knex.Config["pool"]): Knex.Config["pool"] {
  const level = syncWaitLevel();
  const next = (pool as { afterCreate?: AfterCreate } | undefined)?.afterCreate;
  const afterCreate: AfterCreate = (connection, done) => {
    connection.query("SET SESSION wsrep_sync_wait = ?", [level], (error) => {
      if (error && error.errno !== 1193) return done(error, connection);
      if (next) return next(connection, done);
      done(null, connection);
    });
  };
  return { ...pool, afterCreate };
}

const globalForKnex = globalThis as unknown as { beadlineKnex?: Knex };

export function db(): Knex {
  if (!globalForKnex.beadlineKnex) {
    const k = knexFactory({ ...config, pool: poolWithSyncWait(config.pool), client: BeadlineMysql2Client as unknown as Knex.Config["client"] });
    // Every statement sent counts for the request (or counted piece of work) that sent it
    // (database/query-count.ts); with no counting in the process this is one call that returns.
    k.on("query", tallyQuery);
    globalForKnex.beadlineKnex = withWriteRetry(k);
  }
  return globalForKnex.beadlineKnex;
}

/** Close the pool (scripts and tests call this at the end). */
export async function closeDb(): Promise<void> {
  const k = globalForKnex.beadlineKnex;
  globalForKnex.beadlineKnex = undefined;
  if (k) await k.destroy();
}

/** Either a transaction handle or the pool: every query function takes one optionally. */
export type Db = Knex | Knex.Transaction;

export function conn(trx?: Db): Db {
  return trx ?? db();
}

/**
 * Errors that mean "the database cannot be reached right now" (the app answers 503): refused
 * or dropped connections, a server shutting down, connections it killed, and what mysql2 and
 * knex say about a connection that died under a transaction ("Can't add new command when
 * connection is in closed state" on the ROLLBACK) — any error mysql2 marks fatal.
 */
export function isDatabaseUnavailable(error: unknown): boolean {
  const e = error as { code?: string; message?: string; fatal?: boolean } | null;
  const code = e?.code ?? "";
  const message = String(e?.message ?? "");
  return (
    e?.fatal === true ||
    ["ECONNREFUSED", "ECONNRESET", "ECONNABORTED", "PROTOCOL_CONNECTION_LOST", "PROTOCOL_SEQUENCE_TIMEOUT", "ETIMEDOUT", "EPIPE", "EHOSTUNREACH", "ENOTFOUND", "ER_SERVER_SHUTDOWN", "ER_CON_COUNT_ERROR", "ER_CONNECTION_KILLED"].includes(code) ||
    /Knex: Timeout acquiring a connection|connect ECONNREFUSED|Connection lost|server has gone away|connection is in closed state|Pool is destroyed|Server shutdown in progress/i.test(message)
  );
}

/** MariaDB duplicate-key error (unique index), used for idempotency and optimistic locking. */
export function isDuplicateKey(error: unknown): boolean {
  return (error as { code?: string } | null)?.code === "ER_DUP_ENTRY";
}

// ---------------------------------------------------------------------------------------
// Write transactions that rerun on a deadlock or certification failure.

/** How often a write transaction is tried, and the waits between tries (full jitter). */
export type WriteRetryPolicy = {
  /** Tries in all, the first included. */
  attempts: number;
  /** The wait before the second try is drawn from [0, baseDelayMs); it doubles each try, up to maxDelayMs. */
  baseDelayMs: number;
  maxDelayMs: number;
  /** The same for a node that is not serving: the load balancer needs a moment to notice. */
  notReadyBaseDelayMs: number;
};

/**
 * 5 tries; waits drawn from [0, 25 ms), [0, 50 ms), … for a conflict (the other writer has
 * committed by then; random so two reruns do not collide again in step), from [0, 250 ms),
 * [0, 500 ms), … up to 2 s for a node that is not serving (about 4 s at worst, within the
 * 10 s a request may take). Common practice for optimistic retries (exponential back-off
 * with full jitter); the numbers are ours.
 */
export const WRITE_RETRY: WriteRetryPolicy = { attempts: 5, baseDelayMs: 25, maxDelayMs: 2_000, notReadyBaseDelayMs: 250 };

/**
 * Why a failed write transaction may be run again from the start, or null when it may not:
 * - "conflict": errno 1213 ER_LOCK_DEADLOCK. InnoDB rolled the whole transaction back (a
 *   deadlock); on Galera also a certification failure at COMMIT or a brute-force abort by a
 *   replicated write ("Deadlock found when trying to get lock; try restarting transaction").
 * - "node-not-ready": errno 1047 ER_UNKNOWN_COM_ERROR, "WSREP has not yet prepared node for
 *   application use" — the node is joining, donating or outside the primary component; it
 *   committed nothing.
 * Not rerun: 1205 lock wait timeout (InnoDB rolls back only the statement; the caller has
 * already waited innodb_lock_wait_timeout, 50 s by default, so the request answers 503 at
 * once) and 1180 "error during COMMIT" (whether it committed is not known: 503, and the
 * client's re-send is made safe by its idempotency key).
 */
export function writeRetryReason(error: unknown): "conflict" | "node-not-ready" | null {
  const e = error as { code?: string; errno?: number } | null;
  if (e?.code === "ER_LOCK_DEADLOCK" || e?.errno === 1213) return "conflict";
  if (e?.code === "ER_UNKNOWN_COM_ERROR" || e?.errno === 1047) return "node-not-ready";
  return null;
}

/** Thrown when every try of a write transaction failed with a rerunnable error; the guard answers 503 with Retry-After. */
export class WriteRetriesExhausted extends Error {
  readonly code = "BEADLINE_WRITE_RETRIES_EXHAUSTED";
  constructor(
    readonly attempts: number,
    readonly reason: "conflict" | "node-not-ready",
    readonly lastError: unknown,
  ) {
    super(`Write transaction gave up after ${attempts} tries (${reason}): ${String((lastError as Error)?.message ?? lastError)}`);
    this.name = "WriteRetriesExhausted";
  }
}

/**
 * A write that failed for now but not for good (the app answers 503 with Retry-After):
 * retries ran out, a lock wait timed out, a COMMIT failed with an unknown outcome, or a
 * rerunnable error outside a transaction (an autocommit statement).
 */
export function isWriteContention(error: unknown): boolean {
  const e = error as { code?: string; errno?: number } | null;
  return (
    e?.code === "BEADLINE_WRITE_RETRIES_EXHAUSTED" ||
    e?.code === "ER_LOCK_WAIT_TIMEOUT" ||
    e?.errno === 1205 ||
    e?.code === "ER_ERROR_DURING_COMMIT" ||
    e?.errno === 1180 ||
    writeRetryReason(error) !== null
  );
}

/** Reruns and give-ups of this process since it started (for the logs and monitoring). */
const retryCounts = { reruns: 0, gaveUp: 0 };
export function writeRetryStats(): Readonly<typeof retryCounts> {
  return { ...retryCounts };
}

const sleep = (ms: number) => new Promise<void>((resolve) => setTimeout(resolve, ms));

/**
 * Runs `attempt` until it succeeds, fails with an error that is not rerunnable
 * (writeRetryReason), or has been tried `policy.attempts` times (then WriteRetriesExhausted).
 * `attempt` must start from nothing each time: a whole transaction, or one self-contained
 * statement the server rolled back.
 */
export async function retryWrite<T>(attempt: () => Promise<T>, policy: Partial<WriteRetryPolicy> = {}): Promise<T> {
  const p = { ...WRITE_RETRY, ...policy };
  for (let tried = 1; ; tried += 1) {
    try {
      return await attempt();
    } catch (error) {
      const reason = writeRetryReason(error);
      if (!reason) throw error;
      if (tried >= p.attempts) {
        retryCounts.gaveUp += 1;
        throw new WriteRetriesExhausted(tried, reason, error);
      }
      retryCounts.reruns += 1;
      const cap = Math.min(p.maxDelayMs, (reason === "conflict" ? p.baseDelayMs : p.notReadyBaseDelayMs) * 2 ** (tried - 1));
      await sleep(cap >= 1 ? randomInt(0, Math.ceil(cap)) : 0);
    }
  }
}

const PLAIN_TRANSACTION = Symbol.for("beadline.knex.plainTransaction");
type Transact = <T>(work: (trx: Knex.Transaction) => Promise<T>, config?: Knex.TransactionConfig) => Promise<T>;

/**
 * One write transaction on `k`, rerun from the start on a deadlock, a Galera certification
 * failure or a node that is not serving (writeRetryReason), at most `policy.attempts` times.
 * Inside another transaction it is a savepoint and is not rerun on its own: the outer one is.
 * `db().transaction(callback)` is this already; use it directly where a knex is passed in.
 */
export function writeTransaction<T>(k: Knex, work: (trx: Knex.Transaction) => Promise<T>, policy: Partial<WriteRetryPolicy> = {}): Promise<T> {
  if ((k as Knex.Transaction).isTransaction) return k.transaction<T>(work);
  const plain = (k as unknown as { [PLAIN_TRANSACTION]?: Transact })[PLAIN_TRANSACTION];
  return retryWrite(() => (plain ? plain(work) : k.transaction<T>(work)), policy);
}

/** Makes `k.transaction(callback)` a writeTransaction; the other forms of the call are left as knex has them. */
function withWriteRetry(k: Knex): Knex {
  const plain = k.transaction.bind(k) as unknown as (...args: unknown[]) => Promise<unknown>;
  Object.defineProperty(k, PLAIN_TRANSACTION, { value: plain, configurable: true });
  Object.defineProperty(k, "transaction", {
    configurable: true,
    value: (container?: unknown, txConfig?: unknown) => {
      if (typeof container !== "function") return plain(container, txConfig);
      return retryWrite(() => plain(container, txConfig));
    },
  });
  return k;
}
