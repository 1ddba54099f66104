// Bad-input fuzz: thousands of generated malformed requests (wrong types, huge strings,
// negative / NaN / infinite numbers, unicode, missing fields, SQL and script fragments,
// prototype keys, broken JSON and multipart bodies, odd path ids) against every route handler
// that changes data and every server action that writes, as a person allowed to call it.
// Each answer must be a 4xx — never a 500 — in the one error shape (route handlers:
// { error: { code, message, fields? } }; actions: an ActionResult failure) with a message
// naming the failing field, and the database must be unchanged (CHECKSUM TABLE of every table).
// source: OWASP Input Validation Cheat Sheet and OWASP Web Security Testing Guide (fuzzing,
// WSTG-INPV); fast-check runs with a fixed seed, so every run sends the same requests.
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Role } from "@/domain/roles";
import { captureLogs } from "@/app/_lib/log";
import { ownerDb, resetDatabase, seedDemo } from "../support/db";
import { actAs, cookieHeaderFor } from "../support/session";
import { makeUser } from "../support/users";
import { discover, type Discovered } from "./discover";
import { ACTIONS, ROUTES, actionKey, concretePath, paramNames, rolesFor, routeKey, type ActionEntry, type Audience, type RouteEntry } from "./routes";

const SEED = 20261202;
const RUNS_PER_TARGET = 72;

const SQL = ["' OR '1'='1", "1; DROP TABLE joints; --", "\" UNION SELECT password_hash FROM users --", "1' AND SLEEP(5)#", "%' AND 1=0 UNION SELECT NULL,NULL --", "\\'; DELETE FROM audit_log; --"];
const SCRIPT = ["<script>alert(1)</script>", "<img src=x onerror=alert(1)>", "javascript:alert(1)", "{{7*7}}${7*7}", "<svg/onload=alert(1)>", "\"><iframe src=//evil.example>"];
const ODD = ["", " ", "\u0000", "\uFEFF", "\u202Eevil", "../../etc/passwd", "C:\\Windows\\system32", "%00", "null", "undefined", "NaN", "-0", "1e309", "0x1F", "２０２６", "１２", "Ω≈ç√∫", "👷‍♀️🔥", "𝕭𝖊𝖆𝖉", "\r\n\r\n", "2026-13-45", "2026-02-30T25:61:00Z"];

/** Values no sane field accepts as they are (wrong type, out of range, absurd size). */
const malformed: fc.Arbitrary<unknown> = fc.oneof(
  fc.constant(null),
  fc.boolean(),
  fc.constantFrom(NaN, Infinity, -Infinity, -1, -1e308, 1e308, -0.5, 2 ** 53 + 1, -(2 ** 31)),
  fc.double({ noDefaultInfinity: false }),
  fc.integer({ max: -1 }),
  fc.constantFrom(...SQL, ...SCRIPT, ...ODD),
  fc.string({ unit: "grapheme", maxLength: 40 }),
  fc.string({ unit: "binary", maxLength: 40 }),
  fc.constantFrom("x".repeat(5_000), "é".repeat(70_000), "<".repeat(1_000_000)),
  fc.array(fc.oneof(fc.string({ maxLength: 5 }), fc.integer()), { maxLength: 4 }),
  fc.dictionary(fc.constantFrom("__proto__", "constructor", "toString", "id", "$where"), fc.oneof(fc.string({ maxLength: 8 }), fc.constant({ polluted: true })), { maxKeys: 3 }),
  fc.constantFrom([], {}, [[[[[]]]]], { length: -1 }),
);

/** Values whose type is wrong for every scalar field: at least one per payload makes it invalid. */
const wrongType: fc.Arbitrary<unknown> = fc.oneof(fc.constantFrom({}, [], { "": null }, [null], NaN, -Infinity, "<".repeat(300_000)), fc.constantFrom(...SQL, ...SCRIPT));

type Payload = { shape: "fields" | "top" | "text"; value: unknown; text?: string };

