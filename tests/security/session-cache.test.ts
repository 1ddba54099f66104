// The unsealed session kept per cookie (app/_lib/session.ts) never outlives what the cookie
// itself may do: a kept cookie is still refused on the very next request after its person
// signs out, changes password or is deactivated; a kept cookie whose seal has expired is
// refused; and the number of cookies kept is bounded.
// source: OWASP Session Management Cheat Sheet (a session ends on the server at sign-out and
// cannot be reused after); iron-session documentation (`ttl`: the seal expires after ttl
// seconds, and iron refuses an expired seal, allowing 60 s of clock skew); design rule (a
// cache on the session check keeps no decision longer than the uncached check would).
import { sealData } from "iron-session";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import { DELETE as sessionDelete, GET as sessionGet, POST as sessionPost } from "@/app/api/v1/session/route";
import { SESSION_COOKIE, UNSEALED_MAX, unsealSession, unsealedCookieCount } from "@/app/_lib/session";
import { bumpSessionVersion, findUserById, updateUserAccess } from "@/database/queries/users";
import { resetDatabase } from "../support/db";
import { requestAs } from "../support/session";
import { makeUser, TEST_PASSWORD } from "../support/users";

const ctx = { params: Promise.resolve({}) };

function withCookie(value: string, method = "GET"): Request {
  return new Request("http://127.0.0.1:3000/api/v1/session", { method, headers: { cookie: `${SESSION_COOKIE}=${encodeURIComponent(value)}`, host: "127.0.0.1:3000" } });
}

async function statusWith(value: string): Promise<number> {
  return (await sessionGet(withCookie(value), ctx)).status;
}

async function signInByApi(email: string): Promise<string> {
  const res = await sessionPost(await requestAs(null, "/api/v1/session", { json: { email, password: TEST_PASSWORD } }));
  expect(res.status).toBe(200);
  const header = res.headers.getSetCookie().find((c) => c.startsWith(`${SESSION_COOKIE}=`))!;
  return decodeURIComponent(header.split(";")[0]!.slice(SESSION_COOKIE.length + 1));
}

/** A seal like the sign-in's, for `user`, expiring `ttlS` seconds from now. */
async function sealFor(user: { id: number }, ttlS: number): Promise<string> {
  const { sessionVersion } = (await findUserById({ id: user.id }))!;
  return sealData({ userId: user.id, sessionVersion, issuedAt: Date.now() }, { password: process.env.SESSION_SECRET!, ttl: ttlS });
}

describe("the unsealed session kept per cookie", () => {
  beforeEach(resetDatabase);
  afterEach(() => {
    vi.useRealTimers();
  });

  it("is kept after the first request and used for the next (no new entry)", async () => {
    const u = await makeUser({ roles: ["clerk"] });
    const sealed = await signInByApi(u.email);
    const before = unsealedCookieCount();
    expect(await statusWith(sealed)).toBe(200);
    const kept = unsealedCookieCount();
    expect(kept).toBe(Math.min(before + 1, UNSEALED_MAX));
    expect(await statusWith(sealed)).toBe(200);
    expect(unsealedCookieCount()).toBe(kept);
  });

  it("a kept cookie is refused on the next request after sign-out", async () => {
    const u = await makeUser({ roles: ["inspector"] });
    const sealed = await signInByApi(u.email);
    expect(await statusWith(sealed)).toBe(200); // now kept
    expect((await sessionDelete(withCookie(sealed, "DELETE"), ctx)).status).toBe(204);
    expect(await statusWith(sealed)).toBe(401);
  });

  it("a kept cookie is refused at once after a session version bump (password change) or deactivation", async () => {
    const a = await makeUser({ roles: ["fuser"] });
    const b = await makeUser({ roles: ["clerk"] });
    const sealedA = await signInByApi(a.email);
    const sealedB = await signInByApi(b.email);
    expect(await statusWith(sealedA)).toBe(200);
    expect(await statusWith(sealedB)).toBe(200);
    await bumpSessionVersion({ id: a.id });
    expect(await statusWith(sealedA)).toBe(401);
    const rec = (await findUserById({ id: b.id }))!;
    expect(await updateUserAccess({ id: b.id, version: rec.version, roles: ["clerk"], isActive: false })).toBe(true);
    expect(await statusWith(sealedB)).toBe(401);
  });

  it("a kept cookie is refused once its seal has expired; a longer seal kept alongside is still accepted", async () => {
    const u = await makeUser({ roles: ["clerk"] });
    const short = await sealFor(u, 30);
    const long = await sealFor(u, 12 * 60 * 60);
    expect(await statusWith(short)).toBe(200);
    expect(await statusWith(long)).toBe(200);
    // Two minutes on: past the short seal's expiry and iron's 60 s allowance for clock skew.
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(Date.now() + 2 * 60_000);
    expect(await statusWith(short)).toBe(401);
    expect(await statusWith(long)).toBe(200);
  });

  it("a seal that expired before it was ever seen is refused", async () => {
    const u = await makeUser({ roles: ["clerk"] });
    vi.useFakeTimers({ toFake: ["Date"] });
    vi.setSystemTime(Date.now() - 3 * 60 * 60_000);
    const old = await sealFor(u, 60 * 60); // sealed three hours ago, for one hour
    vi.useRealTimers();
    expect(await statusWith(old)).toBe(401);
  });

  it("keeps at most UNSEALED_MAX cookies, and a cookie pushed out is unsealed again when it comes back", async () => {
    const u = await makeUser({ roles: ["clerk"] });
    const { sessionVersion } = (await findUserById({ id: u.id }))!;
    const first = await sealFor(u, 600);
    expect(await unsealSession(first)).toMatchObject({ userId: u.id, sessionVersion });
    for (let i = 0; i < UNSEALED_MAX + 50; i += 1) {
      const sealed = await sealData({ userId: u.id, sessionVersion, issuedAt: i }, { password: process.env.SESSION_SECRET!, ttl: 600 });
      expect(await unsealSession(sealed)).not.toBeNull();
    }
    expect(unsealedCookieCount()).toBe(UNSEALED_MAX);
    expect(await statusWith(first)).toBe(200);
  });
});
