// The one list of every route handler (method + path) and every server action of the app,
// with who may call it. tests/security/role-matrix.test.ts discovers app/**/route.ts and the
// exports of app/**/actions.ts from the filesystem and fails when one is missing here, so a
// new route or action cannot ship without saying who may use it. The fuzz test uses the same
// list for its write routes.
//
// audience: "public" (anyone, signed out included), "signed-in" (any active person), or the
// permission the handler declares; who holds it comes from the PERMISSIONS table of
// domain/roles (tests/domain/permissions.test.ts checks that table against the product's
// role table). Expected answers: signed out and deactivated → 401; a signed-in person
// without the permission → 403; a person with it → anything but 401/403.
import { PERMISSIONS, ROLES, type Permission, type Role } from "@/domain/roles";
import { TEST_PASSWORD } from "../support/users";

/** The account the public sign-in entries use (the matrix test creates it). */
export const SIGN_IN_EMAIL = "matrix-sign-in@test.example";
const SIGN_IN = { email: SIGN_IN_EMAIL, password: TEST_PASSWORD };

export type Audience = "public" | "signed-in" | Permission;

/** The roles that get through an audience ("public" and "signed-in": every role). */
export function rolesFor(audience: Audience): readonly Role[] {
  return audience === "public" || audience === "signed-in" ? ROLES : PERMISSIONS[audience];
}
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

const r = (method: Method, path: string, audience: Audience, input: RouteEntry["input"], extra: Partial<RouteEntry> = {}): RouteEntry => ({ kind: "route", method, path, audience, input, ...extra });
const a = (file: string, name: string, audience: Audience, writes = true, input: unknown = {}): ActionEntry => ({ kind: "action", file, name, audience, writes, input });

export const ROUTES: readonly RouteEntry[] = [
  r("POST", "/api/v1/session", "public", "json", { json: SIGN_IN }),
  r("GET", "/api/v1/session", "signed-in", "none"),
  r("DELETE", "/api/v1/session", "signed-in", "none"),

  r("POST", "/api/v1/joints", "recordJoint", "json", { json: {} }),
  r("GET", "/api/v1/joints", "signed-in", "query", { query: { limit: "5" } }),
  r("GET", "/api/v1/joints/[id]", "signed-in", "none"),
  r("GET", "/api/v1/fusion-plan", "signed-in", "query", { query: {} }),
  r("POST", "/api/v1/attachments", "uploadPhoto", "raw"),
  r("GET", "/api/v1/attachments/[id]", "signed-in", "none"),
  r("POST", "/api/v1/traces", "attachTrace", "raw"),

  r("GET", "/api/v1/coils", "signed-in", "query", { query: { code: "LV-C0001" } }),
  r("POST", "/api/v1/coils", "receiveCoils", "json", { json: {} }),
  r("GET", "/api/v1/coils/[id]", "signed-in", "none"),
  r("POST", "/api/v1/coils/[id]/status", "moveCoils", "json", { json: {} }),

  r("GET", "/api/v1/register", "viewRegister", "query", { query: { limit: "5" } }),
  r("GET", "/api/v1/exports/register", "exportRegister", "query", { query: { format: "csv" } }),
  r("GET", "/api/v1/exports/register/progress", "exportRegister", "query", { query: { id: "1" } }),
  r("GET", "/api/v1/labels/coils/[id]", "printLabels", "query", { query: {} }),
  r("GET", "/api/v1/labels/joints/[id]", "printJointLabels", "query", { query: {} }),

  r("GET", "/api/v1/review/queue", "viewReview", "query", { query: {} }),
  r("GET", "/api/v1/review/joints/[id]", "viewReview", "none"),
  r("GET", "/api/v1/review/joints/[id]/trace", "viewTrace", "none"),
  r("POST", "/api/v1/review/joints/[id]/decision", "decideJoint", "raw", { json: {} }),
  r("POST", "/api/v1/review/batch-accept", "decideJoint", "json", { json: { note: "", joints: [] } }),

  r("GET", "/api/v1/trace/joints/[id]", "traceLots", "none"),
  r("GET", "/api/v1/trace/lot", "traceLots", "query", { query: { lot: "4410021" } }),
  r("GET", "/api/v1/trace/lot/export", "traceLots", "query", { query: { lot: "4410021" } }),
  r("GET", "/api/v1/trace/lot/csv", "traceLots", "query", { query: { lot: "4410021" } }),

  r("GET", "/crew/evidence/[id]", "manageCrew", "none"),
];

