// The proxy only sends signed-out visitors to the sign-in page. It checks that a session
// cookie is present, nothing more: every action and route handler checks the session itself.
import { NextResponse, type NextRequest } from "next/server";

export function proxy(request: NextRequest) {
  const hasCookie = Boolean(request.cookies.get("beadline_session")?.value);
  if (!hasCookie) {
    const url = request.nextUrl.clone();
    url.pathname = "/sign-in";
    url.search = request.nextUrl.pathname === "/" ? "" : `?next=${encodeURIComponent(request.nextUrl.pathname + request.nextUrl.search)}`;
    return NextResponse.redirect(url);
  }
  return NextResponse.next();
}

export const config = {
  // Everything except the sign-in page, the JSON API (answers 401 itself), Next's assets, the
  // icon, the service worker's script and its offline page (neither carries anyone's data).
  matcher: ["/((?!sign-in|api/|_next/|icon.png|favicon.ico|serwist/|~offline).*)"],
};
