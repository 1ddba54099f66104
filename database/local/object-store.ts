// Local S3-compatible object store for development and tests (s3rver on loopback).
// Production points S3_ENDPOINT/S3_BUCKET at real S3-compatible storage instead.
// s3rver serves anyone who asks and does not check Signature Version 4, so a verifying
// step runs in front of it: a request must carry a valid SigV4 signature made with the
// generated key pair, or it is refused with 403 before s3rver sees it. Objects are written
// under the stack's umask (077): 0600 files in 0700 folders.
import { mkdirSync } from "node:fs";
// @ts-expect-error s3rver ships no type declarations
import S3rver from "s3rver";
// @ts-expect-error s3rver ships no type declarations
import AWSAccount from "s3rver/lib/models/account";
import { verifySigV4, type KeyPair } from "./sigv4";

export type LocalObjectStore = { endpoint: string; bucket: string; stop: () => Promise<void> };

type KoaContext = { req: { method?: string; url?: string; rawHeaders: string[] }; status: number; type: string; body: unknown; set: (name: string, value: string) => void };

function xmlEscape(s: string): string {
  return s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}

export async function startLocalObjectStore({ dir, port, bucket, keys }: { dir: string; port: number; bucket: string; keys: KeyPair }): Promise<LocalObjectStore> {
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  // s3rver keeps its accounts in one process-wide registry with a well-known key pair
  // (S3RVER/S3RVER): drop that one and register the generated pair.
  const account = (AWSAccount as { DUMMY_ACCOUNT: { createKeyPair: (id: string, secret: string) => void; revokeAccessKey: (id: string) => void } }).DUMMY_ACCOUNT;
  account.revokeAccessKey("S3RVER");
  account.createKeyPair(keys.accessKeyId, keys.secretAccessKey);
  const server = new S3rver({ port, address: "127.0.0.1", directory: dir, silent: true, configureBuckets: [{ name: bucket }] });
  // First in the chain: nothing reaches s3rver's handlers without a valid signature.
  (server as { middleware: unknown[] }).middleware.unshift(async (ctx: KoaContext, next: () => Promise<void>) => {
    const verdict = verifySigV4({ method: ctx.req.method ?? "GET", url: ctx.req.url ?? "/", rawHeaders: ctx.req.rawHeaders }, keys);
    if (!verdict.ok) {
      ctx.status = 403;
      ctx.type = "application/xml";
      ctx.body = `<?xml version="1.0" encoding="UTF-8"?>\n<Error><Code>${verdict.code}</Code><Message>${xmlEscape(verdict.message)}</Message></Error>`;
      return;
    }
    await next();
  });
  await server.run();
  return {
    endpoint: `http://127.0.0.1:${port}`,
    bucket,
    stop: async () => {
      await server.close();
    },
  };
}