const SIGNED_IN = "app/(signed-in)";
export const ACTIONS: readonly ActionEntry[] = [
  a("app/(signed-out)/sign-in/actions.ts", "signInAction", "public", true, SIGN_IN),
  a("app/(signed-out)/sign-in/actions.ts", "signOutAction", "public", false, undefined),
  a(`${SIGNED_IN}/actions.ts`, "setUnitSystemAction", "signed-in"),

  a(`${SIGNED_IN}/trench/actions.ts`, "recordJointAction", "recordJoint"),
  a(`${SIGNED_IN}/trench/actions.ts`, "lookupCoilAction", "recordJoint", false),
  a(`${SIGNED_IN}/trench/actions.ts`, "grantOverrideAction", "grantOverride"),

  a(`${SIGNED_IN}/review/actions.ts`, "decideJointAction", "decideJoint"),
  a(`${SIGNED_IN}/review/actions.ts`, "acceptBatchAction", "decideJoint"),

  a(`${SIGNED_IN}/coils/actions.ts`, "receiveCoilAction", "receiveCoils"),
  a(`${SIGNED_IN}/coils/actions.ts`, "moveCoilAction", "moveCoils"),
  a(`${SIGNED_IN}/labels/actions.ts`, "markLabelsPrintedAction", "printLabels"),

  a(`${SIGNED_IN}/crew/actions.ts`, "addPersonAction", "manageCrew"),
  a(`${SIGNED_IN}/crew/actions.ts`, "updatePersonAction", "manageCrew"),
  a(`${SIGNED_IN}/crew/actions.ts`, "resetPasswordAction", "manageCrew"),
  a(`${SIGNED_IN}/crew/actions.ts`, "recordQualificationAction", "manageCrew"),
  a(`${SIGNED_IN}/crew/actions.ts`, "recordQualificationFailureAction", "manageCrew"),
  a(`${SIGNED_IN}/crew/actions.ts`, "setOrganisationTimeZoneAction", "manageOrganisation"),

  a(`${SIGNED_IN}/equipment/actions.ts`, "createMachineAction", "manageEquipment"),
  a(`${SIGNED_IN}/equipment/actions.ts`, "updateMachineAction", "manageEquipment"),
  a(`${SIGNED_IN}/equipment/actions.ts`, "createHeaterAction", "manageEquipment"),
  a(`${SIGNED_IN}/equipment/actions.ts`, "updateHeaterAction", "manageEquipment"),
  a(`${SIGNED_IN}/equipment/actions.ts`, "recordHeaterCheckAction", "manageEquipment"),

  a(`${SIGNED_IN}/jobs/actions.ts`, "createJobAction", "manageJobs"),
  a(`${SIGNED_IN}/jobs/actions.ts`, "updateJobAction", "manageJobs"),
  a(`${SIGNED_IN}/jobs/actions.ts`, "setJobStatusAction", "manageJobs"),

  a(`${SIGNED_IN}/procedures/actions.ts`, "createProcedureAction", "manageProcedures"),
  a(`${SIGNED_IN}/procedures/actions.ts`, "publishProcedureVersionAction", "manageProcedures"),
  a(`${SIGNED_IN}/procedures/actions.ts`, "editVersionNotesAction", "manageProcedures"),

  a(`${SIGNED_IN}/mailbox/actions.ts`, "retryMailAction", "viewMailbox"),
  a(`${SIGNED_IN}/notifications/actions.ts`, "setMailPreferenceAction", "signed-in"),
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
