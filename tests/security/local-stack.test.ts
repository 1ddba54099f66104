// The local stack that `npm start` and `npm test` run is private to the launcher's user:
// another account on the machine (here `nobody`, through runuser) can neither sign in to the
// private MariaDB nor reach its socket, read its data, objects, mail or secrets, and nobody at
// all can use the object store without the generated key pair.
// Runs against the stack tests/run.ts started (BEADLINE_DB_DIR, BEADLINE_TEST_TMP, S3_*, SMTP_*).
import { spawnSync } from "node:child_process";
import { lstatSync, readdirSync } from "node:fs";
import path from "node:path";
import { DeleteObjectCommand, GetObjectCommand, ListObjectsV2Command, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import nodemailer from "nodemailer";
import { describe, expect, it } from "vitest";
import { rootSql } from "@/database/local/mariadb";

const env = process.env;
const stackDir = env.BEADLINE_TEST_TMP!;
const dbDir = env.BEADLINE_DB_DIR!;
const dbPort = new URL(env.DATABASE_URL!).port;
const isRoot = typeof process.getuid === "function" && process.getuid() === 0;

/** Runs a command as the unprivileged `nobody` account (the test runs as root in CI). */
function asNobody(command: string, args: string[]) {
  return spawnSync("runuser", ["-u", "nobody", "--", command, ...args], { encoding: "utf8", cwd: "/" });
}

/** Every file and folder under `dir` (folders included), not following links. */
function tree(dir: string): string[] {
  const out = [dir];
  for (const name of readdirSync(dir)) {
    const p = path.join(dir, name);
    const st = lstatSync(p);
    if (st.isDirectory()) out.push(...tree(p));
    else out.push(p);
  }
  return out;
}

/** Paths under `dir` that a group or another user could read, write or enter. */
function openToOthers(dir: string): string[] {
  return tree(dir).filter((p) => {
    const st = lstatSync(p);
    return !st.isSymbolicLink() && !st.isSocket() && (st.mode & 0o077) !== 0;
  });
}

function client(accessKeyId: string, secretAccessKey: string): S3Client {
  return new S3Client({
    endpoint: env.S3_ENDPOINT,
    region: env.S3_REGION || "us-east-1",
    forcePathStyle: true,
    credentials: { accessKeyId, secretAccessKey },
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
  });
}
const owner = () => client(env.S3_ACCESS_KEY_ID!, env.S3_SECRET_ACCESS_KEY!);
const bucket = env.S3_BUCKET!;

async function statusOf(promise: Promise<unknown>): Promise<number> {
  try {
    await promise;
    return 200;
  } catch (error) {
    return (error as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode ?? 0;
  }
}

describe("private MariaDB", () => {
  it("has no root account reachable over TCP and no unlocked account without a password", () => {
    const roots = rootSql(dbDir, "SELECT host, JSON_VALUE(priv, '$.plugin') FROM mysql.global_priv WHERE user='root'").trim().split("\n");
    expect(roots).toEqual(["localhost\tunix_socket"]);
    const noPassword = rootSql(
      dbDir,
      "SELECT CONCAT(user, '@', host) FROM mysql.global_priv WHERE JSON_VALUE(priv, '$.plugin') IN ('mysql_native_password', 'mysql_old_password', 'ed25519') AND COALESCE(JSON_VALUE(priv, '$.authentication_string'), '') = '' AND COALESCE(JSON_EXTRACT(priv, '$.account_locked'), 'false') <> 'true'",
    ).trim();
    expect(noPassword).toBe("");
  });

  it("refuses root without a password over TCP, from this account and from another one", () => {
    const args = ["--no-defaults", "--protocol=TCP", "-h", "127.0.0.1", "-P", dbPort, "-u", "root", "-e", "SELECT 1"];
    const self = spawnSync("mariadb", args, { encoding: "utf8" });
    expect(self.status).not.toBe(0);
    expect(self.stderr).toMatch(/Access denied/);
    if (isRoot) {
      const other = asNobody("mariadb", args);
      expect(other.status).not.toBe(0);
      expect(other.stderr).toMatch(/Access denied/);
    }
  });

  it("keeps the application's own sign-in (generated password over TCP)", async () => {
    const url = new URL(env.DATABASE_URL!);
    const r = spawnSync("mariadb", ["--no-defaults", "--protocol=TCP", "-h", "127.0.0.1", "-P", dbPort, "-u", decodeURIComponent(url.username), "-N", "-B"], {
      encoding: "utf8",
      input: "SELECT CURRENT_USER()",
      env: { ...process.env, MYSQL_PWD: decodeURIComponent(url.password) },
    });
    expect(r.stderr).toBe("");
    expect(r.stdout.trim()).toBe(`${decodeURIComponent(url.username)}@127.0.0.1`);
  });

  it("keeps its socket in a folder only the launcher's user may enter", () => {
    const socket = path.join(dbDir, "mysqld.sock");
    expect(lstatSync(socket).isSocket()).toBe(true);
    expect(lstatSync(path.dirname(socket)).mode & 0o777).toBe(0o700);
  });

  it.runIf(isRoot)("cannot be reached through its socket by another account", () => {
    const r = asNobody("mariadb", ["--no-defaults", "-S", path.join(dbDir, "mysqld.sock"), "-u", "root", "-e", "SELECT 1"]);
    expect(r.status).not.toBe(0);
    expect(r.stderr).toMatch(/Can't connect.*\(13\)|Permission denied/s);
  });

  it("keeps its data private: 0700 folders, no file open to group or others, unreadable by another account", () => {
    expect(lstatSync(path.join(dbDir, "data")).mode & 0o777).toBe(0o700);
    expect(openToOthers(dbDir)).toEqual([]);
    if (isRoot) {
      for (const file of [path.join(dbDir, "data", "mysql", "global_priv.MAD"), path.join(dbDir, "data", "ibdata1"), path.join(dbDir, "my.cnf")]) {
        const r = asNobody("cat", [file]);
        expect(r.status, file).not.toBe(0);
        expect(r.stderr).toMatch(/Permission denied/);
      }
    }
  });
});

describe("local object store", () => {
  it("serves the generated key pair through the AWS SDK (put, list, get, delete)", async () => {
    const s3 = owner();
    const key = `local-stack-test/${Date.now()}.txt`;
    await s3.send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: "private bytes", ContentType: "text/plain" }));
    const listed = await s3.send(new ListObjectsV2Command({ Bucket: bucket, Prefix: "local-stack-test/" }));
    expect(listed.Contents?.map((o) => o.Key)).toContain(key);
    const got = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
    expect(await got.Body!.transformToString()).toBe("private bytes");
    await s3.send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
    expect(await statusOf(s3.send(new GetObjectCommand({ Bucket: bucket, Key: key })))).toBe(404);
  });

  it("refuses unsigned requests with 403: list, read, write, delete", async () => {
    const s3 = owner();
    const key = `local-stack-test/unsigned-${Date.now()}.txt`;
    await s3.send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: "keep me", ContentType: "text/plain" }));
    const base = `${env.S3_ENDPOINT}/${bucket}`;
    expect((await fetch(`${env.S3_ENDPOINT}/`)).status).toBe(403);
    expect((await fetch(`${base}?list-type=2`)).status).toBe(403);
    expect((await fetch(`${base}/${key}`)).status).toBe(403);
    expect((await fetch(`${base}/${key}`, { method: "PUT", body: "overwritten" })).status).toBe(403);
    expect((await fetch(`${base}/${key}-new`, { method: "PUT", body: "planted" })).status).toBe(403);
    expect((await fetch(`${base}/${key}`, { method: "DELETE" })).status).toBe(403);
    // Nothing changed behind the refusals.
    const got = await s3.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
    expect(await got.Body!.transformToString()).toBe("keep me");
    expect(await statusOf(s3.send(new GetObjectCommand({ Bucket: bucket, Key: `${key}-new` })))).toBe(404);
    await s3.send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
  });

  it("refuses s3rver's well-known key, an unknown key and the right key with a wrong secret", async () => {
    const list = new ListObjectsV2Command({ Bucket: bucket });
    expect(await statusOf(client("S3RVER", "S3RVER").send(list))).toBe(403);
    expect(await statusOf(client("AKIAUNKNOWNKEY000000", env.S3_SECRET_ACCESS_KEY!).send(list))).toBe(403);
    expect(await statusOf(client(env.S3_ACCESS_KEY_ID!, `${env.S3_SECRET_ACCESS_KEY}x`).send(list))).toBe(403);
    expect(await statusOf(client(env.S3_ACCESS_KEY_ID!, `${env.S3_SECRET_ACCESS_KEY}x`).send(new PutObjectCommand({ Bucket: bucket, Key: "planted", Body: "x" })))).toBe(403);
    expect(await statusOf(owner().send(new GetObjectCommand({ Bucket: bucket, Key: "planted" })))).toBe(404);
  });

  it("writes object files only the launcher's user can read (0600 in 0700 folders)", async () => {
    const key = `local-stack-test/mode-${Date.now()}.txt`;
    await owner().send(new PutObjectCommand({ Bucket: bucket, Key: key, Body: "private bytes", ContentType: "text/plain" }));
    try {
      const objects = path.join(stackDir, "objects");
      const files = tree(objects).filter((p) => lstatSync(p).isFile() && p.includes("mode-"));
      expect(files.length).toBeGreaterThan(0);
      expect(openToOthers(objects)).toEqual([]);
      if (isRoot) for (const file of files) expect(asNobody("cat", [file]).status, file).not.toBe(0);
    } finally {
      await owner().send(new DeleteObjectCommand({ Bucket: bucket, Key: key }));
    }
  });
});

