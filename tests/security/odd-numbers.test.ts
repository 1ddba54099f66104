// Numbers at the edges: every GET route handler is called with every query parameter the app
// reads set, one at a time, to a number no field accepts as it is (400 nines, 1e309, -0, NaN,
// hex, empty, huge, a fraction, a stray "%"), and every [id] route with such ids. None may
// answer 500: a value that reached SQL or the domain as Infinity did (the attack run found
// four). A 422 names the field. The pages get the same walk through a real `next start` in
// tests/e2e/odd-numbers.spec.ts.
// source: OWASP Input Validation Cheat Sheet (syntactic and semantic validation: type, range)
// and IEEE 754 (1e309 and 400 nines overflow a double to Infinity; -0 is a distinct value).
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import type { Role } from "@/domain/roles";
import { captureLogs } from "@/app/_lib/log";
import { resetDatabase, seedDemo } from "../support/db";
import { cookieHeaderFor } from "../support/session";
import { makeUser } from "../support/users";
import { discover, type Discovered } from "./discover";
import { ROUTES, concretePath, paramNames, rolesFor, routeKey } from "./routes";

/** The values the attack run and its follow-up used, plus neighbours. */
export const ODD_NUMBERS = ["9".repeat(400), "1e309", "-1e309", "-0", "NaN", "0x1F", "", "99999999999999999999", "4294967296", "1.5", "%"];

/** Every query parameter a route or page of the app reads (schemas of domain/ and the pages). */
export const QUERY_NAMES = [
  "jobId", "machineId", "coil", "outsideDiameterMm", "sdr", "dragPressureMpa", "clientId", "mine", "limit", "before",
  "code", "status", "q", "job", "fuser", "machine", "finding", "from", "to", "lot", "outcome", "review", "after", "count",
  "sort", "dir", "format", "stock", "dpi", "manufacturer", "weeks", "joint", "ids", "kind", "skip", "sheet",
];

/** A valid base query per route, so the odd value is the only thing wrong (labels as SVG: PNG rendering is slow). */
const BASE: Record<string, Record<string, string>> = {
  "GET /api/v1/fusion-plan": { jobId: "1", machineId: "1", outsideDiameterMm: "60.3", sdr: "11" },
  "GET /api/v1/labels/coils/[id]": { format: "svg" },
  "GET /api/v1/labels/joints/[id]": { format: "svg" },
};

/** The text of a module and of the modules it imports from the app ("@/…"), one level deep. */
function sourceWithImports(file: string): string {
  const text = readFileSync(file, "utf8");
  const imported = [...text.matchAll(/from "@\/([^"]+)"/g)].map((m) => m[1]).flatMap((spec) => [`${spec}.ts`, `${spec}.tsx`, `${spec}/index.ts`].map((f) => path.join(process.cwd(), f))).filter((f) => existsSync(f));
  return [text, ...imported.map((f) => readFileSync(f, "utf8"))].join("\n");
}

/** The query names a route handler may read: those its source or its imported schemas mention. */
function namesReadBy(file: string): string[] {
  const text = sourceWithImports(file);
  return QUERY_NAMES.filter((name) => new RegExp(`\\b${name}\\b`).test(text));
}

