// Queries per request, counted when BEADLINE_COUNT_QUERIES=1 or =sql (off by default: then nothing is
// installed and no query pays for it). The web server runs each request inside a tally
// (app/_lib/query-count.ts); the shared knex client adds one to the tally of the request
// that issued the statement (database/client.ts, knex's `query` event, which fires once per
// statement sent to the server: one round trip). Scripts and tests can count a piece of work
// with `countQueries`. Until one of them asks, no tally store exists and the client's
// listener returns at once.
import { AsyncLocalStorage } from "node:async_hooks";

/** `statements` is kept only under BEADLINE_COUNT_QUERIES=sql: the SQL text of each (no bound values). */
export type QueryTally = { queries: number; statements?: string[] };

// On globalThis: instrumentation and the route bundles may each load their own copy of this module.
const globalForTally = globalThis as unknown as { beadlineQueryTally?: AsyncLocalStorage<QueryTally> };

/** BEADLINE_COUNT_QUERIES=sql: the log line lists the statements' SQL text too (never their values). */
export function queryTextOn(): boolean {
  return process.env.BEADLINE_COUNT_QUERIES === "sql";
}

export function queryTallies(): AsyncLocalStorage<QueryTally> {
  globalForTally.beadlineQueryTally ??= new AsyncLocalStorage<QueryTally>();
  return globalForTally.beadlineQueryTally;
}

/** One more statement for the tally of the work in progress, if any. */
export function tallyQuery(query?: { sql?: string }): void {
  const tally = globalForTally.beadlineQueryTally?.getStore();
  if (!tally) return;
  tally.queries += 1;
  if (tally.statements) tally.statements.push(String(query?.sql ?? ""));
}

/** Runs `fn` in a tally of its own and returns its result with the number of statements it sent. */
export async function countQueries<T>(fn: () => Promise<T>): Promise<{ result: T; queries: number }> {
  const tally: QueryTally = { queries: 0 };
  const result = await queryTallies().run(tally, fn);
  return { result, queries: tally.queries };
}
