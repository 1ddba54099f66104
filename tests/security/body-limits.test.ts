// Request bodies are counted while they arrive: a body past its limit is refused with 413 in
// the error shape, naming the limit, after reading at most the limit and one more chunk —
// whether it comes chunked with no Content-Length (a stream), with a Content-Length that lies
// (says small, sends more), or declares a size over the limit (refused before reading).
// source: OWASP Denial of Service Cheat Sheet (limit request body size, reject early) and
// RFC 9110 §15.5.14 (413 Content Too Large).
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import { POST as sessionPost } from "@/app/api/v1/session/route";
import { POST as jointsPost } from "@/app/api/v1/joints/route";
import { POST as tracesPost } from "@/app/api/v1/traces/route";
import { POST as attachmentsPost } from "@/app/api/v1/attachments/route";
import { BODY_LIMITS } from "@/app/_lib/body";
import { resetDatabase } from "../support/db";
import { cookieHeaderFor } from "../support/session";
import { makeUser } from "../support/users";

const ctx = { params: Promise.resolve({}) };
const MiB = 1024 * 1024;
const CHUNK = 64 * 1024;

/** A body of `total` bytes made as it is read, counting what the server pulled. */
function countingStream(total: number, fill = 0x20): { stream: ReadableStream<Uint8Array>; pulled: () => number } {
  let sent = 0;
  const stream = new ReadableStream<Uint8Array>({
    pull(controller) {
      if (sent >= total) return controller.close();
      const n = Math.min(CHUNK, total - sent);
      sent += n;
      controller.enqueue(new Uint8Array(n).fill(fill));
    },
  });
  return { stream, pulled: () => sent };
}

function post(url: string, body: ReadableStream<Uint8Array> | string, headers: Record<string, string>): Request {
  return new Request(new URL(url, "http://127.0.0.1:3000"), { method: "POST", body, headers: { host: "127.0.0.1:3000", ...headers }, duplex: "half" } as RequestInit);
}

async function expect413(res: Response, limitWords: string): Promise<void> {
  expect(res.status).toBe(413);
  const body = (await res.json()) as { error: { code: string; message: string } };
  expect(body.error.code).toBe("too-large");
  expect(body.error.message).toContain(limitWords);
}

describe("request body limits", () => {
  let fuser: { id: number };
  let inspector: { id: number };

  beforeAll(async () => {
    await resetDatabase();
    fuser = await makeUser({ roles: ["fuser"] });
    inspector = await makeUser({ roles: ["inspector"] });
  });

  it("sign-in: a 400 MiB chunked body with no Content-Length is refused with 413 after at most 8 kB and a chunk", async () => {
    const { stream, pulled } = countingStream(400 * MiB);
    const res = await sessionPost(post("/api/v1/session", stream, { "content-type": "application/json" }));
    await expect413(res, "8 kB");
    expect(pulled()).toBeLessThanOrEqual(BODY_LIMITS.signIn + 2 * CHUNK);
  });

  it("sign-in: a Content-Length that lies (says 20 bytes, sends 5 MiB) is refused with 413 while reading", async () => {
    const { stream, pulled } = countingStream(5 * MiB);
    const res = await sessionPost(post("/api/v1/session", stream, { "content-type": "application/json", "content-length": "20" }));
    await expect413(res, "8 kB");
    expect(pulled()).toBeLessThan(5 * MiB);
  });

  it("sign-in: a declared Content-Length over the limit is refused before anything is read", async () => {
    const { stream, pulled } = countingStream(1 * MiB);
    const res = await sessionPost(post("/api/v1/session", stream, { "content-type": "application/json", "content-length": String(1 * MiB) }));
    await expect413(res, "8 kB");
    expect(pulled()).toBeLessThanOrEqual(2 * CHUNK);
  });

  it("sign-in: a body within the limit is still read (a wrong password is a 401, not a 413)", async () => {
    const res = await sessionPost(post("/api/v1/session", JSON.stringify({ email: "nobody@test.example", password: "not-the-password-1" }), { "content-type": "application/json" }));
    expect(res.status).toBe(401);
  });

  it("joints: a 50 MiB chunked body is refused with 413 after at most 256 kB and a chunk", async () => {
    const { stream, pulled } = countingStream(50 * MiB);
    const res = await jointsPost(post("/api/v1/joints", stream, { "content-type": "application/json", ...(await cookieHeaderFor(fuser)) }), ctx);
    await expect413(res, "256 kB");
    expect(res.headers.get("connection")).toBe("close");
    expect(pulled()).toBeLessThanOrEqual(BODY_LIMITS.json + 2 * CHUNK);
  });

  it("traces: a 50 MiB multipart stream is refused with 413 naming the file, after at most the trace limit and a chunk", async () => {
    const { stream, pulled } = countingStream(50 * MiB);
    const res = await tracesPost(post("/api/v1/traces", stream, { "content-type": "multipart/form-data; boundary=x", ...(await cookieHeaderFor(inspector)) }), ctx);
    expect(res.status).toBe(413);
    const body = (await res.json()) as { error: { code: string; message: string; fields: Record<string, string[]> } };
    expect(body.error.message).toContain("larger than 2 MB");
    expect(Object.keys(body.error.fields)).toEqual(["file"]);
    expect(pulled()).toBeLessThanOrEqual(2_000_000 + 64 * 1024 + 2 * CHUNK);
  });

  it("photos: a 200 MiB multipart stream is refused with 413 after at most 10 MB and a chunk", async () => {
    const { stream, pulled } = countingStream(200 * MiB);
    const res = await attachmentsPost(post("/api/v1/attachments", stream, { "content-type": "multipart/form-data; boundary=x", ...(await cookieHeaderFor(fuser)) }), ctx);
    await expect413(res, "10 MB");
    expect(pulled()).toBeLessThanOrEqual(10 * MiB + 64 * 1024 + 2 * CHUNK);
  });
});

describe("no route handler reads a whole body", () => {
  function walk(dir: string): string[] {
    return readdirSync(dir).flatMap((entry) => {
      const full = path.join(dir, entry);
      return statSync(full).isDirectory() ? walk(full) : /\.(ts|tsx)$/.test(entry) ? [full] : [];
    });
  }

  it("no file under app/ calls request.json(), .text(), .formData(), .arrayBuffer() or .blob() outside the bounded reader", () => {
    const offenders = walk(path.join(process.cwd(), "app"))
      .filter((f) => !f.endsWith(path.join("_lib", "body.ts")))
      .flatMap((f) =>
        readFileSync(f, "utf8")
          .split("\n")
          .map((line, i) => ({ line, at: `${path.relative(process.cwd(), f)}:${i + 1}` }))
          .filter(({ line }) => /\b(?:request|req)(?:\.clone\(\))?\.(?:json|text|formData|arrayBuffer|blob)\(/.test(line))
          .map(({ at }) => at),
      );
    expect(offenders).toEqual([]);
  });
});
