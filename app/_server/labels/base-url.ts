// The address labels point to: BEADLINE_PUBLIC_URL when the operator set it (the address
// phones reach), else the origin of the request that asked for the label.
import "server-only";
export function publicBaseUrl(headers: Headers, fallbackOrigin?: string): string {
  const configured = process.env.BEADLINE_PUBLIC_URL?.trim();
  if (configured) return configured.replace(/\/+$/, "");
  const host = headers.get("x-forwarded-host") ?? headers.get("host");
  if (host) {
    const proto = headers.get("x-forwarded-proto") ?? (/^(localhost|127\.|\[::1\])/.test(host) ? "http" : "https");
    return `${proto.split(",")[0]!.trim()}://${host}`;
  }
  return (fallbackOrigin ?? "http://localhost:3000").replace(/\/+$/, "");
}
