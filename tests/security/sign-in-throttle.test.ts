// Sign-in throttling: growing delays instead of a lockout, a per-address limit a client
// cannot step around by writing X-Forwarded-For, and device cookies that keep an account's
// owner able to sign in while someone else hammers the account.
// source: OWASP Authentication Cheat Sheet, "Protect against automated attacks" (lockout
// lets an attacker lock out users; prefer growing delays) and OWASP "Slow Down Online
// Guessing Attacks with Device Cookies"; MDN "X-Forwarded-For" (client-writable header).
// The numbers (5 and 20 free failures, 2 s doubling to 15 min) are common practice.
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { signInAction } from "@/app/(signed-out)/sign-in/actions";
import { POST as sessionPost } from "@/app/api/v1/session/route";
import { authenticate, throttleKey } from "@/app/_lib/auth";
import { PEER_HEADER, stampPeerAddress } from "@/app/_lib/client-address";
import { DEVICE_COOKIE } from "@/app/_lib/device-cookie";
import { recordFailure, startWait, waitLeft } from "@/database/queries/sign-in-attempts";
import { FAILURE_MEMORY_S, FREE_FAILURES, MAX_DELAY_S, delayAfterFailures } from "@/domain/crew/throttle";
import { ownerDb, resetDatabase } from "../support/db";
import { requestAs } from "../support/session";
import { makeUser, TEST_PASSWORD } from "../support/users";
import { testRequestState } from "../support/request-state";

const savedHeaders = { ...testRequestState.headers };

/** The headers a request from socket `peer` carries once the server stamped it. */
function fromSocket(peer: string, forwardedFor?: string): Record<string, string> {
  const h: Record<string, string | string[] | undefined> = {};
  stampPeerAddress(h, peer);
  return { [PEER_HEADER]: h[PEER_HEADER] as string, ...(forwardedFor ? { "x-forwarded-for": forwardedFor } : {}) };
}

async function signInVia(peer: string, forwardedFor: string | undefined, email: string, password: string) {
  testRequestState.headers = fromSocket(peer, forwardedFor);
  return signInAction({ email, password });
}

