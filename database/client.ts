// The one knex instance (mysql2 client) for the whole server. Cached on globalThis so
// development reloads and test files reuse one pool instead of opening more.
import knexFactory, { type Knex } from "knex";

// eslint-disable-next-line @typescript-eslint/no-require-imports
const config = require("../knexfile.js") as Knex.Config;

const globalForKnex = globalThis as unknown as { beadlineKnex?: Knex };

export function db(): Knex {
  if (!globalForKnex.beadlineKnex) {
    globalForKnex.beadlineKnex = knexFactory(config);
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

/** Errors that mean "the database cannot be reached right now" (the app answers 503). */
export function isDatabaseUnavailable(error: unknown): boolean {
  const code = (error as { code?: string } | null)?.code ?? "";
  const message = String((error as { message?: string } | null)?.message ?? "");
  return (
    ["ECONNREFUSED", "ECONNRESET", "PROTOCOL_CONNECTION_LOST", "ETIMEDOUT", "EPIPE", "ER_SERVER_SHUTDOWN", "ENOTFOUND", "ER_CON_COUNT_ERROR"].includes(code) ||
    /Knex: Timeout acquiring a connection|connect ECONNREFUSED|Connection lost|server has gone away/i.test(message)
  );
}

/** MariaDB duplicate-key error (unique index), used for idempotency and optimistic locking. */
export function isDuplicateKey(error: unknown): boolean {
  return (error as { code?: string } | null)?.code === "ER_DUP_ENTRY";
}
