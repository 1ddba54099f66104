// Sealed-cookie sessions (iron-session). The cookie holds only the user id and the
// session version; roles and the active flag are reloaded from the database on every
// request, so a deactivation or role change takes effect at once.
// Unsealing costs more than the rest of the check (iron derives its keys with PBKDF2
// through WebCrypto on every call), yet the same cookie and secret always unseal to the
// same data: so the unsealed data is kept per cookie for a minute (never past the seal's
// own expiry), in a bounded LRU keyed by a hash of secret and cookie. The person's row is
// still read on every request, so a sign-out or password change (session version bump)
// refuses a cookie on its next request, kept or not.
import { createHash } from "node:crypto";
import { getIronSession, unsealData, type SessionOptions } from "iron-session";
import { LRUCache } from "lru-cache";
import { cookies } from "next/headers";
import { findUserById, type UserRecord } from "@/database/queries/users";

export const SESSION_COOKIE = "beadline_session";
const SESSION_TTL_S = 12 * 60 * 60;

export type SessionData = { userId?: number; sessionVersion?: number; issuedAt?: number };

export function sessionSecret(): string {
  const secret = process.env.SESSION_SECRET ?? "";
  if (secret.length < 32) {
    throw new Error("SESSION_SECRET must be set to at least 32 characters (npm start generates one under .data/).");
  }
  return secret;
}

/** Secure cookies whenever the public address is https (production default). */
export function secureCookies(): boolean {
  const url = process.env.BEADLINE_PUBLIC_URL;
  if (url) return url.startsWith("https:");
  return process.env.NODE_ENV === "production";
}

export function sessionOptions(): SessionOptions {
  return {
    password: sessionSecret(),
    cookieName: SESSION_COOKIE,
    ttl: SESSION_TTL_S,
    cookieOptions: { httpOnly: true, sameSite: "lax", secure: secureCookies(), path: "/" },
  };
}

/** The writable session of the current request (server actions and route handlers). */
export async function currentSession() {
  return getIronSession<SessionData>(await cookies(), sessionOptions());
}

/** How long an unsealed cookie is kept at most, and how many cookies are kept. */
export const UNSEALED_TTL_MS = 60_000;
export const UNSEALED_MAX = 2_000;

type Unsealed = { userId: number; sessionVersion: number; until: number };
const unsealedCookies = new LRUCache<string, Unsealed>({ max: UNSEALED_MAX });

/**
 * When iron stops accepting this seal, in ms since the epoch (the seal's sixth `*` field;
 * iron adds its clock skew allowance on top), or null when it carries none.
 */
function sealExpiry(sealed: string): number | null {
  const field = sealed.split("~")[0]!.split("*")[5];
  return field && /^\d+$/.test(field) ? Number(field) : null;
}

/**
 * The user id and session version a sealed cookie carries, or null when it is not a valid,
 * unexpired seal of this secret. Kept per cookie as described at the top of this file.
 */
export async function unsealSession(sealed: string): Promise<{ userId: number; sessionVersion: number } | null> {
  const secret = sessionSecret();
  const key = createHash("sha256").update(secret).update("\0").update(sealed).digest("base64");
  const now = Date.now();
  const kept = unsealedCookies.get(key);
  if (kept && kept.until > now) return kept;
  let data: SessionData;
  try {
    data = await unsealData<SessionData>(sealed, { password: secret, ttl: SESSION_TTL_S });
  } catch {
    return null;
  }
  if (!data.userId || !data.sessionVersion) return null;
  const until = Math.min(now + UNSEALED_TTL_MS, sealExpiry(sealed) ?? now);
  const entry = { userId: data.userId, sessionVersion: data.sessionVersion, until };
  if (until > now) unsealedCookies.set(key, entry, { ttl: until - now });
  return entry;
}

/** How many unsealed cookies this process keeps now (tests). */
export function unsealedCookieCount(): number {
  return unsealedCookies.size;
}

/** Loads the person a sealed cookie value belongs to, or null if it is invalid, stale or inactive. */
export async function userFromSealedCookie(sealed: string | undefined | null): Promise<UserRecord | null> {
  if (!sealed) return null;
  const data = await unsealSession(sealed);
  if (!data) return null;
  const user = await findUserById({ id: data.userId });
  if (!user || !user.isActive || user.sessionVersion !== data.sessionVersion) return null;
  return user;
}

export function cookieFromHeader(header: string | null, name = SESSION_COOKIE): string | null {
  if (!header) return null;
  for (const part of header.split(";")) {
    const [k, ...rest] = part.trim().split("=");
    if (k === name) return decodeURIComponent(rest.join("="));
  }
  return null;
}

/** The signed-in person for server components and actions (reads the request's cookies). */
export async function currentUser(): Promise<UserRecord | null> {
  const store = await cookies();
  return userFromSealedCookie(store.get(SESSION_COOKIE)?.value);
}
