"use server";
// Sign-in and sign-out server actions. Sign-in is the one action open to signed-out
// visitors; it seals a brand-new session (no fixation) after the credentials check.
import { cookies, headers } from "next/headers";
import { redirect } from "next/navigation";
import { signInSchema } from "@/domain/crew/schemas";
import { AppError, describeFieldErrors, failure, fieldErrorsFromIssues, type ActionResult } from "@/domain/result";
import { appOrigin, authenticate, clientAddress, signOutUser } from "@/app/_lib/auth";
import { DEVICE_COOKIE, deviceCookieAfterSignIn, deviceCookieOptions } from "@/app/_lib/device-cookie";
import { safeNextPath } from "@/domain/crew/next-path";
import { currentSession, currentUser } from "@/app/_lib/session";
import { isDatabaseUnavailable, isWriteContention } from "@/database/client";

export async function signInAction(raw: unknown): Promise<ActionResult<{ next: string }>> {
  const parsed = signInSchema.safeParse(raw);
  if (!parsed.success) {
    const fields = fieldErrorsFromIssues(parsed.error.issues);
    return failure("invalid", describeFieldErrors(fields), fields);
  }
  try {
    const jar = await cookies();
    const device = jar.get(DEVICE_COOKIE)?.value ?? null;
    const user = await authenticate({ ...parsed.data, address: clientAddress(await headers()), device });
    jar.set(DEVICE_COOKIE, deviceCookieAfterSignIn(device, user.id), deviceCookieOptions());
    const session = await currentSession();
    session.destroy();
    session.userId = user.id;
    session.sessionVersion = user.sessionVersion;
    session.issuedAt = Date.now();
    await session.save();
    const next = safeNextPath((raw as { next?: unknown } | null)?.next, appOrigin());
    return { ok: true, data: { next } };
  } catch (error) {
    if (error instanceof AppError) return failure(error.code, error.message);
    if (isDatabaseUnavailable(error) || isWriteContention(error)) return failure("unavailable", "Beadline cannot reach its database right now. Try again in a moment.");
    throw error;
  }
}

export async function signOutAction(): Promise<void> {
  const session = await currentSession();
  // Only a live session signs its person out everywhere; a revoked or stale cookie (an older
  // session version, a deactivated person) is just dropped, so it cannot end a newer session.
  const user = await currentUser();
  if (user) await signOutUser({ userId: user.id });
  session.destroy();
  redirect("/sign-in");
}
