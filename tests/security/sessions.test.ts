// Sessions: cookie flags, a new seal at every sign-in (no fixation), sign-out / deactivation /
// password reset invalidate every earlier cookie (per-person session version), tampered
// cookies are refused, and route handlers that change data refuse cross-origin requests.
// source: OWASP Session Management Cheat Sheet (cookie attributes, renewal at sign-in,
// invalidation at sign-out) and OWASP CSRF Prevention Cheat Sheet (verifying the Origin header).
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { signInAction, signOutAction } from "@/app/(signed-out)/sign-in/actions";
import { DELETE as sessionDelete, GET as sessionGet, POST as sessionPost } from "@/app/api/v1/session/route";
import { isCrossOrigin } from "@/app/_lib/guard";
import { SESSION_COOKIE, sessionOptions } from "@/app/_lib/session";
import { findUserById, updateUserAccess, updateUserPassword } from "@/database/queries/users";
import { ownerDb, resetDatabase } from "../support/db";
import { requestAs } from "../support/session";
import { makeUser, TEST_PASSWORD } from "../support/users";
import { testRequestState } from "../support/request-state";

const ctx = { params: Promise.resolve({}) };

/** The session cookie's Set-Cookie header among an answer's (sign-in also sets the device cookie). */
function sessionSetCookie(res: Response): string | null {
  return res.headers.getSetCookie().find((c) => c.startsWith(`${SESSION_COOKIE}=`)) ?? null;
}

/** The session cookie's value and attributes from a Set-Cookie header. */
function parseSetCookie(header: string | null): { value: string; attrs: string[] } {
  expect(header, "a Set-Cookie header").toBeTruthy();
  const [pair, ...attrs] = header!.split(";").map((s) => s.trim());
  const [name, ...rest] = pair.split("=");
  expect(name).toBe(SESSION_COOKIE);
  return { value: decodeURIComponent(rest.join("=")), attrs: attrs.map((a) => a.toLowerCase()) };
}

async function signInByApi(email: string, extraHeaders: Record<string, string> = {}): Promise<string> {
  const res = await sessionPost(await requestAs(null, "/api/v1/session", { json: { email, password: TEST_PASSWORD }, headers: extraHeaders }));
  expect(res.status).toBe(200);
  return parseSetCookie(sessionSetCookie(res)).value;
}

function withCookie(value: string, init: { method?: string; headers?: Record<string, string> } = {}): Request {
  return new Request("http://127.0.0.1:3000/api/v1/session", { method: init.method ?? "GET", headers: { cookie: `${SESSION_COOKIE}=${encodeURIComponent(value)}`, host: "127.0.0.1:3000", ...(init.headers ?? {}) } });
}

async function statusWith(value: string): Promise<number> {
  return (await sessionGet(withCookie(value), ctx)).status;
}

describe("session cookie flags", () => {
  const saved = { url: process.env.BEADLINE_PUBLIC_URL, env: process.env.NODE_ENV };
  beforeEach(resetDatabase);
  afterEach(() => {
    if (saved.url === undefined) delete process.env.BEADLINE_PUBLIC_URL;
    else process.env.BEADLINE_PUBLIC_URL = saved.url;
  });

  it("is httpOnly, SameSite=Lax, path /, with a lifetime, and Secure when the public address is https", async () => {
    const u = await makeUser({ roles: ["fuser"] });
    process.env.BEADLINE_PUBLIC_URL = "https://beadline.larkmoor-gas.example";
    const secure = await sessionPost(await requestAs(null, "/api/v1/session", { json: { email: u.email, password: TEST_PASSWORD } }));
    const { attrs } = parseSetCookie(sessionSetCookie(secure));
    expect(attrs).toContain("httponly");
    expect(attrs).toContain("samesite=lax");
    expect(attrs).toContain("secure");
    expect(attrs).toContain("path=/");
    expect(attrs.some((a) => a.startsWith("max-age=") && Number(a.slice(8)) > 0 && Number(a.slice(8)) <= 24 * 3600)).toBe(true);
    expect(sessionOptions().cookieOptions?.secure).toBe(true);
  });

  it("is not Secure on a plain-http development address (the browser would drop it)", async () => {
    const u = await makeUser({ roles: ["fuser"] });
    process.env.BEADLINE_PUBLIC_URL = "http://127.0.0.1:3000";
    const res = await sessionPost(await requestAs(null, "/api/v1/session", { json: { email: u.email, password: TEST_PASSWORD } }));
    expect(parseSetCookie(sessionSetCookie(res)).attrs).not.toContain("secure");
    expect(sessionOptions().cookieOptions?.httpOnly).toBe(true);
  });

  it("holds no readable data: the value is an iron seal, not the user id or roles", async () => {
    const u = await makeUser({ roles: ["admin"] });
    const value = await signInByApi(u.email);
    expect(value.startsWith("Fe26.2*")).toBe(true);
    expect(value).not.toContain(u.email);
    expect(value).not.toContain("admin");
  });
});

