// The proxy does two things for pages. It sends signed-out visitors to the sign-in page (it
// checks that a session cookie is present, nothing more: every action and route handler
// checks the session itself). And it gives every page its Content-Security-Policy with a
// fresh nonce (security-policy.js): Next.js reads the nonce from the request's policy header
// and puts it on its own scripts, so no inline script runs without it. Pages render per
// request (the root layout reads the request), so each HTML answer carries its own nonce —
// the Trench page the service worker keeps offline keeps the header and HTML of one answer.
import { NextResponse, type NextRequest } from "next/server";
import { pagePolicy } from "./security-policy.js";

/** Pages open to signed-out visitors: the sign-in page and the service worker's offline page. */
const OPEN_PAGES = /^\/(?:sign-in|~offline)(?:\/|$)/;

function newNonce(): string {
  const bytes = new Uint8Array(18);
  crypto.getRandomValues(bytes);
  return btoa(String.fromCharCode(...bytes));
}

export function proxy(request: NextRequest) {
  const policy = pagePolicy({ nonce: newNonce(), dev: process.env.NODE_ENV !== "production" });
  const hasCookie = Boolean(request.cookies.get("beadline_session")?.value);
  if (!hasCookie && !OPEN_PAGES.test(request.nextUrl.pathname)) {
    const url = request.nextUrl.clone();
    url.pathname = "/sign-in";
    url.search = request.nextUrl.pathname === "/" ? "" : `?next=${encodeURIComponent(request.nextUrl.pathname + request.nextUrl.search)}`;
    const redirect = NextResponse.redirect(url);
    redirect.headers.set("Content-Security-Policy", policy);
    return redirect;
  }
  const requestHeaders = new Headers(request.headers);
  requestHeaders.set("Content-Security-Policy", policy);
  const response = NextResponse.next({ request: { headers: requestHeaders } });
  response.headers.set("Content-Security-Policy", policy);
  return response;
}

export const config = {
  // Every page; not the JSON API (answers 401 itself), Next's build files, the icon or the
  // service worker's script (next.config.js gives those the static policy).
  matcher: ["/((?!api/|_next/|icon.png|favicon.ico|serwist/).*)"],
};
