// Device cookies (OWASP, "Slow Down Online Guessing Attacks with Device Cookies"): a
// successful sign-in leaves a signed cookie naming the account and a random device id. A
// later sign-in to that account carrying it is judged by that device's own failure counter,
// not the account's, so someone hammering the account from elsewhere cannot keep its owner
// out. The cookie grants nothing by itself: the password is still checked. It holds up to
// DEVICE_ACCOUNTS_KEPT accounts (a crew tablet shared by a few people), newest first; each
// entry is `<user id>.<device id>.<HMAC-SHA256 of both>` under a key derived from the
// session secret.
import { createHmac, randomBytes, timingSafeEqual } from "node:crypto";
import { secureCookies, sessionSecret } from "./session";

export const DEVICE_COOKIE = "beadline_device";
export const DEVICE_COOKIE_MAX_AGE_S = 365 * 24 * 60 * 60;
export const DEVICE_ACCOUNTS_KEPT = 4;
const MAX_COOKIE_LENGTH = 1024;

type Entry = { userId: number; deviceId: string; raw: string };

function signingKey(): Buffer {
  return createHmac("sha256", sessionSecret()).update("beadline device cookie v1").digest();
}

function signature(userId: number, deviceId: string): string {
  return createHmac("sha256", signingKey()).update(`${userId}.${deviceId}`).digest("base64url");
}

function parse(value: string | null | undefined): Entry[] {
  if (!value || value.length > MAX_COOKIE_LENGTH) return [];
  const out: Entry[] = [];
  for (const raw of value.split("~")) {
    const m = /^(\d{1,10})\.([A-Za-z0-9_-]{22})\.([A-Za-z0-9_-]{43})$/.exec(raw);
    if (!m) continue;
    const userId = Number(m[1]);
    const expected = Buffer.from(signature(userId, m[2]));
    const given = Buffer.from(m[3]);
    if (expected.length === given.length && timingSafeEqual(expected, given)) out.push({ userId, deviceId: m[2], raw });
  }
  return out;
}

/** The device id this cookie holds for the account, when its signature is good. */
export function trustedDeviceFor(value: string | null | undefined, userId: number): string | null {
  return parse(value).find((e) => e.userId === userId)?.deviceId ?? null;
}

/** The cookie's new value after `userId` signed in on this device (its entry first, kept id). */
export function deviceCookieAfterSignIn(value: string | null | undefined, userId: number): string {
  const entries = parse(value);
  const own = entries.find((e) => e.userId === userId);
  const deviceId = own?.deviceId ?? randomBytes(16).toString("base64url");
  const first = `${userId}.${deviceId}.${signature(userId, deviceId)}`;
  return [first, ...entries.filter((e) => e.userId !== userId).map((e) => e.raw)].slice(0, DEVICE_ACCOUNTS_KEPT).join("~");
}

/** Cookie attributes: not readable by scripts, sent to Beadline only, kept a year. */
export function deviceCookieOptions() {
  return { httpOnly: true, sameSite: "lax" as const, secure: secureCookies(), path: "/", maxAge: DEVICE_COOKIE_MAX_AGE_S };
}

/** The Set-Cookie header value for route handlers. */
export function deviceCookieHeader(value: string): string {
  return `${DEVICE_COOKIE}=${value}; Path=/; Max-Age=${DEVICE_COOKIE_MAX_AGE_S}; HttpOnly; SameSite=Lax${secureCookies() ? "; Secure" : ""}`;
}