describe("session fixation", () => {
  beforeEach(async () => {
    await resetDatabase();
    testRequestState.cookies.clear();
  });

  it("the JSON sign-in issues a new seal, different from the cookie the request carried", async () => {
    const u = await makeUser({ roles: ["clerk"] });
    const first = await signInByApi(u.email);
    const second = await signInByApi(u.email, { cookie: `${SESSION_COOKIE}=${encodeURIComponent(first)}` });
    expect(second).not.toBe(first);
    const planted = "Fe26.2*attacker*planted*value";
    const third = await signInByApi(u.email, { cookie: `${SESSION_COOKIE}=${encodeURIComponent(planted)}` });
    expect(third).not.toBe(planted);
    expect(new Set([first, second, third]).size).toBe(3);
  });

  it("the sign-in form issues a new seal even over a valid earlier one", async () => {
    const u = await makeUser({ roles: ["fuser"] });
    expect((await signInAction({ email: u.email, password: TEST_PASSWORD })).ok).toBe(true);
    const before = testRequestState.cookies.get(SESSION_COOKIE)!;
    expect((await signInAction({ email: u.email, password: TEST_PASSWORD })).ok).toBe(true);
    const after = testRequestState.cookies.get(SESSION_COOKIE)!;
    expect(after).toBeTruthy();
    expect(after).not.toBe(before);
  });
});

