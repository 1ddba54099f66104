// The one opening of every server action and route handler: session → permission →
// validate (path params, then input) → delegate. The wrapped function receives typed input
// and the signed-in person; it calls domain/ and database/ and holds no SQL or calculation
// itself. A DomainError thrown underneath (impossible input to a computation) becomes 422.
import { randomUUID } from "node:crypto";
import { cookies } from "next/headers";
import type { ZodType, z } from "zod";
import { isDatabaseUnavailable, isWriteContention } from "@/database/client";
import type { UserRecord } from "@/database/queries/users";
import { isDomainError } from "@/domain/errors";
import { allows, type Permission } from "@/domain/roles";
import { AppError, STATUS_FOR_CODE, describeFieldErrors, failure, fieldErrorsFromIssues, type ActionResult, type ErrorCode, type FieldErrors } from "@/domain/result";
import { BODY_LIMITS, readJsonLimited } from "./body";
import { requestLogger } from "./log";
import { SESSION_COOKIE, cookieFromHeader, userFromSealedCookie } from "./session";

/** Who may call: a named permission of domain/roles, or any signed-in person. */
export type Audience = Permission | "signed-in";

export type Context = { user: UserRecord; requestId: string };

function failureFromError(error: unknown, requestId: string): { code: ErrorCode; message: string; fields?: FieldErrors } {
  if (error instanceof AppError) return { code: error.code, message: error.message, fields: error.fields };
  // The domain refuses impossible input (an SDR of 2, a pipe outside the procedure's range)
  // by throwing; that is the caller's input, not a server fault.
  if (isDomainError(error)) return { code: "invalid", message: error.message, fields: { _form: [error.message] } };
  if (isDatabaseUnavailable(error)) {
    requestLogger(requestId).warn({ err: String((error as Error)?.message ?? error) }, "database unavailable");
    return { code: "unavailable", message: "Beadline cannot reach its database right now. Nothing was saved; try again in a moment." };
  }
  // Other writes to the same records kept winning (deadlocks or, on a cluster, certification
  // failures, each rerun up to WRITE_RETRY.attempts times), a lock wait timed out, or the
  // database node stopped serving mid-request: transient, so 503 with Retry-After too.
  if (isWriteContention(error)) {
    requestLogger(requestId).warn({ err: String((error as Error)?.message ?? error) }, "write gave way to concurrent writes");
    return { code: "unavailable", message: "Beadline's database is busy with other changes to the same records. Nothing was saved; try again in a moment." };
  }
  requestLogger(requestId).error({ err: error instanceof Error ? { message: error.message, stack: error.stack } : String(error) }, "unexpected error");
  return { code: "internal", message: "Something went wrong on the server. Nothing was saved." };
}

/**
 * Wraps a server action. `impl` gets the parsed input and the context; its return value
 * becomes `{ ok: true, data }`. Throw `AppError` to fail with a code.
 */
export function defineAction<S extends ZodType, R>(
  spec: { permission: Audience; schema: S; /** The form's field labels, to name failing fields in the message. */ labels?: Readonly<Record<string, string>> },
  impl: (input: z.output<S>, ctx: Context) => Promise<R>,
): (raw: z.input<S>) => Promise<ActionResult<R>> {
  return async (raw) => {
    const requestId = randomUUID();
    const started = Date.now();
    let userId: number | null = null;
    const done = <T extends ActionResult<R>>(result: T): T => {
      requestLogger(requestId).info({ kind: "action", userId, ok: result.ok, code: result.ok ? undefined : result.code, ms: Date.now() - started }, "server action");
      return result;
    };
    try {
      const store = await cookies();
      const user = await userFromSealedCookie(store.get(SESSION_COOKIE)?.value);
      if (!user) return done(failure("unauthenticated", "Sign in first."));
      userId = user.id;
      if (!allows(user, spec.permission)) return done(failure("forbidden", "Your role does not allow this."));
      const parsed = spec.schema.safeParse(raw);
      if (!parsed.success) {
        // Not the form's fields at all (text, a number, a list where the fields belong): a
        // malformed request, not a mistake in a field. 400, logged once, no stack.
        if (parsed.error.issues.some((i) => i.path.length === 0 && i.code === "invalid_type")) {
          requestLogger(requestId).warn({ kind: "action", userId, received: describeShape(raw) }, "malformed server action input");
          return done(failure("bad-request", "This request does not carry the form's fields; reload the page and try again."));
        }
        const fields = fieldErrorsFromIssues(parsed.error.issues);
        return done(failure("invalid", describeFieldErrors(fields, spec.labels), fields));
      }
      const data = await impl(parsed.data, { user, requestId });
      return done({ ok: true, data });
    } catch (error) {
      if (isNextControlFlow(error)) throw error;
      const f = failureFromError(error, requestId);
      return done(failure(f.code, f.message, f.fields));
    }
  };
}

