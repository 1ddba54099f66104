// Sealed-cookie sessions (iron-session). The cookie holds only the user id and the
// session version; roles and the active flag are reloaded from the database on every
// request, so a deactivation or role change takes effect at once.
import { getIronSession, unsealData, type SessionOptions } from "iron-session";
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

/** Loads the person a sealed cookie value belongs to, or null if it is invalid, stale or inactive. */
export async function userFromSealedCookie(sealed: string | undefined | null): Promise<UserRecord | null> {
  if (!sealed) return null;
  let data: SessionData;
  try {
    data = await unsealData<SessionData>(sealed, { password: sessionSecret(), ttl: SESSION_TTL_S });
  } catch {
    return null;
  }
  if (!data.userId || !data.sessionVersion) return null;
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