describe("odd numbers in query strings and path ids", () => {
  let found: Discovered;
  const people = new Map<Role, { id: number }>();
  const logs = captureLogs("error");
  let sent = 0;

  beforeAll(async () => {
    found = await discover();
    await resetDatabase();
    await seedDemo();
    for (const role of ["fuser", "inspector", "clerk", "admin"] as Role[]) people.set(role, await makeUser({ roles: [role] }));
  }, 120_000);

  async function get(entry: (typeof ROUTES)[number], query: Record<string, string>, id = "1"): Promise<{ status: number; body: unknown }> {
    const route = found.routes.get(routeKey(entry))!;
    const who = entry.audience === "public" || entry.audience === "signed-in" ? people.get("admin")! : people.get(rolesFor(entry.audience)[0] as Role)!;
    const url = new URL(concretePath(entry.path, encodeURIComponent(id)), "http://127.0.0.1:3000");
    for (const [k, v] of Object.entries(query)) url.searchParams.set(k, v);
    const params = Object.fromEntries(paramNames(entry.path).map((n) => [n, id]));
    const res = await route.handler(new Request(url, { headers: { host: "127.0.0.1:3000", ...(await cookieHeaderFor(who)) } }), { params: Promise.resolve(params) });
    sent += 1;
    const type = res.headers.get("content-type") ?? "";
    const body = type.includes("json") ? await res.json() : (await res.arrayBuffer(), null);
    return { status: res.status, body };
  }

  const getRoutes = ROUTES.filter((e) => e.method === "GET");

  it.each(getRoutes.map((e) => [routeKey(e), e] as const))("%s: no 500 for any odd number in any query parameter or path id", async (key, entry) => {
    const problems: string[] = [];
    const names = namesReadBy(found.routes.get(key)!.file);
    for (const name of names) {
      // Two at a time: the database pool and the two cores are shared with the other tests.
      for (let i = 0; i < ODD_NUMBERS.length; i += 2) {
        await Promise.all(
          ODD_NUMBERS.slice(i, i + 2).map(async (value) => {
            const answer = await get(entry, { ...(BASE[key] ?? entry.query ?? {}), [name]: value });
            if (answer.status >= 500) problems.push(`?${name}=${value.slice(0, 20)} → ${answer.status} ${JSON.stringify(answer.body)?.slice(0, 120)}`);
          }),
        );
      }
    }
    if (paramNames(entry.path).length) {
      for (const value of ODD_NUMBERS) {
        const answer = await get(entry, entry.query ?? {}, value);
        if (answer.status >= 500) problems.push(`id ${value.slice(0, 20)} → ${answer.status}`);
        else expect([400, 404, 422], `id ${value.slice(0, 20)}`).toContain(answer.status);
      }
    }
    expect(problems, `${key}\n${problems.join("\n")}\nserver said: ${JSON.stringify(logs.records().slice(-1))}`).toEqual([]);
  }, 180_000);

  it("GET /api/v1/joints?before=<400 nines> is a 422 naming before (it reached SQL as Infinity)", async () => {
    const entry = getRoutes.find((e) => e.path === "/api/v1/joints")!;
    const answer = await get(entry, { before: "9".repeat(400) });
    expect(answer.status).toBe(422);
    expect(Object.keys((answer.body as { error: { fields: object } }).error.fields)).toEqual(["before"]);
  });

  it("GET /api/v1/fusion-plan with an OD of 1e308 or 1e309, or a hex SDR, is a 422 naming the field (it reached the domain)", async () => {
    const entry = getRoutes.find((e) => e.path === "/api/v1/fusion-plan")!;
    for (const [name, value] of [["outsideDiameterMm", "1e308"], ["outsideDiameterMm", "1e309"], ["sdr", "0x0B"], ["dragPressureMpa", "1e309"], ["jobId", "1e309"]] as const) {
      const answer = await get(entry, { ...BASE["GET /api/v1/fusion-plan"], [name]: value });
      expect(answer.status, `${name}=${value}`).toBe(422);
      expect(Object.keys((answer.body as { error: { fields: object } }).error.fields), `${name}=${value}`).toContain(name);
    }
  });

  it("sent every request", () => {
    expect(sent).toBeGreaterThanOrEqual(getRoutes.length * ODD_NUMBERS.length);
  });

  it("finds the query names a route reads (the walk is not empty)", () => {
    expect(namesReadBy(found.routes.get("GET /api/v1/joints")!.file)).toEqual(expect.arrayContaining(["jobId", "limit", "before"]));
    expect(namesReadBy(found.routes.get("GET /api/v1/fusion-plan")!.file)).toEqual(expect.arrayContaining(["outsideDiameterMm", "sdr", "dragPressureMpa"]));
  });
});