/** What arrived instead of the fields, for the log (never the value itself). */
function describeShape(value: unknown): string {
  if (value === null) return "null";
  if (Array.isArray(value)) return "array";
  if (typeof FormData !== "undefined" && value instanceof FormData) return "form data";
  return typeof value;
}

/**
 * Parses input a handler assembles itself (e.g. a body joined with a path param); a
 * failure is thrown as 422 with every field named, answered by the wrapper.
 */
export function parseInput<S extends ZodType>(schema: S, raw: unknown): z.output<S> {
  const parsed = schema.safeParse(raw);
  if (parsed.success) return parsed.data;
  const fields = fieldErrorsFromIssues(parsed.error.issues);
  throw new AppError("invalid", describeFieldErrors(fields), fields);
}

/** redirect()/notFound() throw special errors that must pass through the wrapper. */
function isNextControlFlow(error: unknown): boolean {
  const digest = (error as { digest?: string } | null)?.digest;
  return typeof digest === "string" && (digest.startsWith("NEXT_REDIRECT") || digest.startsWith("NEXT_HTTP_ERROR_FALLBACK") || digest === "NEXT_NOT_FOUND");
}

/** The JSON API's one error shape. */
export function errorResponse(code: ErrorCode, message: string, fields?: FieldErrors, headers?: HeadersInit): Response {
  return Response.json({ error: { code, message, ...(fields ? { fields } : {}) } }, { status: STATUS_FOR_CODE[code], headers });
}

export type RouteContext<P> = Context & { params: P; request: Request };

type InputSource = "json" | "query" | "none" | "raw";

/** Route handlers that change data accept only same-origin browser requests (CSRF). */
export function isCrossOrigin(request: Request): boolean {
  const origin = request.headers.get("origin");
  if (!origin) return false; // non-browser clients (curl, scripts) send none
  const host = request.headers.get("x-forwarded-host") ?? request.headers.get("host");
  try {
    return new URL(origin).host !== host;
  } catch {
    return true;
  }
}

/**
 * A browser request sent from another site (Fetch Metadata `Sec-Fetch-Site: cross-site` or
 * `same-site`): a link or form elsewhere, riding on the person's cookie. Requests typed or
 * bookmarked (`none`), from Beadline's own pages (`same-origin`) and from scripts and other
 * non-browser clients (no header) are not.
 * source: W3C Fetch Metadata Request Headers §2.4 (Sec-Fetch-Site); OWASP Cross-Site Request
 * Forgery Prevention Cheat Sheet, "Fetch Metadata headers".
 */
export function isFromAnotherSite(request: Request): boolean {
  const site = request.headers.get("sec-fetch-site");
  return site === "cross-site" || site === "same-site";
}

/** What a malformed path parameter answers: 404 by default (the address names nothing), or 400/422 where a route's contract says so. */
type BadParams = "not-found" | "bad-request" | "invalid";

/** The path params as Next hands them over (`[id]` → `{ id: "12" }`). */
type RawParams = Record<string, string | string[] | undefined>;

export type RouteSpec<S extends ZodType, PS extends ZodType> = {
  permission: Audience;
  /** The input's schema: the JSON body (`json`) or the query string (`query`). */
  schema?: S;
  input?: InputSource;
  /** The path params' schema (e.g. `idParams(...)`), parsed before the input. */
  params?: PS;
  badParams?: BadParams;
  /** The input's field labels, to name failing fields in the message. */
  labels?: Readonly<Record<string, string>>;
  /** A JSON body's limit in bytes (default BODY_LIMITS.json); larger answers 413 without being read further. */
  maxBodyBytes?: number;
  /**
   * A GET that records something (an export is audited): refused with 403 when a browser sends
   * it from another site, so a link elsewhere cannot make someone's browser record a download
   * they never asked for. Beadline's own screens, typed addresses and scripts are served.
   */
  recordsOnGet?: boolean;
};

/**
 * Wraps a route handler. Path params are parsed by `spec.params`; input comes from the JSON
 * body (`json`), the query string (`query`), or is left to the handler (`raw`, e.g.
 * uploads; `none`).
 */
