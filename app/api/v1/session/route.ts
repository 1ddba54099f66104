// JSON sign-in/sign-out for API clients and scripts: POST { email, password } → the
// session cookie; DELETE signs out; GET says who is signed in.
import { getIronSession } from "iron-session";
import { signInSchema } from "@/domain/crew/schemas";
import { AppError, describeFieldErrors, fieldErrorsFromIssues } from "@/domain/result";
import { SignInThrottled, authenticate, clientAddress, signOutUser } from "@/app/_lib/auth";
import { BODY_LIMITS, readJsonLimited } from "@/app/_lib/body";
import { defineRoute, errorResponse, isCrossOrigin } from "@/app/_lib/guard";
import { cookieFromHeader, sessionOptions, type SessionData } from "@/app/_lib/session";
import { DEVICE_COOKIE, deviceCookieAfterSignIn, deviceCookieHeader } from "@/app/_lib/device-cookie";
import { isDatabaseUnavailable, isWriteContention } from "@/database/client";

export const dynamic = "force-dynamic";

export async function POST(request: Request): Promise<Response> {
  if (isCrossOrigin(request)) return errorResponse("forbidden", "Cross-site request refused."); // login CSRF
  let raw: unknown;
  try {
    raw = await readJsonLimited(request, { max: BODY_LIMITS.signIn }); // counted as it arrives: 413 past the limit
  } catch (error) {
    if (error instanceof AppError) return errorResponse(error.code, error.message, error.fields, error.code === "too-large" ? { connection: "close" } : undefined);
    return errorResponse("bad-request", "The request body could not be read."); // the caller hung up while sending
  }
  const parsed = signInSchema.safeParse(raw);
  if (!parsed.success) {
    const fields = fieldErrorsFromIssues(parsed.error.issues);
    return errorResponse("invalid", describeFieldErrors(fields), fields);
  }
  try {
    const device = cookieFromHeader(request.headers.get("cookie"), DEVICE_COOKIE);
    const user = await authenticate({ ...parsed.data, address: clientAddress(request.headers), device });
    const response = Response.json({ user: { id: user.id, name: user.name, email: user.email, roles: user.roles, unitSystem: user.unitSystem } });
    const session = await getIronSession<SessionData>(request, response, sessionOptions());
    session.userId = user.id;
    session.sessionVersion = user.sessionVersion;
    session.issuedAt = Date.now();
    await session.save();
    response.headers.append("set-cookie", deviceCookieHeader(deviceCookieAfterSignIn(device, user.id)));
    return response;
  } catch (error) {
    if (error instanceof SignInThrottled) return errorResponse(error.code, error.message, undefined, { "retry-after": String(error.retryAfterSeconds) });
    if (error instanceof AppError) return errorResponse(error.code, error.message);
    if (isDatabaseUnavailable(error) || isWriteContention(error)) return errorResponse("unavailable", "Beadline cannot reach its database right now.", undefined, { "retry-after": "5" });
    return errorResponse("internal", "Something went wrong on the server.");
  }
}

export const GET = defineRoute({ permission: "signed-in" }, async (_input, { user }) =>
  Response.json({ user: { id: user.id, name: user.name, email: user.email, roles: user.roles, unitSystem: user.unitSystem } }),
);

export const DELETE = defineRoute({ permission: "signed-in" }, async (_input, { user, requestId }) => {
  await signOutUser({ userId: user.id, requestId });
  const response = new Response(null, { status: 204 });
  response.headers.append("set-cookie", `beadline_session=; Path=/; Max-Age=0; HttpOnly; SameSite=Lax`);
  return response;
});
