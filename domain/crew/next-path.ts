// Where to go after signing in: only a path on Beadline itself. The `next` value comes from
// the address bar, so anyone can write it; a browser reads `/\host`, `/<TAB>/host`,
// `//host` and `/.//host` as another site (WHATWG URL parsing: backslash is a slash in
// http(s) URLs, tabs and newlines are removed, a path that starts with two slashes names a
// host). The value is parsed against Beadline's own origin and kept only when the result
// is on that origin; the answer is the parsed path, so the browser is never given the raw
// text. Used by the sign-in page (server) and the sign-in form (browser).

export const HOME_PATH = "/";
const MAX_NEXT_LENGTH = 2048;

/** A same-origin path (pathname, query, fragment) for `next`, or "/" when it is anything else. */
export function safeNextPath(next: unknown, origin: string): string {
  if (typeof next !== "string" || next.length === 0 || next.length > MAX_NEXT_LENGTH) return HOME_PATH;
  // A path, not a scheme, a host or a protocol-relative address; no backslash, no control
  // characters (C0, DEL, C1) anywhere, percent-encoded forms of them included.
  if (!next.startsWith("/") || next.startsWith("//")) return HOME_PATH;
  if (/[\\\u0000-\u001f\u007f-\u009f]/.test(next) || /%(?:5c|[01][0-9a-f]|7f)/i.test(next)) return HOME_PATH;
  let base: URL;
  let parsed: URL;
  try {
    base = new URL(origin);
    parsed = new URL(next, base);
  } catch {
    return HOME_PATH;
  }
  if (parsed.origin !== base.origin || parsed.username || parsed.password) return HOME_PATH;
  const path = parsed.pathname + parsed.search + parsed.hash;
  // "/./" and "/../" segments can leave a path that starts with "//" after parsing.
  if (!path.startsWith("/") || path.startsWith("//")) return HOME_PATH;
  return path;
}
