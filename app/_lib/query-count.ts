// Queries per request, for finding pages that make too many round trips (BEADLINE_COUNT_QUERIES=1, or =sql
// to log each statement's SQL text as well;
// installed from instrumentation.ts, off by default). Every request of this process's HTTP
// server runs inside a tally (database/query-count.ts) that the shared knex client counts into.
// The answer carries `x-beadline-queries: N`, the statements sent before its headers went out:
// the whole count for route handlers and for pages rendered before the first byte, but a page
// that streams behind a loading boundary sends its headers first. So when the answer has been
// sent, one log line gives the whole count: {"msg":"queries per request","method":"GET","path":"/register","queries":N}.
import http from "node:http";
import https from "node:https";
import { queryTallies, queryTextOn, type QueryTally } from "@/database/query-count";
import { logger } from "./log";

export const QUERIES_HEADER = "x-beadline-queries";

const globalInstalled = globalThis as unknown as { beadlineQueryCountInstalled?: boolean };

/** The path without its query string (which may carry search words). */
function pathOf(url: string | undefined): string {
  const u = url ?? "";
  const q = u.indexOf("?");
  return q < 0 ? u : u.slice(0, q);
}

function tallyResponse(req: http.IncomingMessage, res: http.ServerResponse, tally: QueryTally): void {
  const writeHead = res.writeHead as (...args: unknown[]) => http.ServerResponse;
  res.writeHead = function (this: http.ServerResponse, ...args: unknown[]) {
    if (!this.headersSent) this.setHeader(QUERIES_HEADER, String(tally.queries));
    return writeHead.apply(this, args);
  } as typeof res.writeHead;
  res.once("finish", () => {
    logger.info({ method: req.method, path: pathOf(req.url), status: res.statusCode, queries: tally.queries, ...(tally.statements ? { statements: tally.statements } : {}) }, "queries per request");
  });
}

/** Counts the queries of every request this process serves. Idempotent; call once at start-up. */
export function installQueryCount(): void {
  if (globalInstalled.beadlineQueryCountInstalled) return;
  globalInstalled.beadlineQueryCountInstalled = true;
  const tallies = queryTallies();
  const withText = queryTextOn();
  for (const Server of [http.Server, https.Server]) {
    const emit = Server.prototype.emit as (this: unknown, event: string | symbol, ...args: unknown[]) => boolean;
    Server.prototype.emit = function (this: unknown, event: string | symbol, ...args: unknown[]): boolean {
      if (event !== "request") return emit.apply(this, [event, ...args]);
      const tally: QueryTally = withText ? { queries: 0, statements: [] } : { queries: 0 };
      tallyResponse(args[0] as http.IncomingMessage, args[1] as http.ServerResponse, tally);
      return tallies.run(tally, () => emit.apply(this, [event, ...args]));
    } as typeof Server.prototype.emit;
  }
}
