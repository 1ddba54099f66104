// The address a sign-in attempt comes from, for the per-address limit. Only the web server's
// own socket can tell who is on the other end: `next start` copies the socket's address into
// X-Forwarded-For only when the request has none (`??=` in Next's base server), so a client
// that writes the header itself chooses its own address. So the Node.js server process stamps
// every incoming request with the socket's address in a private header (installed from
// instrumentation.ts; any copy of that header sent by the client is overwritten), and
// X-Forwarded-For is read only through the proxies the operator lists in
// BEADLINE_TRUSTED_PROXIES (addresses or CIDR ranges, comma-separated; default none: the
// socket's address is the client's). With a trusted reverse proxy in front, list its address:
// the client is then the right-most X-Forwarded-For entry that is not itself a trusted proxy.
import { randomBytes } from "node:crypto";
import http from "node:http";
import https from "node:https";
import { BlockList, isIP } from "node:net";

/** The private header carrying the socket's address, with the process's stamp token. */
export const PEER_HEADER = "x-beadline-peer";
/** The address used when the request carries no valid stamp (should not happen under `next start`). */
export const UNKNOWN_ADDRESS = "unknown";

const globalStamp = globalThis as unknown as { beadlinePeerStamp?: { token: string; installed: boolean } };

function stamp(): { token: string; installed: boolean } {
  globalStamp.beadlinePeerStamp ??= { token: randomBytes(18).toString("base64url"), installed: false };
  return globalStamp.beadlinePeerStamp;
}

/** Writes the socket's address into a request's headers, replacing whatever the client sent. */
export function stampPeerAddress(headers: Record<string, string | string[] | undefined>, remoteAddress: string | undefined): void {
  headers[PEER_HEADER] = `${stamp().token} ${remoteAddress ?? ""}`;
}

/**
 * Stamps every request of this process's HTTP(S) servers before Next.js sees it (the
 * `request` event). Idempotent; call once from instrumentation's register().
 */
export function installPeerAddressStamp(): void {
  const state = stamp();
  if (state.installed) return;
  state.installed = true;
  for (const Server of [http.Server, https.Server]) {
    const emit = Server.prototype.emit as (this: unknown, event: string | symbol, ...args: unknown[]) => boolean;
    Server.prototype.emit = function (this: unknown, event: string | symbol, ...args: unknown[]): boolean {
      if (event === "request") {
        const req = args[0] as http.IncomingMessage;
        stampPeerAddress(req.headers, req.socket?.remoteAddress);
      }
      return emit.apply(this, [event, ...args]);
    } as typeof Server.prototype.emit;
  }
}

/** The socket's address from a stamped request, or null when the stamp is missing or forged. */
export function peerAddressOf(headers: Headers): string | null {
  const value = headers.get(PEER_HEADER);
  if (!value) return null;
  const space = value.indexOf(" ");
  if (space < 0 || value.slice(0, space) !== stamp().token) return null;
  return normaliseAddress(value.slice(space + 1));
}

/** An IP address in one spelling ("::ffff:192.0.2.1" → "192.0.2.1"), or null when it is not one. */
export function normaliseAddress(raw: string): string | null {
  let a = raw.trim();
  if (a.startsWith("[") && a.endsWith("]")) a = a.slice(1, -1);
  const mapped = /^::ffff:(\d+\.\d+\.\d+\.\d+)$/i.exec(a);
  if (mapped) a = mapped[1];
  return isIP(a) ? a.toLowerCase() : null;
}

/** Parses BEADLINE_TRUSTED_PROXIES ("10.0.0.5, 10.1.0.0/16, ::1"); a wrong entry is an error. */
export function parseTrustedProxies(value: string | undefined): BlockList {
  const list = new BlockList();
  for (const entry of (value ?? "").split(",").map((s) => s.trim()).filter(Boolean)) {
    const [addr, prefix, extra] = entry.split("/");
    const ip = normaliseAddress(addr);
    const family = ip ? (isIP(ip) === 6 ? "ipv6" : "ipv4") : null;
    const bits = prefix === undefined ? null : Number(prefix);
    if (!ip || !family || extra !== undefined || (bits !== null && (!Number.isInteger(bits) || bits < 0 || bits > (family === "ipv4" ? 32 : 128)))) {
      throw new Error(`BEADLINE_TRUSTED_PROXIES: "${entry}" is not an IP address or an address/prefix range.`);
    }
    if (bits === null) list.addAddress(ip, family);
    else list.addSubnet(ip, bits, family);
  }
  return list;
}

function isTrusted(list: BlockList, address: string): boolean {
  return list.check(address, isIP(address) === 6 ? "ipv6" : "ipv4");
}

/**
 * The client's address: the socket's, unless the socket is a trusted proxy; then
 * X-Forwarded-For is walked from the right past every trusted proxy. An entry that is not an
 * address stops the walk at the last proxy that wrote it.
 */
export function clientAddressFrom({ peer, forwardedFor, trusted }: { peer: string | null; forwardedFor: string | null; trusted: BlockList }): string {
  if (!peer) return UNKNOWN_ADDRESS;
  let client = peer;
  const hops = (forwardedFor ?? "").split(",").map((s) => s.trim()).filter(Boolean);
  while (isTrusted(trusted, client) && hops.length > 0) {
    const next = normaliseAddress(hops.pop()!);
    if (!next) break;
    client = next;
  }
  return client;
}

let cachedProxies: { value: string | undefined; list: BlockList } | null = null;

function configuredProxies(): BlockList {
  const value = process.env.BEADLINE_TRUSTED_PROXIES;
  if (!cachedProxies || cachedProxies.value !== value) cachedProxies = { value, list: parseTrustedProxies(value) };
  return cachedProxies.list;
}

/** The client's address for a request handled by this server (see the top of this file). */
export function clientAddress(headers: Headers): string {
  return clientAddressFrom({ peer: peerAddressOf(headers), forwardedFor: headers.get("x-forwarded-for"), trusted: configuredProxies() });
}
