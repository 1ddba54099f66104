// The one list of every route handler (method + path) and every server action of the app,
// with who may call it. tests/security/role-matrix.test.ts discovers app/**/route.ts and the
// exports of app/**/actions.ts from the filesystem and fails when one is missing here, so a
// new route or action cannot ship without saying who may use it. The fuzz test uses the same
// list for its write routes.
//
// audience: "public" (anyone, signed out included), "signed-in" (any active person), or the
// roles of which any one suffices. Expected answers: signed out and deactivated → 401; a
// signed-in person without the role → 403; a person with the role → anything but 401/403.
import type { Role } from "@/domain/roles";
import { TEST_PASSWORD } from "../support/users";

/** The account the public sign-in entries use (the matrix test creates it). */
export const SIGN_IN_EMAIL = "matrix-sign-in@test.example";
const SIGN_IN = { email: SIGN_IN_EMAIL, password: TEST_PASSWORD };

export type Audience = "public" | "signed-in" | readonly Role[];
export type Method = "GET" | "POST" | "PUT" | "PATCH" | "DELETE";

export type RouteEntry = {
  kind: "route";
  method: Method;
  /** The route's path as the file system spells it (route groups removed), e.g. /api/v1/joints/[id]. */
  path: string;
  audience: Audience;
  /** Body or query the allowed roles send (minimal; a 4xx other than 401/403 is a fine answer). */
  json?: unknown;
  query?: Record<string, string>;
  /** How the handler reads its input: drives the fuzz test (json body, query string, multipart/raw, none). */
  input: "json" | "query" | "raw" | "none";
};

export type ActionEntry = {
  kind: "action";
  /** app-relative file, e.g. app/(signed-in)/trench/actions.ts */
  file: string;
  name: string;
  audience: Audience;
  input?: unknown;
  /** Actions that take no input (sign-out) or change nothing are not fuzzed. */
  writes: boolean;
};

export type Entry = RouteEntry | ActionEntry;

const OFFICE: Role[] = ["clerk", "inspector", "admin"];
const r = (method: Method, path: string, audience: Audience, input: RouteEntry["input"], extra: Partial<RouteEntry> = {}): RouteEntry => ({ kind: "route", method, path, audience, input, ...extra });
const a = (file: string, name: string, audience: Audience, writes = true, input: unknown = {}): ActionEntry => ({ kind: "action", file, name, audience, writes, input });

export const ROUTES: readonly RouteEntry[] = [
  r("POST", "/api/v1/session", "public", "json", { json: SIGN_IN }),
  r("GET", "/api/v1/session", "signed-in", "none"),
  r("DELETE", "/api/v1/session", "signed-in", "none"),

  r("POST", "/api/v1/joints", ["fuser"], "json", { json: {} }),
  r("GET", "/api/v1/joints", "signed-in", "query", { query: { limit: "5" } }),
  r("GET", "/api/v1/joints/[id]", "signed-in", "none"),
  r("GET", "/api/v1/fusion-plan", "signed-in", "query", { query: {} }),
  r("POST", "/api/v1/attachments", ["fuser", "inspector", "admin"], "raw"),
  r("GET", "/api/v1/attachments/[id]", "signed-in", "none"),
  r("POST", "/api/v1/traces", ["inspector", "fuser"], "raw"),

  r("GET", "/api/v1/coils", "signed-in", "query", { query: { code: "LV-C0001" } }),
  r("POST", "/api/v1/coils", ["clerk", "admin"], "json", { json: {} }),
  r("GET", "/api/v1/coils/[id]", "signed-in", "none"),
  r("POST", "/api/v1/coils/[id]/status", ["clerk", "admin"], "json", { json: {} }),

  r("GET", "/api/v1/register", OFFICE, "query", { query: { limit: "5" } }),
  r("GET", "/api/v1/exports/register", OFFICE, "query", { query: { format: "csv" } }),
  r("GET", "/api/v1/labels/coils/[id]", ["clerk", "admin"], "query", { query: {} }),
  r("GET", "/api/v1/labels/joints/[id]", ["clerk", "admin", "inspector"], "query", { query: {} }),

  r("GET", "/api/v1/review/queue", ["inspector"], "query", { query: {} }),
  r("GET", "/api/v1/review/joints/[id]", ["inspector"], "none"),
  r("GET", "/api/v1/review/joints/[id]/trace", ["inspector", "fuser"], "none"),
  r("POST", "/api/v1/review/joints/[id]/decision", ["inspector"], "raw", { json: {} }),

  r("GET", "/api/v1/trace/joints/[id]", OFFICE, "none"),
  r("GET", "/api/v1/trace/lot", OFFICE, "query", { query: { lot: "4410021" } }),
  r("GET", "/api/v1/trace/lot/export", OFFICE, "query", { query: { lot: "4410021" } }),

  r("GET", "/crew/evidence/[id]", ["admin"], "none"),
];