describe("invalidation", () => {
  beforeEach(async () => {
    await resetDatabase();
    testRequestState.cookies.clear();
  });

  it("signing out through the API refuses that cookie and every other cookie of the person afterwards", async () => {
    const u = await makeUser({ roles: ["inspector"] });
    const phone = await signInByApi(u.email);
    const office = await signInByApi(u.email);
    expect(await statusWith(phone)).toBe(200);
    expect(await statusWith(office)).toBe(200);
    const out = await sessionDelete(withCookie(phone, { method: "DELETE" }), ctx);
    expect(out.status).toBe(204);
    expect(out.headers.get("set-cookie")).toMatch(/Max-Age=0/i);
    expect(await statusWith(phone)).toBe(401); // a copied cookie replayed after sign-out
    expect(await statusWith(office)).toBe(401);
    expect(await ownerDb()("audit_log").where({ action: "sign-out", entity_id: String(u.id) }).count({ n: "*" }).first()).toMatchObject({ n: 1 });
  });

  it("signing out through the form (server action) bumps the session version too", async () => {
    const u = await makeUser({ roles: ["fuser"] });
    expect((await signInAction({ email: u.email, password: TEST_PASSWORD })).ok).toBe(true);
    const sealed = testRequestState.cookies.get(SESSION_COOKIE)!;
    expect(await statusWith(sealed)).toBe(200);
    const before = (await findUserById({ id: u.id }))!.sessionVersion;
    await expect(signOutAction()).rejects.toMatchObject({ digest: expect.stringMatching(/^NEXT_REDIRECT/) });
    expect((await findUserById({ id: u.id }))!.sessionVersion).toBe(before + 1);
    expect(await statusWith(sealed)).toBe(401);
  });

  it("a revoked cookie cannot sign out a newer session, through the form or the API", async () => {
    const u = await makeUser({ roles: ["fuser"] });
    // Session 1 through the form, then signed out: its cookie is revoked (an older session version).
    expect((await signInAction({ email: u.email, password: TEST_PASSWORD })).ok).toBe(true);
    const revoked = testRequestState.cookies.get(SESSION_COOKIE)!;
    await expect(signOutAction()).rejects.toMatchObject({ digest: expect.stringMatching(/^NEXT_REDIRECT/) });
    // Session 2, the person working on.
    const current = await signInByApi(u.email);
    const version = (await findUserById({ id: u.id }))!.sessionVersion;
    // The revoked cookie replayed at the form's sign-out …
    testRequestState.cookies.set(SESSION_COOKIE, revoked);
    await expect(signOutAction()).rejects.toMatchObject({ digest: expect.stringMatching(/^NEXT_REDIRECT/) });
    // … and at the API's.
    expect((await sessionDelete(withCookie(revoked, { method: "DELETE" }), ctx)).status).toBe(401);
    expect((await findUserById({ id: u.id }))!.sessionVersion).toBe(version);
    expect(await statusWith(current)).toBe(200);
    expect(await ownerDb()("audit_log").where({ action: "sign-out", entity_id: String(u.id) }).count({ n: "*" }).first()).toMatchObject({ n: 1 });
  });

  it("deactivation refuses old cookies, and reactivation does not bring them back", async () => {
    const u = await makeUser({ roles: ["clerk"] });
    const sealed = await signInByApi(u.email);
    const rec = (await findUserById({ id: u.id }))!;
    expect(await updateUserAccess({ id: u.id, version: rec.version, roles: ["clerk"], isActive: false })).toBe(true);
    expect(await statusWith(sealed)).toBe(401);
    expect(await updateUserAccess({ id: u.id, version: rec.version + 1, roles: ["clerk"], isActive: true })).toBe(true);
    expect(await statusWith(sealed)).toBe(401);
    expect(await statusWith(await signInByApi(u.email))).toBe(200);
  });

  it("a password reset refuses cookies issued before it", async () => {
    const u = await makeUser({ roles: ["admin"] });
    const sealed = await signInByApi(u.email);
    const current = (await ownerDb()("users").where({ id: u.id }).first("password_hash")).password_hash as string;
    await updateUserPassword({ id: u.id, passwordHash: current });
    expect(await statusWith(sealed)).toBe(401);
  });

  it("refuses a tampered, truncated or foreign-secret seal", async () => {
    const u = await makeUser({ roles: ["admin"] });
    const sealed = await signInByApi(u.email);
    const flipped = sealed.slice(0, 40) + (sealed[40] === "A" ? "B" : "A") + sealed.slice(41);
    expect(await statusWith(flipped)).toBe(401);
    expect(await statusWith(sealed.slice(0, sealed.length - 10))).toBe(401);
    const { sealData } = await import("iron-session");
    const foreign = await sealData({ userId: u.id, sessionVersion: 1 }, { password: "x".repeat(40) });
    expect(await statusWith(foreign)).toBe(401);
  });
});

describe("CSRF on route handlers", () => {
  beforeEach(resetDatabase);

  it("recognises cross-origin browser requests by the Origin header", () => {
    const req = (origin: string | null, host = "127.0.0.1:3000") => new Request("http://127.0.0.1:3000/api/v1/x", { method: "POST", headers: { host, ...(origin ? { origin } : {}) } });
    expect(isCrossOrigin(req("https://evil.example"))).toBe(true);
    expect(isCrossOrigin(req("http://127.0.0.1:3001"))).toBe(true); // another port is another origin
    expect(isCrossOrigin(req("null"))).toBe(true); // sandboxed frames and data: URLs send "null"
    expect(isCrossOrigin(req("http://127.0.0.1:3000"))).toBe(false);
    expect(isCrossOrigin(req(null))).toBe(false); // scripts and curl send no Origin
  });

  it("a cross-origin sign-out is refused with 403 and the session survives", async () => {
    const u = await makeUser({ roles: ["fuser"] });
    const sealed = await signInByApi(u.email);
    const res = await sessionDelete(withCookie(sealed, { method: "DELETE", headers: { origin: "https://evil.example" } }), ctx);
    expect(res.status).toBe(403);
    expect(await res.json()).toMatchObject({ error: { code: "forbidden" } });
    expect(await statusWith(sealed)).toBe(200);
  });

  it("a cross-origin sign-in (login CSRF) is refused with 403 and sets no cookie", async () => {
    const u = await makeUser({ roles: ["fuser"] });
    const res = await sessionPost(await requestAs(null, "/api/v1/session", { json: { email: u.email, password: TEST_PASSWORD }, headers: { origin: "https://evil.example", host: "127.0.0.1:3000" } }));
    expect(res.status).toBe(403);
    expect(res.headers.get("set-cookie")).toBeNull();
  });
});
