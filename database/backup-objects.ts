// The object-store half of a backup: every object in the attachments bucket (bead photos,
// pressure traces, qualification evidence) copied to numbered files beside the database dump,
// and a manifest (manifest.json) naming each object's key, size, content type and SHA-256.
// Objects are streamed (never held whole in memory). A restore reads the manifest first and
// checks every file against it before anything is written.
// source: Amazon S3 API Reference — ListObjectsV2 (ContinuationToken / NextContinuationToken,
// at most 1,000 keys a page), GetObject, PutObject, DeleteObject; FIPS 180-4 (SHA-256).
import { createHash } from "node:crypto";
import { createReadStream, createWriteStream, existsSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { Transform, type Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import { DeleteObjectCommand, GetObjectCommand, ListObjectsV2Command, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { localStoreKeys } from "./local/secrets";

const ROOT = path.resolve(__dirname, "..");

/** Where the objects live: the S3_* settings the app uses. */
export type StoreTarget = { endpoint?: string; region: string; bucket: string; accessKeyId: string; secretAccessKey: string };

/** The bucket of the local fake that `npm start` runs (database/local/stack.ts); its keys are generated there. */
const DEV_BUCKET = "beadline-attachments";

/**
 * The object store to use: explicit settings, else the S3_* environment (as the app reads it),
 * else the local fake of the development server under .data/ (npm start).
 */
export function resolveStore(over: Partial<StoreTarget> = {}, dataDir = path.join(ROOT, ".data")): StoreTarget {
  const env = process.env;
  if (env.S3_BUCKET || over.bucket) {
    const accessKeyId = over.accessKeyId ?? env.S3_ACCESS_KEY_ID;
    const secretAccessKey = over.secretAccessKey ?? env.S3_SECRET_ACCESS_KEY;
    if (!accessKeyId || !secretAccessKey) throw new Error("S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY must be set with S3_BUCKET (see README).");
    return {
      endpoint: over.endpoint ?? (env.S3_ENDPOINT || undefined),
      region: over.region ?? (env.S3_REGION || "us-east-1"),
      bucket: (over.bucket ?? env.S3_BUCKET)!,
      accessKeyId,
      secretAccessKey,
    };
  }
  if (!existsSync(path.join(dataDir, "objects"))) {
    throw new Error("No object store to use: set S3_BUCKET (with S3_ENDPOINT and its keys), or run `npm start` so the development object store exists under .data/.");
  }
  return {
    endpoint: over.endpoint ?? `http://127.0.0.1:${Number(env.BEADLINE_S3_PORT || 4569)}`,
    region: over.region ?? "us-east-1",
    bucket: DEV_BUCKET,
    ...localStoreKeys(dataDir),
  };
}

/** A client configured like the app's (app/_server/storage/object-store.ts). */
export function storeClient(store: StoreTarget): S3Client {
  return new S3Client({
    endpoint: store.endpoint,
    region: store.region,
    forcePathStyle: true,
    credentials: { accessKeyId: store.accessKeyId, secretAccessKey: store.secretAccessKey },
    // Streamed bodies would otherwise be framed as aws-chunked, which S3-compatible fakes
    // store verbatim; checksums only where the API requires them.
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
}

export type ListedObject = { key: string; size: number };

/** Every object in the bucket, one page (at most 1,000 keys) at a time. */
export async function* listObjects(client: Pick<S3Client, "send">, bucket: string): AsyncGenerator<ListedObject> {
  let token: string | undefined;
  do {
    const page = await client.send(new ListObjectsV2Command({ Bucket: bucket, ContinuationToken: token }));
    for (const o of page.Contents ?? []) if (o.Key) yield { key: o.Key, size: Number(o.Size ?? 0) };
    token = page.IsTruncated ? page.NextContinuationToken : undefined;
  } while (token);
}

/** Counts bytes and computes SHA-256 of what streams through it. */
function hashingCounter(): { stream: Transform; result: () => { size: number; sha256: string } } {
  const hash = createHash("sha256");
  let size = 0;
  const stream = new Transform({
    transform(chunk: Buffer, _enc, done) {
      hash.update(chunk);
      size += chunk.length;
      done(null, chunk);
    },
  });
  return { stream, result: () => ({ size, sha256: hash.digest("hex") }) };
}

/** Size and SHA-256 of a file, streamed. */
export async function hashFile(file: string): Promise<{ size: number; sha256: string }> {
  const hash = createHash("sha256");
  let size = 0;
  for await (const chunk of createReadStream(file)) {
    hash.update(chunk as Buffer);
    size += (chunk as Buffer).length;
  }
  return { size, sha256: hash.digest("hex") };
}

export type ManifestObject = { key: string; size: number; sha256: string; contentType: string | null; file: string };

export type Manifest = {
  format: "beadline-backup";
  version: 1;
  createdAt: string;
  database: { name: string; file: string; size: number; sha256: string };
  objectStore: { bucket: string; count: number; totalSize: number };
  objects: ManifestObject[];
};

export const MANIFEST_FILE = "manifest.json";

/** The file an object is kept in: numbered, so no key ever becomes a path. */
export function objectFileName(index: number): string {
  return `objects/${String(index + 1).padStart(6, "0")}`;
}

/** Streams one object to `file`; its size must be the listed one (the object did not change). */
export async function downloadObject(client: S3Client, bucket: string, listed: ListedObject, file: string): Promise<{ size: number; sha256: string; contentType: string | null }> {
  const out = await client.send(new GetObjectCommand({ Bucket: bucket, Key: listed.key }));
  if (!out.Body) throw new Error(`The object store returned no body for "${listed.key}"`);
  const counter = hashingCounter();
  await pipeline(out.Body as Readable, counter.stream, createWriteStream(file, { mode: 0o600 }));
  const { size, sha256 } = counter.result();
  if (size !== listed.size) throw new Error(`Object "${listed.key}" was ${size} bytes when read but listed as ${listed.size}; it changed during the backup`);
  return { size, sha256, contentType: out.ContentType ?? null };
}

/** Copies every object of the bucket into `folder/objects/` and returns its manifest entries. */
export async function backupObjects(store: StoreTarget, folder: string): Promise<ManifestObject[]> {
  const client = storeClient(store);
  try {
    const entries: ManifestObject[] = [];
    for await (const listed of listObjects(client, store.bucket)) {
      const file = objectFileName(entries.length);
      const got = await downloadObject(client, store.bucket, listed, path.join(folder, file));
      entries.push({ key: listed.key, size: got.size, sha256: got.sha256, contentType: got.contentType, file });
    }
    return entries;
  } finally {
    client.destroy();
  }
}

const SHA256_HEX = /^[0-9a-f]{64}$/;

/** Reads `folder/manifest.json`; a clear error when the folder is not a Beadline backup. */
export function readManifest(folder: string): Manifest {
  const file = path.join(folder, MANIFEST_FILE);
  if (!existsSync(file)) throw new Error(`${folder} is not a Beadline backup: it has no ${MANIFEST_FILE}`);
  let m: Manifest;
  try {
    m = JSON.parse(readFileSync(file, "utf8")) as Manifest;
  } catch (error) {
    throw new Error(`${MANIFEST_FILE} in ${folder} is not valid JSON (${(error as Error).message})`);
  }
  if (m?.format !== "beadline-backup" || m.version !== 1 || !m.database || !Array.isArray(m.objects)) {
    throw new Error(`${MANIFEST_FILE} in ${folder} is not a Beadline backup manifest (version 1)`);
  }
  return m;
}

/** `name` inside `folder`, or null when the manifest points outside it. */
function inside(folder: string, name: unknown): string | null {
  if (typeof name !== "string" || !name) return null;
  const full = path.resolve(folder, name);
  const base = path.resolve(folder) + path.sep;
  return full.startsWith(base) ? full : null;
}

/**
 * Checks every file of the backup against its manifest (size and SHA-256, streamed) without
 * writing anything. Returns the problems, each naming the object key (or the database dump).
 */
export async function verifyBackup(folder: string, manifest: Manifest): Promise<string[]> {
  const problems: string[] = [];
  const check = async (label: string, name: unknown, expected: { size: unknown; sha256: unknown }) => {
    const file = inside(folder, name);
    if (!file) return problems.push(`${label}: the manifest gives no file inside the backup folder`);
    if (!existsSync(file) || !statSync(file).isFile()) return problems.push(`${label} is missing (${String(name)} not found)`);
    if (typeof expected.sha256 !== "string" || !SHA256_HEX.test(expected.sha256)) return problems.push(`${label}: the manifest's SHA-256 is not 64 hex digits`);
    const got = await hashFile(file);
    if (got.sha256 !== expected.sha256) return problems.push(`${label} does not match its SHA-256 (manifest ${expected.sha256}, file ${got.sha256})`);
    if (got.size !== expected.size) return problems.push(`${label} does not match its size (manifest ${String(expected.size)} bytes, file ${got.size})`);
  };
  await check(`The database dump "${manifest.database.file}"`, manifest.database.file, manifest.database);
  const seen = new Set<string>();
  for (const o of manifest.objects) {
    if (typeof o?.key !== "string" || !o.key) {
      problems.push("An object entry in the manifest has no key");
      continue;
    }
    if (seen.has(o.key)) problems.push(`Object "${o.key}" is listed twice in the manifest`);
    seen.add(o.key);
    await check(`Object "${o.key}"`, o.file, o);
  }
  if (manifest.objectStore && manifest.objectStore.count !== manifest.objects.length) {
    problems.push(`The manifest counts ${manifest.objectStore.count} objects but lists ${manifest.objects.length}`);
  }
  return problems;
}

/** Keys of the manifest that already exist in the bucket (a restore never overwrites one). */
export async function existingKeys(store: StoreTarget, keys: string[]): Promise<string[]> {
  const client = storeClient(store);
  try {
    const wanted = new Set(keys);
    const found: string[] = [];
    for await (const o of listObjects(client, store.bucket)) if (wanted.has(o.key)) found.push(o.key);
    return found;
  } finally {
    client.destroy();
  }
}

/**
 * Uploads the manifest's objects, each streamed from its file. On a failure, the objects this
 * call wrote are deleted again (none of them existed before) and the error is thrown.
 */
export async function restoreObjects(store: StoreTarget, folder: string, objects: ManifestObject[]): Promise<{ written: string[]; undo: () => Promise<void> }> {
  const client = storeClient(store);
  const written: string[] = [];
  const undo = async () => {
    const again = storeClient(store);
    try {
      for (const key of written) await again.send(new DeleteObjectCommand({ Bucket: store.bucket, Key: key }));
    } finally {
      again.destroy();
    }
  };
  try {
    for (const o of objects) {
      const file = inside(folder, o.file)!;
      written.push(o.key); // before the write: a failed put is deleted too (it did not exist before)
      await client.send(
        new PutObjectCommand({ Bucket: store.bucket, Key: o.key, Body: createReadStream(file), ContentLength: o.size, ContentType: o.contentType ?? "application/octet-stream" }),
      );
    }
    return { written, undo };
  } catch (error) {
    await undo().catch(() => undefined);
    throw error;
  } finally {
    client.destroy();
  }
}
