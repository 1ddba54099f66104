// Backup of the database AND the object store: a bead photo (a real PNG written by pngjs), a
// pressure trace (CSV) and qualification evidence (a real JPEG written by sharp) go into their
// own bucket, with the rows that name them; `db:backup` copies both with a manifest; the
// database and the bucket are wiped; `db:restore` brings back every object byte for byte and
// every row. A backup whose files do not match its manifest is refused and nothing is written;
// a load that fails part-way is undone.
// References outside the project: SHA-256 from node:crypto (FIPS 180-4) over the bytes the
// libraries produced; the PNG decoded again with pngjs (PNG, RFC 2083) and the JPEG's
// dimensions read by sharp; ListObjectsV2 paging (Amazon S3 API Reference, ContinuationToken).
import { createHash } from "node:crypto";
import { cpSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { gzipSync } from "node:zlib";
import { CreateBucketCommand, DeleteBucketCommand, DeleteObjectCommand, GetObjectCommand, PutObjectCommand, type ListObjectsV2Command, type ListObjectsV2CommandOutput, type S3Client } from "@aws-sdk/client-s3";
import type { Knex } from "knex";
import { PNG } from "pngjs";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { attachmentProblems, backupEverything } from "@/database/backup";
import { listObjects, resolveStore, storeClient, type Manifest } from "@/database/backup-objects";
import { rootSql } from "@/database/local/mariadb";
import { migrateLatest, ownerKnex } from "@/database/migrate";
import { insertAttachment } from "@/database/queries/attachments";
import { insertQualification } from "@/database/queries/qualifications";
import { restoreBackup } from "@/database/restore";
import { pressureTraceToCsv } from "@/domain/pressure-trace/parse";
import { synthesizePressureTrace } from "@/domain/pressure-trace/synthesize";
import { makeReviewBase, makeReviewJoint } from "@/fixtures/review-joints";

const suffix = `${process.pid}`;
const DB = `bl_objbackup_${suffix}`;
const FRESH = `bl_objbackup_fresh_${suffix}`;
const BUCKET = `bl-objbackup-${suffix}`;
const FRESH_BUCKET = `bl-objbackup-fresh-${suffix}`;

function urlFor(database: string): string {
  const u = new URL(process.env.MIGRATION_DATABASE_URL!);
  u.pathname = `/${database}`;
  return u.toString();
}

const sha256 = (bytes: Uint8Array) => createHash("sha256").update(bytes).digest("hex");

/** A 48 × 32 RGBA gradient written by pngjs (not by project code). */
function gradientPng(): Buffer {
  const png = new PNG({ width: 48, height: 32 });
  for (let y = 0; y < 32; y++) {
    for (let x = 0; x < 48; x++) {
      const i = (y * 48 + x) * 4;
      png.data[i] = x * 5;
      png.data[i + 1] = y * 8;
      png.data[i + 2] = 128;
      png.data[i + 3] = 255;
    }
  }
  return PNG.sync.write(png);
}

/** A noisy 640 × 480 JPEG from sharp: large enough to arrive in several stream chunks. */
async function noisyJpeg(): Promise<Buffer> {
  const raw = Buffer.alloc(640 * 480 * 3);
  let s = 12345;
  for (let i = 0; i < raw.length; i++) {
    s = (s * 1103515245 + 12345) >>> 0;
    raw[i] = s >>> 24;
  }
  return sharp(raw, { raw: { width: 640, height: 480, channels: 3 } }).jpeg({ quality: 95 }).toBuffer();
}

async function bucketKeys(client: S3Client, bucket: string): Promise<string[]> {
  const keys: string[] = [];
  for await (const o of listObjects(client, bucket)) keys.push(o.key);
  return keys.sort();
}

async function emptyBucket(client: S3Client, bucket: string): Promise<void> {
  for (const key of await bucketKeys(client, bucket)) await client.send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
}

async function readObject(client: S3Client, bucket: string, key: string): Promise<{ bytes: Buffer; contentType: string | undefined }> {
  const out = await client.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
  return { bytes: Buffer.from(await out.Body!.transformToByteArray()), contentType: out.ContentType };
}

/** Rows that name the objects, in a stable order (dates as ISO text). */
async function referencingRows(k: Knex) {
  const plain = (rows: Record<string, unknown>[]) => rows.map((r) => Object.fromEntries(Object.entries(r).map(([c, v]) => [c, v instanceof Date ? v.toISOString() : v])));
  return {
    attachments: plain(await k("attachments").orderBy("id")),
    qualifications: plain(await k("qualifications").orderBy("id")),
    joints: plain(await k("joints").orderBy("id").select("id", "joint_no", "fuser_id")),
  };
}

async function countIn(sql: string, database: string): Promise<number> {
  const k = ownerKnex(urlFor("information_schema"));
  try {
    const [[row]] = (await k.raw(sql, [database])) as [{ n: number }[]];
    return Number(row.n);
  } finally {
    await k.destroy();
  }
}
const tableCount = (database: string) => countIn("SELECT COUNT(*) AS n FROM information_schema.tables WHERE table_schema = ?", database);
const databaseCount = (database: string) => countIn("SELECT COUNT(*) AS n FROM information_schema.schemata WHERE schema_name = ?", database);

describe("backup and restore of the database with its objects", () => {
  const dbDir = process.env.BEADLINE_DB_DIR!;
  const owner = new URL(process.env.MIGRATION_DATABASE_URL!).username;
  const tmp = mkdtempSync(path.join(os.tmpdir(), "beadline-objbackup-"));
  const store = resolveStore({ bucket: BUCKET });
  const client = storeClient(store);
  let k: Knex;
  let backupFolder = "";
  const files: { key: string; bytes: Buffer; contentType: string; kind: "bead-photo" | "pressure-trace" | "qualification-evidence" }[] = [];

  beforeAll(async () => {
    expect(dbDir, "npm test exports BEADLINE_DB_DIR").toBeTruthy();
    rootSql(
      dbDir,
      [
        ...[DB, FRESH].map((d) => `DROP DATABASE IF EXISTS \`${d}\``),
        `CREATE DATABASE \`${DB}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`,
        ...[DB, FRESH].flatMap((d) => ["127.0.0.1", "localhost"].map((h) => `GRANT ALL PRIVILEGES ON \`${d}\`.* TO '${owner}'@'${h}'`)),
      ].join(";\n") + ";",
    );
    await migrateLatest(urlFor(DB));
    k = ownerKnex(urlFor(DB));
    for (const b of [BUCKET, FRESH_BUCKET]) await client.send(new CreateBucketCommand({ Bucket: b }));

    // Three files as the app stores them: a generated key per object, a row per file.
    const trace = synthesizePressureTrace({ sampleIntervalS: 0.5, beadUpS: 20, heatSoakS: 60, changeoverS: 6, pressureBuildUpS: 3, coolingS: 200, beadUpGaugePressureMpa: 0.3, dragPressureMpa: 0.07, fusionGaugePressureMpa: 0.3, heaterTemperatureC: 218, noiseMpa: 0.004, seed: 3 });
    files.push(
      { kind: "bead-photo", key: "bead-photos/0b6f7a52-1d6e-4c1e-9a51-6f0f1f3c2a10", bytes: gradientPng(), contentType: "image/png" },
      { kind: "pressure-trace", key: "pressure-trace/5d1c9e0a-77b2-4f4e-8d0e-2b1a9c3e4f50.csv", bytes: Buffer.from(pressureTraceToCsv(trace.samples, "mpa")), contentType: "text/csv" },
      { kind: "qualification-evidence", key: "qualification-evidence/9e2d4c61-3a8b-4d7f-b0c2-1e5f6a7b8c90.jpg", bytes: await noisyJpeg(), contentType: "image/jpeg" },
    );
    for (const f of files) await client.send(new PutObjectCommand({ Bucket: BUCKET, Key: f.key, Body: f.bytes, ContentType: f.contentType, ContentLength: f.bytes.byteLength }));

    const [fuserId] = await k("users").insert({ name: "Ivo Brannock", email: `fuser-${suffix}@larkmoor-gas.example`, password_hash: "x", roles: "fuser" });
    const [inspectorId] = await k("users").insert({ name: "Tamsin Orrey", email: `qa-${suffix}@larkmoor-gas.example`, password_hash: "x", roles: "inspector" });
    const base = await makeReviewBase(k);
    const joint = await makeReviewJoint(k, base, { fuserId: Number(fuserId), madeAt: new Date("2026-11-25T08:00:00Z") });
    const ids: Record<string, number> = {};
    for (const f of files) {
      ids[f.kind] = await insertAttachment(
        { kind: f.kind, objectKey: f.key, contentType: f.contentType, sizeBytes: f.bytes.byteLength, sha256: sha256(f.bytes), originalName: `${f.kind}.bin`, uploadedBy: Number(inspectorId), jointId: f.kind === "qualification-evidence" ? null : joint.jointId },
        k,
      );
    }
    await insertQualification({ userId: Number(fuserId), procedureId: base.procedureId, qualifiedOn: "2026-10-01", method: "visual-bend", specimenResult: "Bend test passed", evaluator: "Tamsin Orrey", evidenceAttachmentId: ids["qualification-evidence"], recordedBy: Number(inspectorId) }, k);
  }, 120_000);

  afterAll(async () => {
    await k?.destroy();
    for (const b of [BUCKET, FRESH_BUCKET]) {
      await emptyBucket(client, b).catch(() => undefined);
      await client.send(new DeleteBucketCommand({ Bucket: b })).catch(() => undefined);
    }
    client.destroy();
    rootSql(dbDir, [DB, FRESH].map((d) => `DROP DATABASE IF EXISTS \`${d}\``).join(";\n") + ";");
    rmSync(tmp, { recursive: true, force: true });
  });

  it("backs up, survives a wiped database and bucket, and restores every object byte for byte with its rows", async () => {
    const rowsBefore = await referencingRows(k);
    expect(rowsBefore.attachments).toHaveLength(3);
    expect(rowsBefore.qualifications).toHaveLength(1);

    const result = await backupEverything({ url: urlFor(DB), store: { bucket: BUCKET }, folder: path.join(tmp, "backup"), now: new Date("2026-12-02T14:50:00Z") });
    backupFolder = result.folder;
    expect(result).toMatchObject({ objects: 3, attachmentsChecked: 3, problems: [] });
    expect(existsSync(`${backupFolder}.partial`)).toBe(false);

    const manifest = JSON.parse(readFileSync(path.join(backupFolder, "manifest.json"), "utf8")) as Manifest;
    expect(manifest.objects.map((o) => o.key).sort()).toEqual(files.map((f) => f.key).sort());
    for (const f of files) {
      const entry = manifest.objects.find((o) => o.key === f.key)!;
      expect(entry, f.key).toMatchObject({ size: f.bytes.byteLength, sha256: sha256(f.bytes), contentType: f.contentType });
      expect(readFileSync(path.join(backupFolder, entry.file)).equals(f.bytes), f.key).toBe(true);
    }
    expect(manifest.database.sha256).toBe(sha256(readFileSync(path.join(backupFolder, manifest.database.file))));

    // Wipe both.
    await k.destroy();
    rootSql(dbDir, `DROP DATABASE \`${DB}\`; CREATE DATABASE \`${DB}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci;`);
    await emptyBucket(client, BUCKET);
    expect(await bucketKeys(client, BUCKET)).toEqual([]);
    expect(await tableCount(DB)).toBe(0);

    const restored = await restoreBackup({ folder: backupFolder, url: urlFor(DB), store: { bucket: BUCKET } });
    expect(restored).toMatchObject({ objects: 3, attachmentsChecked: 3, problems: [] });

    expect(await bucketKeys(client, BUCKET)).toEqual(files.map((f) => f.key).sort());
    for (const f of files) {
      const got = await readObject(client, BUCKET, f.key);
      expect(sha256(got.bytes), f.key).toBe(sha256(f.bytes));
      expect(got.bytes.equals(f.bytes), f.key).toBe(true);
      expect(got.contentType, f.key).toBe(f.contentType);
    }
    // The photo is still a picture: pngjs decodes the same pixels.
    const photo = (await readObject(client, BUCKET, files[0].key)).bytes;
    const decoded = PNG.sync.read(photo);
    expect([decoded.width, decoded.height]).toEqual([48, 32]);
    expect(decoded.data.equals(PNG.sync.read(files[0].bytes).data)).toBe(true);
    expect(await sharp((await readObject(client, BUCKET, files[2].key)).bytes).metadata()).toMatchObject({ format: "jpeg", width: 640, height: 480 });

    k = ownerKnex(urlFor(DB));
    expect(await referencingRows(k)).toEqual(rowsBefore);
  }, 120_000);

  /** A copy of the good backup, changed by `tamper`. */
  function tamperedCopy(name: string, tamper: (folder: string, manifest: Manifest) => Manifest | void): string {
    const folder = path.join(tmp, name);
    cpSync(backupFolder, folder, { recursive: true });
    const manifestFile = path.join(folder, "manifest.json");
    const manifest = JSON.parse(readFileSync(manifestFile, "utf8")) as Manifest;
    const changed = tamper(folder, manifest);
    if (changed) writeFileSync(manifestFile, JSON.stringify(changed, null, 2));
    return folder;
  }

  async function expectNothingWritten() {
    expect(await databaseCount(FRESH), "the target database was not even created").toBe(0);
    expect(await bucketKeys(client, FRESH_BUCKET)).toEqual([]);
  }

  it("refuses a backup that does not match its manifest, names the object and writes nothing", async () => {
    expect(backupFolder, "the round trip ran first").not.toBe("");
    const photoKey = files[0].key;
    const flip = (hex: string) => (hex[0] === "0" ? "1" : "0") + hex.slice(1);

    const cases: { name: string; tamper: (folder: string, m: Manifest) => Manifest | void; message: RegExp }[] = [
      {
        name: "manifest-hash-changed",
        tamper: (_f, m) => ({ ...m, objects: m.objects.map((o) => (o.key === photoKey ? { ...o, sha256: flip(o.sha256) } : o)) }),
        message: new RegExp(`Object "${photoKey}" does not match its SHA-256`),
      },
      {
        name: "object-bytes-changed",
        tamper: (folder, m) => {
          const file = path.join(folder, m.objects.find((o) => o.key === photoKey)!.file);
          const bytes = readFileSync(file);
          bytes[bytes.length - 20] ^= 0xff;
          writeFileSync(file, bytes);
        },
        message: new RegExp(`Object "${photoKey}" does not match its SHA-256`),
      },
      {
        name: "object-file-missing",
        tamper: (folder, m) => rmSync(path.join(folder, m.objects.find((o) => o.key === files[1].key)!.file)),
        message: new RegExp(`Object "${files[1].key.replace(/\./g, "\\.")}" is missing`),
      },
      {
        name: "object-file-outside",
        tamper: (_f, m) => ({ ...m, objects: m.objects.map((o) => (o.key === photoKey ? { ...o, file: "../../etc/passwd" } : o)) }),
        message: new RegExp(`Object "${photoKey}": the manifest gives no file inside the backup folder`),
      },
      {
        name: "dump-changed",
        tamper: (folder, m) => writeFileSync(path.join(folder, m.database.file), gzipSync("-- not the dump\n")),
        message: /The database dump ".*" does not match its SHA-256/,
      },
    ];
    for (const c of cases) {
      const folder = tamperedCopy(c.name, c.tamper);
      const error = await restoreBackup({ folder, url: urlFor(FRESH), store: { bucket: FRESH_BUCKET } }).then(
        () => null,
        (e: Error) => e,
      );
      expect(error?.message, c.name).toMatch(/^Refusing to restore: the backup does not match its manifest; nothing was restored\./);
      expect(error?.message, c.name).toMatch(c.message);
      await expectNothingWritten();
    }
    // The refusal is specific: the untouched copy passes the same check.
    expect(readdirSync(path.join(backupFolder, "objects"))).toHaveLength(3);
  }, 120_000);

  it("undoes a restore whose database load fails part-way, and refuses a bucket that already holds a key", async () => {
    // A dump that matches its manifest but fails while loading (one table, then an error).
    const folder = tamperedCopy("load-fails", (f, m) => {
      const dump = gzipSync("CREATE TABLE first_table (id INT);\nTHIS IS NOT SQL;\n");
      writeFileSync(path.join(f, m.database.file), dump);
      return { ...m, database: { ...m.database, size: dump.byteLength, sha256: sha256(dump) } };
    });
    await expect(restoreBackup({ folder, url: urlFor(FRESH), store: { bucket: FRESH_BUCKET } })).rejects.toThrow(/Restore failed and was undone/);
    await expectNothingWritten();

    await client.send(new PutObjectCommand({ Bucket: FRESH_BUCKET, Key: files[1].key, Body: Buffer.from("other"), ContentLength: 5 }));
    await expect(restoreBackup({ folder: backupFolder, url: urlFor(FRESH), store: { bucket: FRESH_BUCKET } })).rejects.toThrow(
      new RegExp(`already holds 1 of the backup's objects \\(first: "${files[1].key.replace(/\./g, "\\.")}"\\); nothing was restored`),
    );
    expect(await databaseCount(FRESH)).toBe(0);
    expect((await readObject(client, FRESH_BUCKET, files[1].key)).bytes.toString()).toBe("other");
  }, 120_000);

  // The local fake cannot page (its continuation token uses single DES, which Node's OpenSSL 3
  // refuses), so the paging loop is checked against a stand-in answering as the Amazon S3 API
  // Reference describes ListObjectsV2: IsTruncated with NextContinuationToken, sent back as
  // ContinuationToken, until a page is not truncated.
  it("lists every page of a large bucket", async () => {
    const keyAt = (i: number) => `bead-photos/${String(i).padStart(5, "0")}`;
    const asked: (string | undefined)[] = [];
    const stub = {
      send: async (command: ListObjectsV2Command): Promise<Partial<ListObjectsV2CommandOutput>> => {
        const token = command.input.ContinuationToken;
        asked.push(token);
        const start = token ? Number(token.slice(1)) : 0;
        const end = Math.min(start + 1000, 2500);
        const contents = Array.from({ length: end - start }, (_, j) => ({ Key: keyAt(start + j), Size: start + j }));
        return { Contents: contents, IsTruncated: end < 2500, NextContinuationToken: end < 2500 ? `t${end}` : undefined };
      },
    };
    const keys: string[] = [];
    for await (const o of listObjects(stub as unknown as Pick<S3Client, "send">, "any")) keys.push(o.key);
    expect(asked).toEqual([undefined, "t1000", "t2000"]);
    expect(keys).toHaveLength(2500);
    expect(new Set(keys).size).toBe(2500);
    expect(keys.at(-1)).toBe(keyAt(2499));
  });

  it("names attachment records whose object is missing or differs from the recorded SHA-256", () => {
    const photo = files[0];
    const objects = [{ key: photo.key, size: photo.bytes.byteLength, sha256: sha256(photo.bytes), contentType: "image/png", file: "objects/000001" }];
    const problems = attachmentProblems(
      [
        { id: 1, object_key: photo.key, sha256: sha256(photo.bytes) },
        { id: 2, object_key: photo.key, sha256: sha256(Buffer.from("other bytes")) },
        { id: 3, object_key: "bead-photos/never-stored", sha256: sha256(photo.bytes) },
      ],
      objects,
    );
    expect(problems).toEqual([
      `Attachment 2: object "${photo.key}" has SHA-256 ${sha256(photo.bytes)}, the record says ${sha256(Buffer.from("other bytes"))}`,
      'Attachment 3: object "bead-photos/never-stored" is not in the store',
    ]);
  });
});
