// Development mailbox: the messages the local fake SMTP server (database/local/mail-server.ts)
// received, read from its spool folder (MAIL_SPOOL_DIR: one JSON file per message,
// {receivedAt, from, to[], raw}). The raw message is decoded enough to show it: header
// unfolding (RFC 5322 §2.2.3), encoded words in headers (RFC 2047, B and Q), and the body's
// quoted-printable or base64 transfer encoding (RFC 2045 §6.7, §6.8), first text part of a
// multipart message (RFC 2046 §5.1).
import { readdir, readFile } from "node:fs/promises";
import path from "node:path";

export type DevMail = { file: string; receivedAt: Date; from: string | null; to: string[]; subject: string; headerTo: string; date: string | null; bodyText: string };

export function spoolDir(): string | null {
  return process.env.MAIL_SPOOL_DIR || null;
}

function bytesToText(bytes: Uint8Array, charset: string): string {
  try {
    return new TextDecoder(charset.toLowerCase() === "us-ascii" ? "utf-8" : charset).decode(bytes);
  } catch {
    return new TextDecoder("utf-8").decode(bytes);
  }
}

/** Quoted-printable → bytes (RFC 2045 §6.7): soft line breaks "=\r\n" removed, =XX decoded. */
export function decodeQuotedPrintable(text: string): Uint8Array {
  const clean = text.replace(/=\r?\n/g, "");
  const out: number[] = [];
  for (let i = 0; i < clean.length; i += 1) {
    const ch = clean[i]!;
    if (ch === "=" && /^[0-9A-Fa-f]{2}$/.test(clean.slice(i + 1, i + 3))) {
      out.push(parseInt(clean.slice(i + 1, i + 3), 16));
      i += 2;
    } else {
      for (const b of new TextEncoder().encode(ch)) out.push(b);
    }
  }
  return Uint8Array.from(out);
}

/**
 * Decodes RFC 2047 encoded words ("=?charset?B|Q?text?="); whitespace between two adjacent
 * encoded words is dropped (RFC 2047 §6.2). In Q, "_" is a space.
 */
export function decodeEncodedWords(value: string): string {
  const word = /=\?([^?\s]+)\?([BbQq])\?([^?\s]*)\?=/g;
  const joined = value.replace(/(=\?[^?\s]+\?[BbQq]\?[^?\s]*\?=)\s+(?==\?)/g, "$1");
  return joined.replace(word, (_m, charset: string, enc: string, text: string) => {
    const cs = charset.split("*")[0]!; // RFC 2231 language suffix
    if (enc.toUpperCase() === "B") return bytesToText(Uint8Array.from(Buffer.from(text, "base64")), cs);
    return bytesToText(decodeQuotedPrintable(text.replace(/_/g, " ")), cs);
  });
}

/** Headers (unfolded, names lower-cased) and body of a raw message. */
export function splitMessage(raw: string): { headers: Map<string, string>; body: string } {
  const normal = raw.replace(/\r\n/g, "\n");
  const end = normal.indexOf("\n\n");
  const head = end < 0 ? normal : normal.slice(0, end);
  const body = end < 0 ? "" : normal.slice(end + 2);
  const headers = new Map<string, string>();
  for (const line of head.replace(/\n[ \t]+/g, " ").split("\n")) {
    const colon = line.indexOf(":");
    if (colon <= 0) continue;
    const name = line.slice(0, colon).trim().toLowerCase();
    if (!headers.has(name)) headers.set(name, line.slice(colon + 1).trim());
  }
  return { headers, body };
}

function param(header: string, name: string): string | null {
  const m = new RegExp(`${name}\\s*=\\s*("([^"]*)"|[^;\\s]+)`, "i").exec(header);
  return m ? (m[2] ?? m[1]!) : null;
}

function decodeBody(headers: Map<string, string>, body: string): string {
  const type = headers.get("content-type") ?? "text/plain; charset=us-ascii";
  if (/^multipart\//i.test(type)) {
    const boundary = param(type, "boundary");
    if (!boundary) return body;
    const parts = body.split(`--${boundary}`).slice(1);
    for (const part of parts) {
      if (part.startsWith("--")) break;
      const inner = splitMessage(part.replace(/^\n/, ""));
      const innerType = inner.headers.get("content-type") ?? "text/plain";
      if (/^text\/plain/i.test(innerType) || /^multipart\//i.test(innerType)) return decodeBody(inner.headers, inner.body.replace(/\n$/, ""));
    }
    return "";
  }
  const charset = param(type, "charset") ?? "utf-8";
  const encoding = (headers.get("content-transfer-encoding") ?? "7bit").toLowerCase();
  if (encoding === "quoted-printable") return bytesToText(decodeQuotedPrintable(body), charset).replace(/\r\n/g, "\n");
  if (encoding === "base64") return bytesToText(Uint8Array.from(Buffer.from(body.replace(/\s+/g, ""), "base64")), charset).replace(/\r\n/g, "\n");
  return body;
}

/** A raw RFC 5322 message → subject, To, Date and the plain-text body, decoded. */
export function parseRawMessage(raw: string): { subject: string; headerTo: string; from: string; date: string | null; bodyText: string } {
  const { headers, body } = splitMessage(raw);
  return {
    subject: decodeEncodedWords(headers.get("subject") ?? ""),
    headerTo: decodeEncodedWords(headers.get("to") ?? ""),
    from: decodeEncodedWords(headers.get("from") ?? ""),
    date: headers.get("date") ?? null,
    bodyText: decodeBody(headers, body).replace(/\n+$/, ""),
  };
}

/**
 * The newest `limit` messages in the spool folder (newest first), optionally only those
 * addressed to `to`. An unreadable file is skipped; a missing folder is an empty mailbox.
 */
export async function listDevMail({ dir = spoolDir(), limit = 100, to }: { dir?: string | null; limit?: number; to?: string } = {}): Promise<DevMail[]> {
  if (!dir) return [];
  let names: string[];
  try {
    names = (await readdir(dir)).filter((n) => n.endsWith(".json"));
  } catch {
    return [];
  }
  const mails: DevMail[] = [];
  for (const file of names) {
    try {
      const spooled = JSON.parse(await readFile(path.join(dir, file), "utf8")) as { receivedAt: string; from: string | null; to: string[]; raw: string };
      if (to && !spooled.to.map((a) => a.toLowerCase()).includes(to.toLowerCase())) continue;
      const parsed = parseRawMessage(spooled.raw);
      mails.push({ file, receivedAt: new Date(spooled.receivedAt), from: spooled.from, to: spooled.to, subject: parsed.subject, headerTo: parsed.headerTo, date: parsed.date, bodyText: parsed.bodyText });
    } catch {
      // a file still being written, or not ours
    }
  }
  return mails.sort((a, b) => b.receivedAt.getTime() - a.receivedAt.getTime() || b.file.localeCompare(a.file)).slice(0, limit);
}
