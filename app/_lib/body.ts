// The one way a route handler reads a request body: counted while it arrives and refused
// (413, "too-large", naming the limit) the moment it passes its limit, whether the caller
// declared a Content-Length (refused before reading) or streams a chunked body without one
// (or with a Content-Length that lies). Nothing larger than the limit is ever held in memory.
// Never call request.json(), .text(), .formData(), .arrayBuffer() or .blob() directly: they
// read the whole body first (tests/security/body-limits.test.ts checks the source for them).
import { AppError } from "@/domain/result";

/** The limits, one home: what each kind of body may hold at most, in bytes. */
export const BODY_LIMITS = {
  /** Sign-in: an e-mail address and a password (a few hundred bytes in practice). */
  signIn: 8 * 1024,
  /** Any JSON body of the API (a joint with its values and notes is a few kB). */
  json: 256 * 1024,
} as const;

/** "256 kB", "10 MB": a limit in the words the error message uses (1 kB = 1024 bytes). */
export function describeBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${+(bytes / (1024 * 1024)).toFixed(1)} MB`;
  if (bytes >= 1024) return `${+(bytes / 1024).toFixed(1)} kB`;
  return `${bytes} bytes`;
}

function tooLarge(limit: string, what: string, field?: string): AppError {
  const message = `The ${what} is larger than ${limit}, the most this address accepts.`;
  return new AppError("too-large", message, field ? { [field]: [`Larger than ${limit}.`] } : { _body: [message] });
}

export type BodyLimit = {
  max: number;
  /** What the body is, for the message ("request body", "photo"). */
  what?: string;
  /** The field a refusal names (e.g. "file"). */
  field?: string;
  /** The limit in the message when it is a file's own limit ("10 MB") and `max` adds the form's framing. */
  limitText?: string;
};

/** Reads at most `max` bytes of the body; throws AppError("too-large") as soon as it would go over (and stops reading). */
export async function readBodyLimited(request: Request, { max, what = "request body", field, limitText = describeBytes(max) }: BodyLimit): Promise<Uint8Array> {
  const header = request.headers.get("content-length");
  const declared = header === null ? NaN : Number(header);
  if (Number.isFinite(declared) && declared > max) {
    await request.body?.cancel().catch(() => undefined);
    throw tooLarge(limitText, what, field);
  }
  if (!request.body) return new Uint8Array();
  const reader = request.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > max) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge(limitText, what, field);
    }
    chunks.push(value);
  }
  const out = new Uint8Array(total);
  let offset = 0;
  for (const c of chunks) {
    out.set(c, offset);
    offset += c.byteLength;
  }
  return out;
}

const NOT_JSON = "The request body is not valid JSON.";

/** A JSON body of at most `max` bytes (an empty body is `{}`); 400 when it is not JSON. */
export async function readJsonLimited(request: Request, limit: BodyLimit = { max: BODY_LIMITS.json }): Promise<unknown> {
  const bytes = await readBodyLimited(request, limit);
  if (bytes.byteLength === 0) return {};
  let text: string;
  try {
    text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
  } catch {
    throw new AppError("bad-request", NOT_JSON, { _body: [NOT_JSON] });
  }
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError("bad-request", NOT_JSON, { _body: [NOT_JSON] });
  }
}

/** A multipart (or url-encoded) form of at most `max` bytes; 400 with `notAForm` when it cannot be read as one. */
export async function readFormLimited(request: Request, limit: BodyLimit, notAForm: { message: string; fields?: Record<string, string[]> }): Promise<FormData> {
  const bytes = await readBodyLimited(request, limit);
  try {
    return await new Response(bytes as BodyInit, { headers: { "content-type": request.headers.get("content-type") ?? "" } }).formData();
  } catch {
    throw new AppError("bad-request", notAForm.message, notAForm.fields);
  }
}
