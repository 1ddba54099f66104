// Verifies AWS Signature Version 4 on requests to the local object store, so that only a
// client holding the generated key pair can list, read, write or delete objects.
// source: Amazon S3 API Reference — Authenticating Requests (AWS Signature Version 4):
// canonical request, string to sign, signing key (HMAC-SHA256 chain over date, region,
// service, "aws4_request"); the Authorization header and the query-string (pre-signed) forms.
import { createHash, createHmac, timingSafeEqual } from "node:crypto";

export type SignedRequest = { method: string; url: string; rawHeaders: string[] };
export type KeyPair = { accessKeyId: string; secretAccessKey: string };
export type Verdict = { ok: true } | { ok: false; code: "AccessDenied" | "InvalidAccessKeyId" | "SignatureDoesNotMatch" | "RequestTimeTooSkewed" | "AuthorizationHeaderMalformed"; message: string };

const ALGORITHM = "AWS4-HMAC-SHA256";
/** S3 refuses a request whose date is more than 15 minutes away from its clock. */
const MAX_SKEW_MS = 15 * 60 * 1000;

const sha256 = (data: string) => createHash("sha256").update(data, "utf8").digest("hex");
const hmac = (key: Buffer | string, data: string) => createHmac("sha256", key).update(data, "utf8").digest();

/** RFC 3986 encoding as SigV4 wants it (encodeURIComponent leaves !'()* alone). */
function uriEncode(value: string): string {
  return encodeURIComponent(value).replace(/[!'()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
}

function safeDecode(value: string): string {
  try {
    return decodeURIComponent(value.replace(/\+/g, "%20"));
  } catch {
    return value;
  }
}

function headerMap(rawHeaders: string[]): Map<string, string> {
  const map = new Map<string, string>();
  for (let i = 0; i + 1 < rawHeaders.length; i += 2) {
    const name = rawHeaders[i].toLowerCase();
    const value = rawHeaders[i + 1].trim().replace(/\s+/g, " ");
    map.set(name, map.has(name) ? `${map.get(name)},${value}` : value);
  }
  return map;
}

function parseAmzDate(value: string): number | null {
  const m = /^(\d{4})(\d{2})(\d{2})T(\d{2})(\d{2})(\d{2})Z$/.exec(value);
  return m ? Date.UTC(+m[1], +m[2] - 1, +m[3], +m[4], +m[5], +m[6]) : null;
}

function deny(code: Exclude<Verdict, { ok: true }>["code"], message: string): Verdict {
  return { ok: false, code, message };
}

/**
 * Checks the request's SigV4 signature against `keys` (header or pre-signed query form).
 * An unsigned request, an unknown key, a wrong signature or a stale date is refused.
 */
export function verifySigV4(request: SignedRequest, keys: KeyPair, now = Date.now()): Verdict {
  const headers = headerMap(request.rawHeaders);
  const [rawPath, rawQuery = ""] = request.url.split(/\?(.*)/s, 2);
  const query = rawQuery
    .split("&")
    .filter(Boolean)
    .map((pair) => {
      const i = pair.indexOf("=");
      return i < 0 ? [safeDecode(pair), ""] : [safeDecode(pair.slice(0, i)), safeDecode(pair.slice(i + 1))];
    });
  const param = (name: string) => query.find(([k]) => k === name)?.[1];

  let credential: string, signedHeaders: string, signature: string, amzDate: string | undefined, payloadHash: string;
  let presigned = false;
  const authorization = headers.get("authorization");
  if (authorization) {
    if (!authorization.startsWith(`${ALGORITHM} `)) return deny("AccessDenied", "Only AWS Signature Version 4 is accepted.");
    const fields = Object.fromEntries(
      authorization
        .slice(ALGORITHM.length + 1)
        .split(",")
        .map((part) => part.trim().split("=", 2) as [string, string]),
    );
    credential = fields.Credential ?? "";
    signedHeaders = fields.SignedHeaders ?? "";
    signature = fields.Signature ?? "";
    amzDate = headers.get("x-amz-date") ?? undefined;
    payloadHash = headers.get("x-amz-content-sha256") ?? sha256("");
  } else if (param("X-Amz-Algorithm") !== undefined) {
    if (param("X-Amz-Algorithm") !== ALGORITHM) return deny("AccessDenied", "Only AWS Signature Version 4 is accepted.");
    presigned = true;
    credential = param("X-Amz-Credential") ?? "";
    signedHeaders = param("X-Amz-SignedHeaders") ?? "";
    signature = param("X-Amz-Signature") ?? "";
    amzDate = param("X-Amz-Date");
    payloadHash = "UNSIGNED-PAYLOAD";
    const expires = Number(param("X-Amz-Expires") ?? 0);
    const signedAt = amzDate ? parseAmzDate(amzDate) : null;
    if (signedAt === null || !(expires > 0) || now > signedAt + expires * 1000) return deny("AccessDenied", "Request has expired.");
  } else {
    return deny("AccessDenied", "Anonymous access is not allowed: sign the request with the store's key.");
  }

  const [accessKeyId, date, region, service, terminator] = credential.split("/");
  if (!accessKeyId || !date || !region || !service || terminator !== "aws4_request" || !signedHeaders || !/^[0-9a-f]{64}$/.test(signature) || !amzDate) {
    return deny("AuthorizationHeaderMalformed", "The authorization is incomplete.");
  }
  if (accessKeyId !== keys.accessKeyId) return deny("InvalidAccessKeyId", "The access key is not known to this store.");
  const signedAt = parseAmzDate(amzDate);
  if (signedAt === null || !amzDate.startsWith(date)) return deny("AuthorizationHeaderMalformed", "The request date is malformed.");
  if (!presigned && Math.abs(now - signedAt) > MAX_SKEW_MS) return deny("RequestTimeTooSkewed", "The request time is too far from the store's clock.");

  const names = signedHeaders.split(";");
  if (!names.includes("host")) return deny("AccessDenied", "The host header must be signed.");
  const canonicalHeaders = names.map((name) => `${name}:${headers.get(name) ?? ""}\n`).join("");
  const canonicalQuery = query
    .filter(([k]) => !(presigned && k === "X-Amz-Signature"))
    .map(([k, v]) => [uriEncode(k), uriEncode(v)])
    .sort(([ak, av], [bk, bv]) => (ak < bk ? -1 : ak > bk ? 1 : av < bv ? -1 : av > bv ? 1 : 0))
    .map(([k, v]) => `${k}=${v}`)
    .join("&");
  // S3 signs the path as sent (already encoded once), without normalising it.
  const canonicalRequest = [request.method, rawPath || "/", canonicalQuery, canonicalHeaders, signedHeaders, payloadHash].join("\n");
  const scope = `${date}/${region}/${service}/aws4_request`;
  const stringToSign = [ALGORITHM, amzDate, scope, sha256(canonicalRequest)].join("\n");
  const signingKey = hmac(hmac(hmac(hmac(`AWS4${keys.secretAccessKey}`, date), region), service), "aws4_request");
  const expected = createHmac("sha256", signingKey).update(stringToSign, "utf8").digest();
  const given = Buffer.from(signature, "hex");
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) {
    return deny("SignatureDoesNotMatch", "The request signature does not match the store's key.");
  }
  return { ok: true };
}