export function defineRoute<S extends ZodType = ZodType<unknown>, PS extends ZodType = ZodType<RawParams>>(
  spec: RouteSpec<S, PS>,
  impl: (input: z.output<S>, ctx: RouteContext<z.output<PS>>) => Promise<Response>,
): (request: Request, routeCtx: { params: Promise<RawParams> }) => Promise<Response> {
  const source: InputSource = spec.input ?? (spec.schema ? "json" : "none");
  return async (request, routeCtx) => {
    const requestId = safeRequestId(request.headers.get("x-request-id"));
    const started = Date.now();
    const response = await runRoute(spec, source, impl, request, routeCtx, requestId);
    requestLogger(requestId).info({ kind: "route", method: request.method, path: new URL(request.url).pathname, status: response.status, ms: Date.now() - started }, "request");
    return response;
  };
}

async function runRoute<S extends ZodType, PS extends ZodType>(
  spec: RouteSpec<S, PS>,
  source: InputSource,
  impl: (input: z.output<S>, ctx: RouteContext<z.output<PS>>) => Promise<Response>,
  request: Request,
  routeCtx: { params: Promise<RawParams> } | undefined,
  requestId: string,
): Promise<Response> {
  const idHeader = { "x-request-id": requestId };
  try {
    if (request.method !== "GET" && request.method !== "HEAD" && isCrossOrigin(request)) {
      return errorResponse("forbidden", "Cross-site request refused.", undefined, idHeader);
    }
    if (spec.recordsOnGet && isFromAnotherSite(request)) {
      return errorResponse("forbidden", "This download starts from Beadline's own screens: open it there.", undefined, idHeader);
    }
    const user = await userFromSealedCookie(cookieFromHeader(request.headers.get("cookie")));
    if (!user) return errorResponse("unauthenticated", "Sign in first.", undefined, idHeader);
    if (!allows(user, spec.permission)) return errorResponse("forbidden", "Your role does not allow this.", undefined, idHeader);
    const rawParams: RawParams = (await routeCtx?.params) ?? {};
    let params = rawParams as z.output<PS>;
    if (spec.params) {
      const parsed = spec.params.safeParse(rawParams);
      if (!parsed.success) {
        const fields = fieldErrorsFromIssues(parsed.error.issues);
        const code = spec.badParams ?? "not-found";
        // A 404 says only that nothing is there; 400/422 name the bad segment like any input.
        if (code === "not-found") return errorResponse(code, parsed.error.issues[0]?.message ?? "Not found.", undefined, idHeader);
        return errorResponse(code, describeFieldErrors(fields), fields, idHeader);
      }
      params = parsed.data;
    }
    let raw: unknown = undefined;
    if (source === "json") {
      // Counted while it arrives: 413 the moment it passes the limit, 400 when it is not JSON.
      raw = await readJsonLimited(request, { max: spec.maxBodyBytes ?? BODY_LIMITS.json });
    } else if (source === "query") {
      raw = Object.fromEntries(new URL(request.url).searchParams.entries());
    }
    let input = raw as z.output<S>;
    if (spec.schema && source !== "raw" && source !== "none") {
      const parsed = spec.schema.safeParse(raw);
      if (!parsed.success) {
        const fields = fieldErrorsFromIssues(parsed.error.issues);
        return errorResponse("invalid", describeFieldErrors(fields, spec.labels), fields, idHeader);
      }
      input = parsed.data;
    }
    const response = await impl(input, { user, requestId, params, request });
    try {
      response.headers.set("x-request-id", requestId);
    } catch {
      /* immutable headers (e.g. Response.redirect): the id is in the logs only */
    }
    return response;
  } catch (error) {
    if (isClientAbort(error, request)) {
      // The caller hung up while sending (Node's "aborted"): not a database problem; nobody reads this answer.
      requestLogger(requestId).info({ kind: "route", method: request.method }, "client closed the request");
      return errorResponse("bad-request", "The request was cancelled by the client.", undefined, idHeader);
    }
    const f = failureFromError(error, requestId);
    const headers: Record<string, string> = { ...idHeader };
    if (f.code === "unavailable") headers["retry-after"] = "5";
    // An oversized body is not read to its end: close the connection rather than drain it.
    if (f.code === "too-large") headers.connection = "close";
    return errorResponse(f.code, f.message, f.fields, headers);
  }
}

/** The client disconnected mid-request (body read aborted), as opposed to a database connection reset. */
function isClientAbort(error: unknown, request: Request): boolean {
  const e = error as { code?: string; message?: string } | null;
  return Boolean(request.signal?.aborted) || (e?.code === "ECONNRESET" && e?.message === "aborted");
}

/** The caller's x-request-id when it is a short token (it reaches logs and the audit log), else a new one. */
function safeRequestId(value: string | null): string {
  return value && /^[A-Za-z0-9._:-]{8,64}$/.test(value) ? value : randomUUID();
}
