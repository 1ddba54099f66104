// Next.js start-up hook: stamps every request with its socket's address (the sign-in limit per
// address, app/_lib/client-address.ts), checks the session secret, then each Node.js server process runs the mail worker (outbox sender
// every MAIL_SEND_INTERVAL_MS, alert scan every MAIL_SCAN_INTERVAL_MS). Not during
// `next build`, not in the edge runtime, and not when MAIL_WORKER=off (e.g. a web-only
// instance when a separate process sends the mail).
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  if (process.env.NEXT_PHASE === "phase-production-build") return;
  // Production refuses to start without a session secret of at least 32 characters.
  if (process.env.NODE_ENV === "production" && (process.env.SESSION_SECRET ?? "").length < 32) {
    console.error("Beadline: SESSION_SECRET must be set to at least 32 characters; refusing to start.");
    process.exit(1);
  }
  const { installPeerAddressStamp } = await import("./app/_lib/client-address");
  installPeerAddressStamp();
  if (process.env.BEADLINE_COUNT_QUERIES === "1" || process.env.BEADLINE_COUNT_QUERIES === "sql") {
    // Queries per request in a header and a log line (app/_lib/query-count.ts); off by default.
    const { installQueryCount } = await import("./app/_lib/query-count");
    installQueryCount();
  }
  if (process.env.MAIL_WORKER === "off") return;
  const [{ startMailWorker }, { logger }] = await Promise.all([import("./app/_server/mail/worker"), import("./app/_lib/log")]);
  startMailWorker({ log: logger.child({ part: "mail-worker" }) });
}

type RequestErrorInfo = { path: string; method: string; headers: Record<string, string | string[] | undefined> };
type RequestErrorContext = { routerKind: string; routePath: string; routeType: string; renderSource?: string };

/**
 * Next.js calls this once for every error it catches while serving a request, including the
 * ones our wrappers never see (a server-action body React cannot decode, a render that throws).
 * One log line per request, through the app's logger (secrets scrubbed), with the message and
 * digest only: no stack trace, so a flood of malformed requests cannot fill the logs with them.
 */
export async function onRequestError(error: unknown, request: RequestErrorInfo, context: RequestErrorContext): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { logRequestError } = await import("./app/_lib/request-error-log");
  logRequestError(error, request, context);
}