/** Earlier failures of an address straight into the counter (each real attempt costs a bcrypt compare). */
async function earlierFailures(address: string, n: number): Promise<void> {
  for (let i = 0; i < n; i++) await recordFailure({ key: throttleKey("address", address), memoryS: FAILURE_MEMORY_S });
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe("delays", () => {
  it("are free for the first failures, then double from 2 s and stop growing at 15 min", () => {
    const account = Array.from({ length: 12 }, (_, i) => delayAfterFailures(i + 1, "account"));
    expect(account).toEqual([0, 0, 0, 0, 0, 2, 4, 8, 16, 32, 64, 128]);
    expect(delayAfterFailures(FREE_FAILURES.address, "address")).toBe(0);
    expect(delayAfterFailures(FREE_FAILURES.address + 1, "address")).toBe(2);
    expect(delayAfterFailures(1000, "account")).toBe(MAX_DELAY_S);
    expect(MAX_DELAY_S).toBe(15 * 60);
  });
});

describe("sign-in throttling against the database", () => {
  beforeEach(async () => {
    await resetDatabase();
    testRequestState.cookies.clear();
  });
  afterEach(() => {
    testRequestState.headers = { ...savedHeaders };
    delete process.env.BEADLINE_TRUSTED_PROXIES;
  });

  it("grows the wait with each failure past the free ones, and does not check the password while waiting", async () => {
    const u = await makeUser({ roles: ["fuser"] });
    for (let i = 0; i < FREE_FAILURES.account; i++) {
      await expect(authenticate({ email: u.email, password: `wrong-${i}-password`, address: `198.51.100.${i + 1}` })).rejects.toMatchObject({ code: "unauthenticated" });
    }
    // The sixth failure (from yet another address, so only the account counts) starts a 2 s wait.
    await expect(authenticate({ email: u.email, password: "wrong-6-password", address: "198.51.100.60" })).rejects.toMatchObject({ code: "unauthenticated" });
    const accountKey = (await ownerDb()("sign_in_limits").where("key", "like", "wait:account:%").first("key")) as { key: string };
    const first = await waitLeft({ key: accountKey.key.slice("wait:".length), memoryS: FAILURE_MEMORY_S });
    expect(first).toBeGreaterThan(1000);
    expect(first).toBeLessThanOrEqual(2000);
    // Even the right password is refused, with the time to wait, while the wait runs.
    await expect(authenticate({ email: u.email, password: TEST_PASSWORD, address: "198.51.100.61" })).rejects.toMatchObject({ code: "throttled", message: expect.stringMatching(/Wait [12] seconds/) });
    await sleep(first + 100);
    // The seventh failure: 4 s.
    await expect(authenticate({ email: u.email, password: "wrong-7-password", address: "198.51.100.62" })).rejects.toMatchObject({ code: "unauthenticated" });
    const second = await waitLeft({ key: accountKey.key.slice("wait:".length), memoryS: FAILURE_MEMORY_S });
    expect(second).toBeGreaterThan(3000);
    expect(second).toBeLessThanOrEqual(4000);
    expect(await ownerDb()("audit_log").where({ action: "sign-in-throttled" }).count({ n: "*" }).first()).toMatchObject({ n: 1 });
  });

  it("lets only one of several attempts sent side by side past the free failures be checked", async () => {
    const u = await makeUser({ roles: ["inspector"] });
    for (let i = 0; i < FREE_FAILURES.account; i++) await recordFailure({ key: throttleKey("account", u.email), memoryS: FAILURE_MEMORY_S });
    const results = await Promise.allSettled(
      Array.from({ length: 4 }, (_, i) => authenticate({ email: u.email, password: `burst-${i}-password`, address: `198.51.100.${100 + i}` })),
    );
    const codes = results.map((r) => (r.status === "rejected" ? (r.reason as { code: string }).code : "signed-in")).sort();
    expect(codes).toEqual(["throttled", "throttled", "throttled", "unauthenticated"]);
    // The refused ones took their count back: the next failure after the wait is the seventh.
    const row = await ownerDb()("sign_in_limits").where({ key: `fail:${throttleKey("account", u.email)}` }).first("points");
    expect(row.points).toBe(FREE_FAILURES.account + 1);
  });

  it("keeps counting one socket's failures however X-Forwarded-For is rotated (no trusted proxy)", async () => {
    const target = await makeUser({ roles: ["clerk"] });
    // The socket already failed past its free failures (16 s of wait after the next failure:
    // long enough for a slow machine to see it).
    await earlierFailures("192.0.2.50", FREE_FAILURES.address + 3);
    const first = await signInVia("192.0.2.50", "203.0.113.1", "nobody-0@test.example", "Summer2026!!");
    expect(first.ok).toBe(false);
    if (!first.ok) expect(first.status).toBe(401);
    for (let i = 2; i < 5; i++) {
      // A new account name and a new claimed address each time: only the socket is the same.
      const r = await signInVia("192.0.2.50", `203.0.113.${i}`, `nobody-${i}@test.example`, "Summer2026!!");
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.status).toBe(429);
    }
    const r = await signInVia("192.0.2.50", "203.0.113.200", target.email, TEST_PASSWORD);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.status).toBe(429);
    // Another socket is not affected.
    expect((await signInVia("192.0.2.51", undefined, target.email, TEST_PASSWORD)).ok).toBe(true);
  });

  it("reads X-Forwarded-For from a trusted proxy, so clients behind it are counted apart", async () => {
    process.env.BEADLINE_TRUSTED_PROXIES = "192.0.2.50";
    const target = await makeUser({ roles: ["clerk"] });
    await earlierFailures("203.0.113.1", FREE_FAILURES.address + 3);
    // The proxy's own address waiting does not hold back the clients behind it.
    await startWait({ key: throttleKey("address", "192.0.2.50"), memoryS: FAILURE_MEMORY_S, seconds: 600 });
    for (let i = 2; i < 5; i++) {
      const r = await signInVia("192.0.2.50", `203.0.113.${i}`, `nobody-${i}@test.example`, "Summer2026!!");
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.status).toBe(401);
    }
    // The client that failed too often (203.0.113.1, as the trusted proxy names it) fails once
    // more and then waits; another client behind the same proxy signs in.
    expect((await signInVia("192.0.2.50", "203.0.113.1", "nobody-1@test.example", "Summer2026!!")).ok).toBe(false);
    const r = await signInVia("192.0.2.50", "203.0.113.1", target.email, TEST_PASSWORD);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.status).toBe(429);
    expect((await signInVia("192.0.2.50", "203.0.113.200", target.email, TEST_PASSWORD)).ok).toBe(true);
  });

  it("lets the owner sign in from a device that signed in before while an attacker hammers the account", async () => {
    const owner = await makeUser({ roles: ["admin"] });
    // The owner signed in on this device last week: the browser keeps the device cookie.
    expect((await signInVia("198.51.100.20", undefined, owner.email, TEST_PASSWORD)).ok).toBe(true);
    const device = testRequestState.cookies.get(DEVICE_COOKIE);
    expect(device).toBeTruthy();
    testRequestState.cookies.clear();

    // The attacker, from other addresses and without the cookie, fails again and again.
    for (let i = 0; i < FREE_FAILURES.account + 3; i++) {
      const r = await signInVia(`203.0.113.${i + 1}`, undefined, owner.email, `guess-${i}-password`);
      expect(r.ok).toBe(false);
    }
    // A new client with the right password has to wait: the account is being hammered.
    const stranger = await signInVia("198.51.100.21", undefined, owner.email, TEST_PASSWORD);
    expect(stranger.ok).toBe(false);
    if (!stranger.ok) expect(stranger.status).toBe(429);

    // The owner's device is judged by its own counter: signed in at once.
    testRequestState.cookies.set(DEVICE_COOKIE, device!);
    expect((await signInVia("198.51.100.20", undefined, owner.email, TEST_PASSWORD)).ok).toBe(true);
    // Through the JSON API too.
    const res = await sessionPost(await requestAs(null, "/api/v1/session", { json: { email: owner.email, password: TEST_PASSWORD }, headers: { ...fromSocket("198.51.100.20"), cookie: `${DEVICE_COOKIE}=${device}` } }));
    expect(res.status).toBe(200);
    expect(res.headers.get("set-cookie") ?? "").toMatch(new RegExp(`${DEVICE_COOKIE}=[^;]+; Path=/; Max-Age=\\d+; HttpOnly; SameSite=Lax`));
  });

  it("throttles 40 failed sign-ins from one socket with rotating X-Forwarded-For, with Retry-After, while the owner's known device still signs in", async () => {
    const admin = await makeUser({ roles: ["admin"] });
    // The admin signed in before on a phone behind the same address (one NAT): a known device.
    const first = await sessionPost(await requestAs(null, "/api/v1/session", { json: { email: admin.email, password: TEST_PASSWORD }, headers: fromSocket("192.0.2.77") }));
    expect(first.status).toBe(200);
    const device = new RegExp(`${DEVICE_COOKIE}=([^;]+)`).exec(first.headers.get("set-cookie") ?? "")?.[1];
    expect(device).toBeTruthy();

    const statuses: number[] = [];
    const retryAfter: number[] = [];
    for (let i = 0; i < 40; i++) {
      // Each guess claims another client address; only the socket stays the same.
      const res = await sessionPost(await requestAs(null, "/api/v1/session", { json: { email: admin.email, password: `guess-${i}-password` }, headers: { ...fromSocket("192.0.2.77"), "x-forwarded-for": `203.0.113.${i + 1}` } }));
      statuses.push(res.status);
      if (res.status === 429) retryAfter.push(Number(res.headers.get("retry-after")));
    }
    const checked = statuses.filter((s) => s === 401).length;
    // The free failures are checked; past them each wait (2 s, 4 s, …) lets at most one more through.
    expect(checked).toBeGreaterThanOrEqual(FREE_FAILURES.account + 1);
    expect(checked).toBeLessThanOrEqual(FREE_FAILURES.account + 4);
    expect(statuses.filter((s) => s === 429).length).toBe(40 - checked);
    expect(retryAfter.every((s) => Number.isInteger(s) && s >= 1 && s <= 15 * 60), `Retry-After values: ${retryAfter.join(", ")}`).toBe(true);

    // The right password from a new client waits…
    const stranger = await sessionPost(await requestAs(null, "/api/v1/session", { json: { email: admin.email, password: TEST_PASSWORD }, headers: fromSocket("192.0.2.78") }));
    expect(stranger.status).toBe(429);
    // …while the admin's known device signs in at once, from the very socket the guesses came from.
    const owner = await sessionPost(await requestAs(null, "/api/v1/session", { json: { email: admin.email, password: TEST_PASSWORD }, headers: { ...fromSocket("192.0.2.77"), cookie: `${DEVICE_COOKIE}=${device}` } }));
    expect(owner.status).toBe(200);
  });

  it("does not trust a device cookie of another account, or a tampered one", async () => {
    const owner = await makeUser({ roles: ["admin"] });
    const attacker = await makeUser({ roles: ["fuser"] });
    expect((await signInVia("203.0.113.9", undefined, attacker.email, TEST_PASSWORD)).ok).toBe(true);
    const attackersDevice = testRequestState.cookies.get(DEVICE_COOKIE)!;
    for (let i = 0; i <= FREE_FAILURES.account; i++) {
      testRequestState.cookies.set(DEVICE_COOKIE, attackersDevice);
      await signInVia(`203.0.113.${i + 10}`, undefined, owner.email, `guess-${i}-password`);
    }
    // Now waiting: neither the attacker's own cookie nor a forged one for the owner helps.
    const [entry] = attackersDevice.split("~");
    const [, deviceId, sig] = entry.split(".");
    for (const cookie of [attackersDevice, `${owner.id}.${deviceId}.${sig}`]) {
      testRequestState.cookies.set(DEVICE_COOKIE, cookie);
      const r = await signInVia("203.0.113.30", undefined, owner.email, TEST_PASSWORD);
      expect(r.ok).toBe(false);
      if (!r.ok) expect(r.status).toBe(429);
    }
  });
});
