// Structured logs: a request id on every line written while handling a request, and no
// password, cookie, password hash or session secret in any line — tested on the real
// guards and sign-in paths with the output captured as it would reach stdout.
// source: OWASP Logging Cheat Sheet ("data to exclude": passwords, session identifiers,
// access tokens, encryption keys) — and common practice for request correlation ids.
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { z } from "zod";
import { signInAction } from "@/app/(signed-out)/sign-in/actions";
import { setUnitSystemAction } from "@/app/(signed-in)/actions";
import { DELETE as sessionDelete, GET as sessionGet, POST as sessionPost } from "@/app/api/v1/session/route";
import { defineRoute } from "@/app/_lib/guard";
import { captureLogs, logger, requestLogger, scrubLogLine } from "@/app/_lib/log";
import { SESSION_COOKIE } from "@/app/_lib/session";
import { ownerDb, resetDatabase } from "../support/db";
import { actAs, requestAs } from "../support/session";
import { makeUser, TEST_PASSWORD } from "../support/users";

const ctx = { params: Promise.resolve({}) };

function secretsOfThisProcess(): string[] {
  const list = [process.env.SESSION_SECRET!];
  for (const name of ["DATABASE_URL", "MIGRATION_DATABASE_URL"]) {
    const url = process.env[name];
    if (url) list.push(decodeURIComponent(new URL(url).password));
  }
  return list.filter((s) => s && s.length >= 6);
}

function expectClean(lines: string[], extra: string[]): void {
  const forbidden = [...secretsOfThisProcess(), ...extra, "Fe26.2*"];
  for (const line of lines) {
    for (const secret of forbidden) expect(line.includes(secret), `a log line contains a secret (${secret.slice(0, 6)}…): ${line.slice(0, 200)}`).toBe(false);
    expect(line).not.toMatch(/\$2[aby]\$\d\d\$/); // bcrypt hashes
  }
}

