// Sign-in and sign-out use cases shared by the sign-in form (server action) and the JSON API.
import bcrypt from "bcryptjs";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { countRecentFailures, insertSignInAttempt } from "@/database/queries/sign-in-attempts";
import { bumpSessionVersion, findUserCredentialsByEmail, type UserRecord } from "@/database/queries/users";
import { THROTTLE_WINDOW_MS, isSignInThrottled } from "@/domain/crew/throttle";
import { AppError } from "@/domain/result";

import { BCRYPT_COST } from "@/domain/crew/password-policy"; // one home: the demo seed hashes with it too
export { BCRYPT_COST };
/** A real hash to compare against when the account does not exist (same time either way). */
const DUMMY_HASH = "$2b$12$byd5alSOfAuI6LqTzyqCbeEoy0cmw0XBFdndhi2eBtWB6aA0OW6k2";
const GENERIC_FAILURE = "That e-mail and password do not match an active account, or there were too many attempts. Try again later or ask your administrator.";

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

/** Checks the credentials with throttling; one generic message for every kind of failure. */
export async function authenticate({ email, password, address, requestId }: { email: string; password: string; address: string; requestId?: string }): Promise<UserRecord> {
  const since = new Date(Date.now() - THROTTLE_WINDOW_MS);
  const failures = await countRecentFailures({ email, address, since });
  const user = await findUserCredentialsByEmail({ email });
  if (isSignInThrottled(failures)) {
    await insertSignInAttempt({ email, address, succeeded: false });
    await insertAuditEntry({ actorUserId: user?.id ?? null, action: "sign-in-throttled", entityType: "user", entityId: user?.id ?? null, details: { email, address }, requestId });
    throw new AppError("throttled", GENERIC_FAILURE);
  }
  const matches = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !matches || !user.isActive) {
    await insertSignInAttempt({ email, address, succeeded: false });
    await insertAuditEntry({ actorUserId: user?.id ?? null, action: "sign-in-failed", entityType: "user", entityId: user?.id ?? null, details: { email, address }, requestId });
    throw new AppError("unauthenticated", GENERIC_FAILURE);
  }
  await insertSignInAttempt({ email, address, succeeded: true });
  await insertAuditEntry({ actorUserId: user.id, action: "sign-in", entityType: "user", entityId: user.id, details: { address }, requestId });
  const { passwordHash: _omit, ...rest } = user;
  return rest;
}

/** Sign-out invalidates every cookie of this person (session version bump). */
export async function signOutUser({ userId, requestId }: { userId: number; requestId?: string }): Promise<void> {
  await bumpSessionVersion({ id: userId });
  await insertAuditEntry({ actorUserId: userId, action: "sign-out", entityType: "user", entityId: userId, requestId });
}

export function clientAddress(headers: Headers): string {
  return (headers.get("x-forwarded-for")?.split(",")[0] ?? headers.get("x-real-ip") ?? "local").trim().slice(0, 64) || "local";
}
