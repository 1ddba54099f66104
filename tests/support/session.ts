// Acting as a person in tests: seals a real iron-session cookie for them.
import { sealData } from "iron-session";
import { SESSION_COOKIE, type SessionData } from "@/app/_lib/session";
import { findUserById } from "@/database/queries/users";
import { testRequestState } from "./request-state";

export async function sealedCookieFor(user: { id: number } | null): Promise<string | null> {
  if (!user) return null;
  const record = await findUserById({ id: user.id });
  if (!record) throw new Error(`no user ${user.id}`);
  const data: SessionData = { userId: record.id, sessionVersion: record.sessionVersion, issuedAt: Date.now() };
  return sealData(data, { password: process.env.SESSION_SECRET!, ttl: 12 * 60 * 60 });
}

/** Server actions called after this see `user` as the signed-in person (null = signed out). */
export async function actAs(user: { id: number } | null): Promise<void> {
  testRequestState.cookies.clear();
  const sealed = await sealedCookieFor(user);
  if (sealed) testRequestState.cookies.set(SESSION_COOKIE, sealed);
}

/** A Cookie header for route-handler Requests. */
export async function cookieHeaderFor(user: { id: number } | null): Promise<Record<string, string>> {
  const sealed = await sealedCookieFor(user);
  return sealed ? { cookie: `${SESSION_COOKIE}=${encodeURIComponent(sealed)}` } : {};
}

/** Builds a Request to a route handler as `user` (JSON body when given). */
export async function requestAs(user: { id: number } | null, url: string, init: { method?: string; json?: unknown; headers?: Record<string, string>; body?: BodyInit } = {}): Promise<Request> {
  const headers: Record<string, string> = { ...(await cookieHeaderFor(user)), ...(init.headers ?? {}) };
  let body = init.body;
  if (init.json !== undefined) {
    headers["content-type"] = "application/json";
    body = JSON.stringify(init.json);
  }
  return new Request(new URL(url, "http://127.0.0.1:3000"), { method: init.method ?? (body ? "POST" : "GET"), headers, body });
}