function payloads(fields: string[]): fc.Arbitrary<Payload> {
  const known = fields.length ? fields : ["id"];
  const withFields = fc
    .record({
      picks: fc.subarray(known, { minLength: 0 }),
      first: wrongType,
      values: fc.array(malformed, { minLength: known.length, maxLength: known.length }),
      extra: fc.dictionary(fc.constantFrom("__proto__", "constructor", "prototype", "isAdmin", "roles", "fuserId", "userId"), malformed, { maxKeys: 2 }),
    })
    .map(({ picks, first, values, extra }) => {
      const body: Record<string, unknown> = { ...extra };
      // Every listed field gets a malformed value, except those dropped (missing fields).
      known.forEach((f, i) => {
        if (!picks.includes(f)) setPath(body, f, values[i]);
      });
      setPath(body, known[0], first);
      return { shape: "fields" as const, value: body };
    });
  const top = malformed.map((value) => ({ shape: "top" as const, value }));
  const text = fc.constantFrom("{", "}", "{\"a\":", "[1,2", "nul", "\"unterminated", "{'single':1}", "\u0000\u0001", "{\"a\":1}}", "<xml/>", "NaN", "--").map((t) => ({ shape: "text" as const, value: undefined, text: t }));
  return fc.oneof({ weight: 6, arbitrary: withFields }, { weight: 2, arbitrary: top }, { weight: 1, arbitrary: text });
}

/** Sets a.b.0.c style paths (as field errors name them). */
function setPath(target: Record<string, unknown>, dotted: string, value: unknown): void {
  const parts = dotted.split(".").filter((p) => p && p !== "_form" && p !== "_body");
  if (!parts.length) return;
  let node: Record<string, unknown> = target;
  parts.slice(0, -1).forEach((p, i) => {
    if (typeof node[p] !== "object" || node[p] === null) node[p] = /^\d+$/.test(parts[i + 1]) ? [] : {};
    node = node[p] as Record<string, unknown>;
  });
  node[parts[parts.length - 1]] = value;
}

const ODD_IDS = ["-1", "0", "NaN", "1e309", "1.5", "../../etc/passwd", "1 OR 1=1", "%00", "９", "99999999999999999999999", "", "<script>", "1;DROP TABLE joints"];

