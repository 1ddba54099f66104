// Role matrix: every route handler and server action of the app × {signed out, fuser,
// inspector, clerk, admin, deactivated} against the one list in ./routes.ts. Route handlers
// are called directly with a Request carrying a real sealed cookie, actions through the
// mocked request cookies (actAs). Signed out and deactivated → 401, a role outside the
// audience (the roles holding its permission in domain/roles PERMISSIONS) → 403 with the
// one error shape, a role inside it → anything but 401/403 (and
// never 500). Routes and actions are discovered from the file system: one missing from the
// list fails the test. Route handlers that change data also refuse a cross-origin request.
// source: OWASP Authorization Cheat Sheet (deny by default, check on every request) — and
// Beadline's role table (domain/roles).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Role } from "@/domain/roles";
import { captureLogs } from "@/app/_lib/log";
import { resetDatabase, seedDemo } from "../support/db";
import { actAs, cookieHeaderFor } from "../support/session";
import { makeUser } from "../support/users";
import { discover, type Discovered } from "./discover";
import { ACTIONS, ROUTES, SIGN_IN_EMAIL, actionKey, concretePath, paramNames, routeKey, rolesFor, type ActionEntry, type Audience, type RouteEntry } from "./routes";

const IDENTITIES = ["signed out", "fuser", "inspector", "clerk", "admin", "deactivated"] as const;
type Identity = (typeof IDENTITIES)[number];


function expectedFor(audience: Audience, who: Identity): "allowed" | 401 | 403 {
  if (audience === "public") return "allowed";
  if (who === "signed out" || who === "deactivated") return 401;
  if (audience === "signed-in") return "allowed";
  return (rolesFor(audience) as readonly string[]).includes(who) ? "allowed" : 403;
}

type Person = { id: number } | null;