describe("mail spool and generated secrets", () => {
  it("keeps caught mail in 0600 files another account cannot read", async () => {
    const transport = nodemailer.createTransport({ host: "127.0.0.1", port: Number(env.SMTP_PORT), secure: false, ignoreTLS: true });
    const subject = `Private spool check ${Date.now()}`;
    await transport.sendMail({ from: "beadline@larkmoor-gas.example", to: "clerk@larkmoor-gas.example", subject, text: "reset link" });
    const spool = env.MAIL_SPOOL_DIR!;
    const files = readdirSync(spool).map((n) => path.join(spool, n));
    expect(files.length).toBeGreaterThan(0);
    expect(lstatSync(spool).mode & 0o777).toBe(0o700);
    expect(openToOthers(spool)).toEqual([]);
    if (isRoot) expect(asNobody("cat", [files[files.length - 1]!]).status).not.toBe(0);
  });

  it("keeps the generated secrets in 0600 files inside a 0700 folder", () => {
    const secrets = path.join(stackDir, "secrets");
    expect(readdirSync(secrets).sort()).toEqual(["db-app-password", "db-owner-password", "s3-access-key-id", "s3-secret-access-key", "session-secret"]);
    expect(openToOthers(secrets)).toEqual([]);
    expect(lstatSync(stackDir).mode & 0o077).toBe(0);
    if (isRoot) expect(asNobody("cat", [path.join(secrets, "db-owner-password")]).status).not.toBe(0);
  });
});