describe("structured logs", () => {
  let capture: ReturnType<typeof captureLogs>;
  beforeEach(async () => {
    await resetDatabase();
    capture = captureLogs("debug");
  });
  afterEach(() => capture.stop());

  it("every request line carries a request id, and ids differ between requests", async () => {
    const u = await makeUser({ roles: ["clerk"] });
    const request = await requestAs(u, "/api/v1/session");
    await sessionGet(request.clone(), ctx);
    await sessionGet(request.clone(), ctx);
    await sessionGet(await requestAs(null, "/api/v1/session"), ctx);
    const records = capture.records();
    expect(records.length).toBeGreaterThanOrEqual(3);
    for (const r of records) {
      expect(typeof r.requestId).toBe("string");
      expect(String(r.requestId)).toMatch(/^[A-Za-z0-9._:-]{8,64}$/);
      expect(typeof r.time).toBe("string"); // ISO time, machine-readable
      expect(typeof r.level).toBe("number");
    }
    const routeLines = records.filter((r) => r.kind === "route");
    expect(routeLines.map((r) => r.status)).toEqual([200, 200, 401]);
    expect(new Set(routeLines.map((r) => r.requestId)).size).toBe(3);
  });

  it("takes a caller's well-formed x-request-id and echoes it, but not a malformed one", async () => {
    const u = await makeUser({ roles: ["clerk"] });
    const good = await sessionGet(await requestAs(u, "/api/v1/session", { headers: { "x-request-id": "trench-7f3a9c21" } }), ctx);
    expect(good.headers.get("x-request-id")).toBe("trench-7f3a9c21");
    const bad = await sessionGet(await requestAs(u, "/api/v1/session", { headers: { "x-request-id": "x\" , \"level\": 60, \"injected\": \"1" } }), ctx);
    expect(bad.headers.get("x-request-id")).toMatch(/^[0-9a-f-]{36}$/);
    expect(capture.records().some((r) => r.requestId === "trench-7f3a9c21")).toBe(true);
    expect(capture.records().some((r) => "injected" in r)).toBe(false);
  });

  it("server actions log one line with the request id, outcome and person, never the input", async () => {
    const u = await makeUser({ roles: ["fuser"] });
    await actAs(u);
    await setUnitSystemAction({ unitSystem: "us" });
    await setUnitSystemAction({ unitSystem: "imperial-ish" } as never);
    const lines = capture.records().filter((r) => r.kind === "action");
    expect(lines).toHaveLength(2);
    expect(lines.map((r) => [r.ok, r.code ?? null, r.userId])).toEqual([
      [true, null, u.id],
      [false, "invalid", u.id],
    ]);
    expect(capture.lines.join("")).not.toContain("imperial-ish");
  });

  it("sign-in, failed sign-in, sign-out and failing requests leave no password, cookie or secret in the logs", async () => {
    const u = await makeUser({ roles: ["admin"] });
    await signInAction({ email: u.email, password: "wrong-but-long-password-1" });
    await signInAction({ email: u.email, password: TEST_PASSWORD });
    const res = await sessionPost(await requestAs(null, "/api/v1/session", { json: { email: u.email, password: TEST_PASSWORD } }));
    const sealed = decodeURIComponent((res.headers.getSetCookie().find((c) => c.startsWith(`${SESSION_COOKIE}=`)) ?? "").split(";")[0].split("=").slice(1).join("="));
    expect(sealed.length).toBeGreaterThan(20);
    const cookie = `${SESSION_COOKIE}=${encodeURIComponent(sealed)}`;

    // A handler that fails with the worst possible error message and a route that validates a password field.
    const leaky = defineRoute({ permission: "signed-in" }, async () => {
      throw new Error(`boom while handling cookie ${cookie} with secret ${process.env.SESSION_SECRET} and ${process.env.DATABASE_URL}`);
    });
    const strict = defineRoute({ permission: "signed-in", schema: z.object({ password: z.string().min(100, { error: "Too short." }) }) }, async () => Response.json({ ok: true }));
    const headers = { cookie, authorization: `Bearer ${sealed}` };
    const r1 = await leaky(new Request("http://127.0.0.1:3000/api/v1/x", { headers }), ctx);
    expect(r1.status).toBe(500);
    expect(await r1.text()).not.toContain(sealed); // nor in the answer
    const r2 = await strict(new Request("http://127.0.0.1:3000/api/v1/x", { method: "POST", headers: { ...headers, "content-type": "application/json" }, body: JSON.stringify({ password: TEST_PASSWORD }) }), ctx);
    expect(r2.status).toBe(422);
    await sessionDelete(new Request("http://127.0.0.1:3000/api/v1/session", { method: "DELETE", headers: { cookie, origin: "https://evil.example" } }), ctx);
    await sessionDelete(new Request("http://127.0.0.1:3000/api/v1/session", { method: "DELETE", headers: { cookie } }), ctx);

    // Whatever a developer passes to the logger by mistake.
    const hash = (await ownerDb()("users").where({ id: u.id }).first("password_hash")).password_hash as string;
    requestLogger("req-test-0001").info({ body: { email: u.email, password: TEST_PASSWORD, passwordHash: hash }, headers: { cookie, authorization: "Bearer abc" } }, "careless");
    requestLogger("req-test-0002").info({ deep: { a: { b: { password: TEST_PASSWORD, c: { password_hash: hash } } } } }, "deeper");
    logger.child({ requestId: "req-test-0003" }).warn(`connect failed for ${process.env.MIGRATION_DATABASE_URL}`);

    expect(capture.lines.length).toBeGreaterThanOrEqual(8);
    expectClean(capture.lines, [TEST_PASSWORD, "wrong-but-long-password-1", sealed, hash]);
    expect(capture.records().find((r) => r.msg === "unexpected error")).toBeTruthy();
    expect(capture.lines.join("")).toContain("[redacted]");
  });

  it("scrubLogLine leaves ordinary text alone", () => {
    const line = JSON.stringify({ msg: "joint WO-24117-0042 recorded", requestId: "abc12345", ms: 12 });
    expect(scrubLogLine(line)).toBe(line);
  });
});
