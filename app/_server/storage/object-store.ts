// The S3-compatible object store for attachments (bead photos, pressure traces, evidence).
// One client per process, configured from the environment: S3_ENDPOINT (a local fake on
// loopback in development and tests), S3_BUCKET, S3_REGION, S3_ACCESS_KEY_ID,
// S3_SECRET_ACCESS_KEY. The bucket is private: objects are only ever served through an
// authorised route handler, never by a public or pre-signed address.
import "server-only";
import { GetObjectCommand, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";

const globalForS3 = globalThis as unknown as { beadlineS3?: S3Client };

function required(name: string): string {
  const value = process.env[name];
  if (!value) throw new Error(`${name} is not set (npm start and npm test set it; see README).`);
  return value;
}

export function objectStore(): S3Client {
  if (!globalForS3.beadlineS3) {
    globalForS3.beadlineS3 = new S3Client({
      endpoint: process.env.S3_ENDPOINT || undefined,
      region: process.env.S3_REGION || "us-east-1",
      forcePathStyle: true,
      credentials: { accessKeyId: required("S3_ACCESS_KEY_ID"), secretAccessKey: required("S3_SECRET_ACCESS_KEY") },
      // The SDK's default (WHEN_SUPPORTED) frames streamed bodies as aws-chunked, which
      // S3-compatible fakes store verbatim (corrupt objects); checksums only when required.
      requestChecksumCalculation: "WHEN_REQUIRED",
      responseChecksumValidation: "WHEN_REQUIRED",
    });
  }
  return globalForS3.beadlineS3;
}

export function bucket(): string {
  return required("S3_BUCKET");
}

/** Stores bytes under `key` (a generated id, never a user's file name). */
export async function putObject({ key, body, contentType }: { key: string; body: Uint8Array; contentType: string }): Promise<void> {
  await objectStore().send(
    new PutObjectCommand({ Bucket: bucket(), Key: key, Body: body, ContentType: contentType, ContentLength: body.byteLength }),
  );
}

/** Reads an object back whole (attachments are at most a few MB). Null when it is missing. */
export async function getObject({ key }: { key: string }): Promise<{ body: Uint8Array; contentType: string | null } | null> {
  try {
    const out = await objectStore().send(new GetObjectCommand({ Bucket: bucket(), Key: key }));
    if (!out.Body) return null;
    const body = await out.Body.transformToByteArray();
    return { body, contentType: out.ContentType ?? null };
  } catch (error) {
    const name = (error as { name?: string; Code?: string } | null)?.name;
    if (name === "NoSuchKey" || name === "NotFound") return null;
    throw error;
  }
}
