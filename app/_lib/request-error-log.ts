// The one log line for an error Next.js caught outside our wrappers (instrumentation.ts
// onRequestError): what failed where, without a stack trace or the request's body.
import { logger } from "./log";

type RequestInfo = { path: string; method: string; headers: Record<string, string | string[] | undefined> };
type ErrorContext = { routePath: string; routeType: string };

/** Logs `error` once: route type and path, method, the message's first line (at most 200 characters), the digest. */
export function logRequestError(error: unknown, request: RequestInfo, context: ErrorContext): void {
  const e = error as { message?: unknown; digest?: unknown; name?: unknown } | null;
  const message = typeof e?.message === "string" ? e.message.split("\n")[0]!.slice(0, 200) : String(error).slice(0, 200);
  const header = request.headers["x-request-id"];
  const requestId = typeof header === "string" && /^[A-Za-z0-9._:-]{8,64}$/.test(header) ? header : undefined;
  const malformedAction = context.routeType === "action" && Boolean(request.headers["next-action"]);
  logger.warn(
    {
      kind: context.routeType,
      route: context.routePath,
      method: request.method,
      path: request.path.split("?")[0]!.slice(0, 200),
      requestId,
      error: { name: typeof e?.name === "string" ? e.name : undefined, message, digest: typeof e?.digest === "string" ? e.digest : undefined },
    },
    malformedAction ? "server action request failed before reaching the action" : "request failed",
  );
}