async function tableChecksums(): Promise<Record<string, string>> {
  const k = ownerDb();
  const [tables] = (await k.raw("SELECT table_name AS t FROM information_schema.tables WHERE table_schema = DATABASE() AND table_type = 'BASE TABLE' ORDER BY table_name")) as [{ t: string }[]];
  const [rows] = (await k.raw(`CHECKSUM TABLE ${tables.map((t) => `\`${t.t}\``).join(", ")}`)) as [{ Table: string; Checksum: string | number }[]];
  return Object.fromEntries(rows.map((r) => [r.Table.split(".").pop()!, String(r.Checksum)]));
}

function callerFor(audience: Audience): Role | "signed out" {
  if (audience === "public") return "signed out";
  if (audience === "signed-in") return "admin";
  return rolesFor(audience)[0];
}

/** The checks every answer must pass; returns a description of the problem or null. */
function problemWithRouteAnswer(status: number, body: unknown): string | null {
  if (status >= 500) return `status ${status}`;
  if (status < 400) return `accepted malformed input with ${status}`;
  const error = (body as { error?: { code?: unknown; message?: unknown; fields?: unknown } } | null)?.error;
  if (!error || typeof error.code !== "string" || typeof error.message !== "string" || !error.message) return `not the error shape: ${JSON.stringify(body)?.slice(0, 200)}`;
  return problemWithFields(error.message, error.fields, status);
}

function problemWithFields(message: string, fields: unknown, status: number): string | null {
  if (status !== 422) return null;
  if (!fields || typeof fields !== "object") return "a 422 without per-field messages";
  const named = Object.keys(fields).filter((k) => !k.startsWith("_"));
  for (const [k, v] of Object.entries(fields)) if (!Array.isArray(v) || !v.length || v.some((m) => typeof m !== "string" || !m)) return `field ${k} has no message`;
  // The summary names the field as the person sees it: by its label, or by repeating the
  // field's own message (which names it in words) — never by an internal name ("beadMm").
  const lower = message.toLowerCase();
  const said = (k: string) => (/^[a-z]+$/.test(k) && lower.includes(k)) || (fields as Record<string, string[]>)[k]!.some((m) => lower.includes(m.replace(/\.$/, "").toLowerCase()));
  if (named.length && !named.some(said)) return `message names no field: ${message.slice(0, 160)} (fields ${named.join(", ")})`;
  const internal = named.filter((k) => /[A-Z_.]/.test(k) && message.includes(k));
  if (internal.length) return `message shows an internal field name (${internal.join(", ")}): ${message.slice(0, 160)}`;
  return null;
}

describe("bad-input fuzz", () => {
  let found: Discovered;
  const people = new Map<string, { id: number } | null>();
  let sent = 0;
  const summary: string[] = [];
  const logs = captureLogs("error");

  beforeAll(async () => {
    found = await discover();
    await resetDatabase();
    await seedDemo();
    people.set("signed out", null);
    for (const role of ["fuser", "inspector", "clerk", "admin"] as Role[]) people.set(role, await makeUser({ roles: [role] }));
  }, 120_000);

  afterAll(() => {
    logs.stop();
    console.log(`\nfuzz: ${sent} malformed requests (seed ${SEED})\n${summary.join("\n")}`);
  });

  const writeRoutes = ROUTES.filter((e) => e.method !== "GET" && e.input !== "none");
  const writeActions = ACTIONS.filter((e) => e.writes);

  it("covers every route handler that changes data and every writing action", () => {
    expect(writeRoutes.length).toBeGreaterThanOrEqual(5);
    expect(writeActions.length).toBeGreaterThanOrEqual(10);
    expect((writeRoutes.length + writeActions.length) * RUNS_PER_TARGET).toBeGreaterThanOrEqual(2000);
  });

  async function sendRoute(entry: RouteEntry, body: BodyInit | undefined, contentType: string | null, id = "1") {
    const route = found.routes.get(routeKey(entry))!;
    const headers: Record<string, string> = { host: "127.0.0.1:3000", ...(await cookieHeaderFor(people.get(callerFor(entry.audience)) ?? null)) };
    if (contentType) headers["content-type"] = contentType;
    const params = Object.fromEntries(paramNames(entry.path).map((n) => [n, id]));
    const res = await route.handler(new Request(new URL(concretePath(entry.path, encodeURIComponent(id)), "http://127.0.0.1:3000"), { method: entry.method, headers, body }), { params: Promise.resolve(params) });
    sent += 1;
    const text = await res.text();
    let json: unknown = null;
    try {
      json = JSON.parse(text);
    } catch {
      json = { notJson: text.slice(0, 200) };
    }
    return { status: res.status, body: json };
  }

  async function probeFields(send: (value: unknown) => Promise<{ fields?: unknown }>): Promise<string[]> {
    const answer = await send({});
    const fields = Object.keys((answer.fields as Record<string, unknown>) ?? {}).filter((k) => !k.startsWith("_"));
    return fields.length ? fields : ["id", "name", "value"];
  }

  function lastServerError(): string {
    const records = logs.records();
    const err = records[records.length - 1]?.err as { message?: string } | string | undefined;
    return typeof err === "string" ? err : (err?.message ?? "(nothing logged)");
  }

  describe.each(writeRoutes.map((e) => [routeKey(e), e] as const))("%s", (label, entry) => {
    it(`answers ${RUNS_PER_TARGET} malformed requests with a 4xx in the error shape and writes nothing`, async () => {
      const before = await tableChecksums();
      const multipart = entry.input === "raw" && !entry.json;
      const fields = multipart ? [] : await probeFields(async (v) => ((await sendRoute(entry, JSON.stringify(v), "application/json")).body as { error?: { fields?: unknown } })?.error ?? {});
      const arb = multipart
        ? fc.record({
            type: fc.constantFrom("multipart/form-data", "multipart/form-data; boundary=", "multipart/form-data; boundary=x", "application/json", "image/svg+xml", "text/html", "application/octet-stream", "", "multipart/form-data; boundary=\"\""),
            body: fc.oneof(fc.uint8Array({ maxLength: 2048 }), fc.constantFrom("--x\r\nContent-Disposition: form-data; name=\"file\"; filename=\"../../a.svg\"\r\nContent-Type: image/svg+xml\r\n\r\n<svg onload=alert(1)/>\r\n--x--\r\n", "--x\r\n\r\n--x--", "", "<html><script>alert(1)</script></html>")),
            id: fc.constantFrom("1", ...ODD_IDS),
          })
        : fc.record({ payload: payloads(fields), id: fc.constantFrom("1", "1", "1", ...ODD_IDS) });
      let problems = 0;
      await fc.assert(
        fc.asyncProperty(arb, async (input) => {
          let answer: { status: number; body: unknown };
          if ("payload" in input) {
            const p = input.payload as Payload;
            answer = await sendRoute(entry, p.shape === "text" ? p.text : JSON.stringify(p.value), "application/json", input.id);
          } else {
            const i = input as { type: string; body: Uint8Array | string; id: string };
            answer = await sendRoute(entry, i.body as BodyInit, i.type || null, i.id);
          }
          const problem = problemWithRouteAnswer(answer.status, answer.body);
          if (problem) problems += 1;
          expect(problem, `${label}: ${problem}${answer.status >= 500 ? ` — server said: ${lastServerError()}` : ""}\ninput: ${JSON.stringify(input).slice(0, 300)}`).toBeNull();
        }),
        { seed: SEED, numRuns: RUNS_PER_TARGET, endOnFailure: true },
      );
      expect(await tableChecksums(), `${label} changed the database`).toEqual(before);
      summary.push(`${label.padEnd(60)} ${RUNS_PER_TARGET} sent, fields probed: ${fields.join(", ").slice(0, 120) || "(multipart)"}${problems ? `, ${problems} problems` : ""}`);
    }, 120_000);
  });

  async function sendAction(entry: ActionEntry, value: unknown): Promise<{ ok: boolean; status?: number; message?: string; fields?: unknown; code?: string }> {
    const fn = found.actions.get(actionKey(entry))!;
    sent += 1;
    return (await fn(value)) as never;
  }

  describe.each(writeActions.map((e) => [actionKey(e), e] as const))("%s", (label, entry) => {
    it(`answers ${RUNS_PER_TARGET} malformed inputs with a failure naming the field and writes nothing`, async () => {
      await actAs(people.get(callerFor(entry.audience)) ?? null);
      const before = await tableChecksums();
      const fields = await probeFields((v) => sendAction(entry, v));
      await fc.assert(
        fc.asyncProperty(payloads(fields), async (p) => {
          const value = p.shape === "text" ? p.text : p.value;
          const result = await sendAction(entry, value);
          let problem: string | null = null;
          if (!result || typeof result !== "object") problem = `not an ActionResult: ${String(result)}`;
          else if (result.ok) problem = "accepted malformed input";
          else if ((result.status ?? 500) >= 500) problem = `status ${result.status} — server said: ${lastServerError()}`;
          else if (typeof result.message !== "string" || !result.message || typeof result.code !== "string") problem = "not the failure shape";
          else problem = problemWithFields(result.message, result.fields, result.status ?? 0);
          expect(problem, `${label}: ${problem}\ninput: ${JSON.stringify(value)?.slice(0, 300)}`).toBeNull();
        }),
        { seed: SEED, numRuns: RUNS_PER_TARGET, endOnFailure: true },
      );
      expect(await tableChecksums(), `${label} changed the database`).toEqual(before);
      summary.push(`${label.padEnd(60)} ${RUNS_PER_TARGET} sent, fields probed: ${fields.join(", ").slice(0, 120)}`);
    }, 120_000);
  });

  it("the answer checks themselves catch a 500, a success, a wrong shape and a message naming no field", () => {
    expect(problemWithRouteAnswer(500, { error: { code: "internal", message: "x" } })).toMatch(/500/);
    expect(problemWithRouteAnswer(201, { joint: {} })).toMatch(/accepted/);
    expect(problemWithRouteAnswer(400, "<html>")).toMatch(/shape/);
    expect(problemWithRouteAnswer(422, { error: { code: "invalid", message: "The input is not valid.", fields: { beadMm: ["Too small."] } } })).toMatch(/names no field/);
    expect(problemWithRouteAnswer(422, { error: { code: "invalid", message: "Check beadMm: Too small.", fields: { beadMm: ["Too small."] } } })).toMatch(/internal field name \(beadMm\)/);
    expect(problemWithRouteAnswer(422, { error: { code: "invalid", message: "Check Bead size: Bead size is too small.", fields: { beadMm: ["Bead size is too small."] } } })).toBeNull();
  });

  it("sent at least 2,000 malformed requests in all", () => {
    expect(sent).toBeGreaterThanOrEqual(2000);
  });
});
