// Sign-in throttling counters, kept in MariaDB (not process memory) so several web instances
// share them: rate-limiter-flexible's MySQL store on the app's knex pool, in the table
// sign_in_limits (made by migration 20261202003100; the store is told tableCreated). Two
// kinds of row per counter key: "fail:<key>" counts failures for FAILURE_MEMORY_S from the
// first, "wait:<key>" holds the time before which the next attempt is not checked, or the
// turn of the one attempt being checked past the free failures. Keys are
// opaque (the caller hashes e-mails); the rule (how long to wait) is domain/crew/throttle.ts.
// Each store call is one statement or one short BEGIN…COMMIT of its own; on a Galera cluster
// two instances counting the same key at once conflict at COMMIT (a deadlock error), which
// committed nothing, so the call is simply made again (retryWrite) and then sees the other
// instance's count: "one attempt at a time" holds across nodes.
import type { Knex } from "knex";
import { RateLimiterMySQL } from "rate-limiter-flexible";
import { db, retryWrite } from "../client";

const TABLE = "sign_in_limits";
/** How long a turn taken past the free failures is held while its password is checked. */
const TURN_S = 60;
/** Far more than any count of failures: the failure counter never refuses by itself. */
const UNLIMITED = 2_000_000_000;

type Limiters = { failures: RateLimiterMySQL; waits: RateLimiterMySQL };
const byPool = new WeakMap<Knex, Map<number, Limiters>>();

function databaseName(): string {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("DATABASE_URL is not set.");
  return decodeURIComponent(new URL(url).pathname.replace(/^\//, ""));
}

/** One pair of limiters per knex pool (tests close and reopen the pool). */
function limiters(memoryS: number): Limiters {
  const k = db();
  let forPool = byPool.get(k);
  if (!forPool) byPool.set(k, (forPool = new Map()));
  let pair = forPool.get(memoryS);
  if (!pair) {
    const common = { storeClient: k, storeType: "knex", dbName: databaseName(), tableName: TABLE, tableCreated: true };
    pair = {
      failures: new RateLimiterMySQL({ ...common, keyPrefix: "fail", points: UNLIMITED, duration: memoryS }),
      waits: new RateLimiterMySQL({ ...common, keyPrefix: "wait", points: 1, duration: TURN_S }),
    };
    forPool.set(memoryS, pair);
  }
  return pair;
}

/** Milliseconds before `key` may be tried again (0: it may be tried now). */
export async function waitLeft({ key, memoryS }: { key: string; memoryS: number }): Promise<number> {
  const res = await retryWrite(() => limiters(memoryS).waits.get(key));
  return res && res.consumedPoints > 1 && res.msBeforeNext > 0 ? res.msBeforeNext : 0;
}

/**
 * Takes `key`'s one turn (atomic: of attempts sent side by side only one gets it); false while
 * another attempt holds it or a wait runs. The turn ends with startWait, or with
 * refundFailure/forgetFailures.
 */
export async function takeTurn({ key, memoryS }: { key: string; memoryS: number }): Promise<boolean> {
  try {
    await retryWrite(() => limiters(memoryS).waits.consume(key, 1));
    return true;
  } catch (refused) {
    if (refused instanceof Error) throw refused;
    return false;
  }
}

/** Counts one failure for `key`; returns the failures remembered (this one included). */
export async function recordFailure({ key, memoryS }: { key: string; memoryS: number }): Promise<number> {
  const res = await retryWrite(() => limiters(memoryS).failures.penalty(key, 1));
  return res.consumedPoints;
}

/** Makes `key` wait `seconds` before its next attempt is checked. */
export async function startWait({ key, memoryS, seconds }: { key: string; memoryS: number; seconds: number }): Promise<void> {
  if (seconds > 0) await retryWrite(() => limiters(memoryS).waits.block(key, seconds));
}

/** Takes back one counted failure of `key`, and gives back its turn when the attempt held it. */
export async function refundFailure({ key, memoryS, heldTurn }: { key: string; memoryS: number; heldTurn: boolean }): Promise<void> {
  const { failures, waits } = limiters(memoryS);
  await Promise.all([retryWrite(() => failures.reward(key, 1)), heldTurn ? retryWrite(() => waits.delete(key)) : Promise.resolve(false)]);
}

/** Forgets `key`'s failures and wait (after a successful sign-in). */
export async function forgetFailures({ key, memoryS }: { key: string; memoryS: number }): Promise<void> {
  const { failures, waits } = limiters(memoryS);
  await Promise.all([retryWrite(() => failures.delete(key)), retryWrite(() => waits.delete(key))]);
}