describe("role matrix", () => {
  let found: Discovered;
  const people = new Map<Identity, Person>();
  const table: string[] = [];
  const serverErrors: string[] = [];
  const logs = captureLogs("warn");
  const lastServerError = () => {
    const errors = logs.records().filter((r) => Number(r.level) >= 50);
    const err = errors[errors.length - 1]?.err as { message?: string } | string | undefined;
    return typeof err === "string" ? err : (err?.message ?? "(no error logged)");
  };

  beforeAll(async () => {
    found = await discover();
    await resetDatabase();
    await seedDemo();
    people.set("signed out", null);
    await makeUser({ roles: ["clerk"], email: SIGN_IN_EMAIL }); // whom the public sign-in entries sign in
    for (const role of ["fuser", "inspector", "clerk", "admin"] as Role[]) people.set(role, await makeUser({ roles: [role] }));
    // A deactivated person holding every role: nothing at all may open for them.
    people.set("deactivated", await makeUser({ roles: ["fuser", "inspector", "clerk", "admin"], isActive: false }));
  }, 120_000);

  afterAll(() => {
    logs.stop();
    if (serverErrors.length) console.log(["\nserver errors seen:", ...serverErrors].join("\n"));
    if (table.length) console.log(["\nrole matrix (status per identity: " + IDENTITIES.join(" | ") + ")", ...table].join("\n"));
  });

  it("lists every route handler and server action that exists, and nothing that does not", () => {
    const listedRoutes = new Set(ROUTES.map(routeKey));
    const listedActions = new Set(ACTIONS.map(actionKey));
    expect([...found.routes.keys()].filter((k) => !listedRoutes.has(k)), "route handlers missing from tests/security/routes.ts").toEqual([]);
    expect([...found.actions.keys()].filter((k) => !listedActions.has(k)), "server actions missing from tests/security/routes.ts").toEqual([]);
    expect([...listedRoutes].filter((k) => !found.routes.has(k)), "listed routes that no longer exist").toEqual([]);
    expect([...listedActions].filter((k) => !found.actions.has(k)), "listed actions that no longer exist").toEqual([]);
    expect(new Set(ROUTES.map(routeKey)).size).toBe(ROUTES.length);
  });

  async function callRoute(entry: RouteEntry, who: Identity, headers: Record<string, string> = {}): Promise<{ status: number; body: unknown }> {
    const route = found.routes.get(routeKey(entry));
    if (!route) throw new Error(`no handler for ${routeKey(entry)}`);
    const url = new URL(concretePath(entry.path), "http://127.0.0.1:3000");
    for (const [k, v] of Object.entries(entry.query ?? {})) url.searchParams.set(k, v);
    const hasBody = entry.method !== "GET" && entry.method !== "DELETE";
    const init: RequestInit = {
      method: entry.method,
      headers: { host: "127.0.0.1:3000", ...(await cookieHeaderFor(people.get(who) ?? null)), ...(hasBody ? { "content-type": "application/json" } : {}), ...headers },
      body: hasBody ? JSON.stringify(entry.json ?? {}) : undefined,
    };
    const params = Object.fromEntries(paramNames(entry.path).map((n) => [n, "1"]));
    const res = await route.handler(new Request(url, init), { params: Promise.resolve(params) });
    const type = res.headers.get("content-type") ?? "";
    let body: unknown = null;
    // Read every answer to its end (downloads included): a cancelled stream is another test.
    if (type.includes("json")) body = await res.json().catch(() => null);
    else await res.arrayBuffer();
    if (res.status >= 500) serverErrors.push(`${routeKey(entry)} as ${who}: ${lastServerError()}`);
    return { status: res.status, body };
  }

  async function callAction(entry: ActionEntry, who: Identity): Promise<number> {
    const fn = found.actions.get(actionKey(entry));
    if (!fn) throw new Error(`no action ${actionKey(entry)}`);
    await actAs(people.get(who) ?? null);
    try {
      const result = (await fn(entry.input)) as { ok: boolean; status?: number } | undefined;
      if (result === undefined) return 204;
      if (!result.ok && (result.status ?? 500) >= 500) serverErrors.push(`${actionKey(entry)} as ${who}: ${lastServerError()}`);
      return result.ok ? 200 : (result.status ?? 500);
    } catch (error) {
      const digest = (error as { digest?: string }).digest ?? "";
      if (digest.startsWith("NEXT_REDIRECT")) return 303;
      throw error;
    }
  }

  function check(label: string, audience: Audience, statuses: number[]): void {
    table.push(`${label.padEnd(78)} ${statuses.map((s) => String(s).padStart(3)).join("  ")}`);
    IDENTITIES.forEach((who, i) => {
      const want = expectedFor(audience, who);
      const got = statuses[i];
      if (want === "allowed") {
        expect([401, 403], `${label} as ${who} must be allowed`).not.toContain(got);
        expect(got, `${label} as ${who}: a server error`).toBeLessThan(500);
      } else {
        expect(got, `${label} as ${who}`).toBe(want);
      }
    });
  }

  describe.each(ROUTES.map((e) => [routeKey(e), e] as const))("%s", (label, entry) => {
    it("answers each identity as the list says, in the one error shape", async () => {
      const statuses: number[] = [];
      for (const who of IDENTITIES) {
        const { status, body } = await callRoute(entry, who);
        statuses.push(status);
        if (status === 401 || status === 403) {
          expect(body, `${label} as ${who}: error shape`).toMatchObject({ error: { code: status === 401 ? "unauthenticated" : "forbidden", message: expect.any(String) } });
        }
      }
      check(label, entry.audience, statuses);
    });

    if (entry.method !== "GET") {
      it("refuses a cross-origin request from a browser (CSRF) with 403", async () => {
        const who: Identity = entry.audience === "public" || entry.audience === "signed-in" ? "admin" : (rolesFor(entry.audience)[0] as Identity);
        const { status, body } = await callRoute(entry, who, { origin: "https://evil.example" });
        expect(status).toBe(403);
        expect(body).toMatchObject({ error: { code: "forbidden" } });
      });
    }
  });

  describe.each(ACTIONS.map((e) => [actionKey(e), e] as const))("%s", (label, entry) => {
    it("answers each identity as the list says", async () => {
      const statuses: number[] = [];
      for (const who of IDENTITIES) statuses.push(await callAction(entry, who));
      check(label, entry.audience, statuses);
    });
  });
});
