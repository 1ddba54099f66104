// The one knex instance (mysql2 client) for the whole server. Cached on globalThis so
// development reloads and test files reuse one pool instead of opening more.
import knexFactory, { type Knex } from "knex";
import { tallyQuery } from "./query-count";

// eslint-disable-next-line @typescript-eslint/no-require-imports
const config = require("../knexfile.js") as Knex.Config;

const globalForKnex = globalThis as unknown as { beadlineKnex?: Knex };

export function db(): Knex {
  if (!globalForKnex.beadlineKnex) {
    const k = knexFactory(config);
    // Every statement sent counts for the request (or counted piece of work) that sent it
    // (database/query-count.ts); with no counting in the process this is one call that returns.
    k.on("query", tallyQuery);
    globalForKnex.beadlineKnex = k;
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
