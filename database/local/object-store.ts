// Local S3-compatible object store for development and tests (s3rver on loopback).
// Production points S3_ENDPOINT/S3_BUCKET at real S3-compatible storage instead.
import { mkdirSync } from "node:fs";
// @ts-expect-error s3rver ships no type declarations
import S3rver from "s3rver";

export type LocalObjectStore = { endpoint: string; bucket: string; stop: () => Promise<void> };

export async function startLocalObjectStore({ dir, port, bucket }: { dir: string; port: number; bucket: string }): Promise<LocalObjectStore> {
  mkdirSync(dir, { recursive: true });
  const server = new S3rver({ port, address: "127.0.0.1", directory: dir, silent: true, configureBuckets: [{ name: bucket }] });
  await server.run();
  return {
    endpoint: `http://127.0.0.1:${port}`,
    bucket,
    stop: async () => {
      await server.close();
    },
  };
}
