// Sign-in and sign-out use cases shared by the sign-in form (server action) and the JSON API.
import { createHash } from "node:crypto";
import bcrypt from "bcryptjs";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { forgetFailures, recordFailure, refundFailure, startWait, takeTurn, waitLeft } from "@/database/queries/sign-in-attempts";
import { bumpSessionVersion, findUserCredentialsByEmail, type UserRecord } from "@/database/queries/users";
import { FAILURE_MEMORY_S, FIRST_DELAY_S, FREE_FAILURES, delayAfterFailures, waitInWords, type ThrottleCounter } from "@/domain/crew/throttle";
import { AppError } from "@/domain/result";
import { trustedDeviceFor } from "./device-cookie";

export { clientAddress } from "./client-address";

import { BCRYPT_COST } from "@/domain/crew/password-policy"; // one home: the demo seed hashes with it too
export { BCRYPT_COST };
/** A real hash to compare against when the account does not exist (same time either way). */
const DUMMY_HASH = "$2b$12$byd5alSOfAuI6LqTzyqCbeEoy0cmw0XBFdndhi2eBtWB6aA0OW6k2";
const GENERIC_FAILURE = "That e-mail and password do not match an active account. Check them, or ask your administrator.";

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

/** The origin Beadline is served from (BEADLINE_PUBLIC_URL), for same-origin checks of paths. */
export function appOrigin(): string {
  try {
    return new URL(process.env.BEADLINE_PUBLIC_URL || "http://localhost").origin;
  } catch {
    return "http://localhost";
  }
}

type Counter = { kind: ThrottleCounter; key: string };

function hashed(value: string): string {
  return createHash("sha256").update(value).digest("hex");
}

/** The store key of an account's (by e-mail) or an address's failure counter. */
export function throttleKey(kind: "account" | "address", value: string): string {
  return `${kind}:${hashed(kind === "account" ? value.trim().toLowerCase() : value)}`;
}

/**
 * The counters that judge this attempt: a device that signed in to this account before is
 * judged by its own counter only; any other client by the account's counter (keyed by the
 * e-mail as typed, so unknown accounts are throttled alike) and its address's.
 */
function countersFor({ email, address, deviceId }: { email: string; address: string; deviceId: string | null }): Counter[] {
  if (deviceId) return [{ kind: "device", key: `device:${deviceId}` }];
  return [
    { kind: "account", key: throttleKey("account", email) },
    { kind: "address", key: throttleKey("address", address) },
  ];
}

/** A sign-in refused while a counter waits; `waitMs` is how long (the JSON API's Retry-After). */
export class SignInThrottled extends AppError {
  constructor(readonly waitMs: number) {
    super("throttled", `Too many failed sign-ins. Wait ${waitInWords(waitMs)} and try again, or sign in from a device you have used Beadline on before.`);
  }

  /** Whole seconds to wait, at least 1 (RFC 9110 §10.2.3 Retry-After: delay-seconds). */
  get retryAfterSeconds(): number {
    return Math.max(1, Math.ceil(this.waitMs / 1000));
  }
}

/**
 * Checks the credentials with throttling (domain/crew/throttle.ts): while a counter of this
 * attempt waits, the password is not checked and the answer says how long to wait; every
 * checked attempt counts on each counter and may start a longer wait (taken back when it
 * succeeds). `device` is the device cookie's value, if the browser sent one.
 */
export async function authenticate({ email, password, address, device, requestId }: { email: string; password: string; address: string; device?: string | null; requestId?: string }): Promise<UserRecord> {
  const user = await findUserCredentialsByEmail({ email });
  const deviceId = user ? trustedDeviceFor(device, user.id) : null;
  const counters = countersFor({ email, address, deviceId });
  const waits = await Promise.all(counters.map((c) => waitLeft({ key: c.key, memoryS: FAILURE_MEMORY_S })));
  const wait = Math.max(0, ...waits);
  if (wait > 0) {
    await insertAuditEntry({ actorUserId: user?.id ?? null, action: "sign-in-throttled", entityType: "user", entityId: user?.id ?? null, details: { email, address, trustedDevice: Boolean(deviceId), waitMs: wait }, requestId });
    throw new SignInThrottled(wait);
  }
  // Every attempt counts as a failure before the password is checked (atomic increments, so
  // attempts sent side by side each get their own count). Past the free failures a counter
  // lets one attempt at a time through: the others are refused and take their count back.
  const counted: { c: Counter; failures: number; heldTurn: boolean }[] = [];
  for (const c of counters) counted.push({ c, failures: await recordFailure({ key: c.key, memoryS: FAILURE_MEMORY_S }), heldTurn: false });
  for (const entry of counted) {
    if (entry.failures <= FREE_FAILURES[entry.c.kind]) continue;
    entry.heldTurn = await takeTurn({ key: entry.c.key, memoryS: FAILURE_MEMORY_S });
    if (!entry.heldTurn) {
      for (const e of counted) await refundFailure({ key: e.c.key, memoryS: FAILURE_MEMORY_S, heldTurn: e.heldTurn });
      await insertAuditEntry({ actorUserId: user?.id ?? null, action: "sign-in-throttled", entityType: "user", entityId: user?.id ?? null, details: { email, address, trustedDevice: Boolean(deviceId) }, requestId });
      throw new SignInThrottled(FIRST_DELAY_S * 1000);
    }
  }
  const matches = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !matches || !user.isActive) {
    for (const { c, failures } of counted) await startWait({ key: c.key, memoryS: FAILURE_MEMORY_S, seconds: delayAfterFailures(failures, c.kind) });
    await insertAuditEntry({ actorUserId: user?.id ?? null, action: "sign-in-failed", entityType: "user", entityId: user?.id ?? null, details: { email, address, trustedDevice: Boolean(deviceId) }, requestId });
    throw new AppError("unauthenticated", GENERIC_FAILURE);
  }
  // The right password: this client's own counters start again; an address keeps its other
  // failures across accounts (one success does not excuse spraying), less this attempt.
  for (const { c, heldTurn } of counted) {
    if (c.kind === "address") await refundFailure({ key: c.key, memoryS: FAILURE_MEMORY_S, heldTurn });
    else await forgetFailures({ key: c.key, memoryS: FAILURE_MEMORY_S });
  }
  await insertAuditEntry({ actorUserId: user.id, action: "sign-in", entityType: "user", entityId: user.id, details: { address, trustedDevice: Boolean(deviceId) }, requestId });
  const { passwordHash: _omit, ...rest } = user;
  return rest;
}

/** Sign-out invalidates every cookie of this person (session version bump). */
export async function signOutUser({ userId, requestId }: { userId: number; requestId?: string }): Promise<void> {
  await bumpSessionVersion({ id: userId });
  await insertAuditEntry({ actorUserId: userId, action: "sign-out", entityType: "user", entityId: userId, requestId });
}
