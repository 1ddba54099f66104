// The client address for the sign-in limit comes from the socket, and X-Forwarded-For only
// through proxies the operator trusts.
// source: RFC 7239 §5.2 and MDN "X-Forwarded-For" (security: the header is client-writable;
// use the right-most address not added by a trusted proxy); OWASP Authentication Cheat Sheet.
import http from "node:http";
import type { AddressInfo } from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { clientAddress, clientAddressFrom, installPeerAddressStamp, parseTrustedProxies, PEER_HEADER, UNKNOWN_ADDRESS } from "@/app/_lib/client-address";

describe("clientAddressFrom", () => {
  const none = parseTrustedProxies(undefined);
  const proxy = parseTrustedProxies("10.0.0.5, 10.1.0.0/16, ::1");

  it("ignores X-Forwarded-For when no proxy is trusted (the default)", () => {
    for (const xff of ["198.51.100.7", "203.0.113.1, 198.51.100.7", "anything"]) {
      expect(clientAddressFrom({ peer: "192.0.2.10", forwardedFor: xff, trusted: none })).toBe("192.0.2.10");
    }
  });

  it("ignores X-Forwarded-For from a socket that is not a trusted proxy", () => {
    expect(clientAddressFrom({ peer: "192.0.2.10", forwardedFor: "198.51.100.7", trusted: proxy })).toBe("192.0.2.10");
  });

  it("takes the right-most address that is not a trusted proxy", () => {
    expect(clientAddressFrom({ peer: "10.0.0.5", forwardedFor: "198.51.100.7", trusted: proxy })).toBe("198.51.100.7");
    // The client wrote 203.0.113.66 itself; the proxy appended the real address after it.
    expect(clientAddressFrom({ peer: "10.0.0.5", forwardedFor: "203.0.113.66, 198.51.100.7", trusted: proxy })).toBe("198.51.100.7");
    // Two trusted proxies in a row (10.1.2.3 is in 10.1.0.0/16).
    expect(clientAddressFrom({ peer: "10.0.0.5", forwardedFor: "203.0.113.66, 198.51.100.7, 10.1.2.3", trusted: proxy })).toBe("198.51.100.7");
    expect(clientAddressFrom({ peer: "::1", forwardedFor: "2001:db8::9", trusted: proxy })).toBe("2001:db8::9");
  });

  it("stops at a trusted proxy when the next entry is not an address", () => {
    expect(clientAddressFrom({ peer: "10.0.0.5", forwardedFor: "not-an-address", trusted: proxy })).toBe("10.0.0.5");
  });

  it("answers 'unknown' without a socket address", () => {
    expect(clientAddressFrom({ peer: null, forwardedFor: "198.51.100.7", trusted: proxy })).toBe(UNKNOWN_ADDRESS);
  });

  it("refuses a wrong BEADLINE_TRUSTED_PROXIES entry by name", () => {
    expect(() => parseTrustedProxies("10.0.0.5, proxy.internal")).toThrow(/proxy\.internal/);
    expect(() => parseTrustedProxies("10.0.0.0/33")).toThrow(/10\.0\.0\.0\/33/);
  });
});

describe("the socket stamp on a real HTTP server", () => {
  let server: http.Server;
  let base = "";
  const seen: { address: string; peerHeader: string | undefined }[] = [];

  beforeAll(async () => {
    installPeerAddressStamp();
    server = http.createServer((req, res) => {
      const headers = new Headers();
      for (const [k, v] of Object.entries(req.headers)) if (typeof v === "string") headers.set(k, v);
      seen.push({ address: clientAddress(headers), peerHeader: req.headers[PEER_HEADER] as string | undefined });
      res.end("ok");
    });
    await new Promise<void>((resolve) => server.listen(0, "127.0.0.1", resolve));
    base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  });
  afterAll(() => new Promise<void>((resolve) => server.close(() => resolve())));

  it("uses the socket's address whatever X-Forwarded-For or a forged stamp say", async () => {
    delete process.env.BEADLINE_TRUSTED_PROXIES;
    seen.length = 0;
    for (const forged of ["203.0.113.1", "203.0.113.2", "198.51.100.3"]) {
      await fetch(base, { headers: { "x-forwarded-for": forged, [PEER_HEADER]: `guessed-token ${forged}` } });
    }
    expect(seen.map((s) => s.address)).toEqual(["127.0.0.1", "127.0.0.1", "127.0.0.1"]);
    expect(seen.every((s) => !s.peerHeader?.startsWith("guessed-token"))).toBe(true);
  });

  it("reads X-Forwarded-For when the socket is a trusted proxy", async () => {
    process.env.BEADLINE_TRUSTED_PROXIES = "127.0.0.1";
    seen.length = 0;
    try {
      await fetch(base, { headers: { "x-forwarded-for": "203.0.113.1" } });
      await fetch(base, { headers: { "x-forwarded-for": "203.0.113.2" } });
    } finally {
      delete process.env.BEADLINE_TRUSTED_PROXIES;
    }
    expect(seen.map((s) => s.address)).toEqual(["203.0.113.1", "203.0.113.2"]);
  });
});