const SIGNED_IN = "app/(signed-in)";
export const ACTIONS: readonly ActionEntry[] = [
  a("app/(signed-out)/sign-in/actions.ts", "signInAction", "public", true, SIGN_IN),
  a("app/(signed-out)/sign-in/actions.ts", "signOutAction", "public", false, undefined),
  a(`${SIGNED_IN}/actions.ts`, "setUnitSystemAction", "signed-in"),

  a(`${SIGNED_IN}/trench/actions.ts`, "recordJointAction", ["fuser"]),
  a(`${SIGNED_IN}/trench/actions.ts`, "lookupCoilAction", ["fuser"], false),
  a(`${SIGNED_IN}/trench/actions.ts`, "grantOverrideAction", ["inspector", "admin"]),

  a(`${SIGNED_IN}/review/actions.ts`, "decideJointAction", ["inspector"]),

  a(`${SIGNED_IN}/coils/actions.ts`, "receiveCoilAction", ["clerk", "admin"]),
  a(`${SIGNED_IN}/coils/actions.ts`, "moveCoilAction", ["clerk", "admin"]),
  a(`${SIGNED_IN}/labels/actions.ts`, "markLabelsPrintedAction", ["clerk", "admin"]),

  a(`${SIGNED_IN}/crew/actions.ts`, "addPersonAction", ["admin"]),
  a(`${SIGNED_IN}/crew/actions.ts`, "updatePersonAction", ["admin"]),
  a(`${SIGNED_IN}/crew/actions.ts`, "resetPasswordAction", ["admin"]),
  a(`${SIGNED_IN}/crew/actions.ts`, "recordQualificationAction", ["admin"]),
  a(`${SIGNED_IN}/crew/actions.ts`, "recordQualificationFailureAction", ["admin"]),

  a(`${SIGNED_IN}/equipment/actions.ts`, "createMachineAction", ["admin"]),
  a(`${SIGNED_IN}/equipment/actions.ts`, "updateMachineAction", ["admin"]),
  a(`${SIGNED_IN}/equipment/actions.ts`, "createHeaterAction", ["admin"]),
  a(`${SIGNED_IN}/equipment/actions.ts`, "updateHeaterAction", ["admin"]),
  a(`${SIGNED_IN}/equipment/actions.ts`, "recordHeaterCheckAction", ["admin"]),

  a(`${SIGNED_IN}/jobs/actions.ts`, "createJobAction", ["admin"]),
  a(`${SIGNED_IN}/jobs/actions.ts`, "updateJobAction", ["admin"]),
  a(`${SIGNED_IN}/jobs/actions.ts`, "setJobStatusAction", ["admin"]),

  a(`${SIGNED_IN}/procedures/actions.ts`, "createProcedureAction", ["admin"]),
  a(`${SIGNED_IN}/procedures/actions.ts`, "publishProcedureVersionAction", ["admin"]),
  a(`${SIGNED_IN}/procedures/actions.ts`, "editVersionNotesAction", ["admin"]),

  a(`${SIGNED_IN}/mailbox/actions.ts`, "retryMailAction", ["admin"]),
  a(`${SIGNED_IN}/mailbox/actions.ts`, "setMailPreferenceAction", "signed-in"),
];

export const ENTRIES: readonly Entry[] = [...ROUTES, ...ACTIONS];

export const routeKey = (e: { method: string; path: string }) => `${e.method} ${e.path}`;
export const actionKey = (e: { file: string; name: string }) => `${e.file}#${e.name}`;

/** A concrete URL path for an entry's path pattern ([id] → the given id). */
export function concretePath(pattern: string, id = "1"): string {
  return pattern.replace(/\[\.\.\.[^\]]+\]|\[[^\]]+\]/g, id);
}

/** Dynamic segment names of a path pattern, e.g. /a/[id]/b → ["id"]. */
export function paramNames(pattern: string): string[] {
  return [...pattern.matchAll(/\[(?:\.\.\.)?([^\]]+)\]/g)].map((m) => m[1]);
}
