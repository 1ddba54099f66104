// Generated secrets of the local stack, kept under `dir/secrets/` (0700 folder, 0600 files)
// so that restarts reuse them. Light on imports: backup and restore scripts read them too.
import { randomBytes } from "node:crypto";
import path from "node:path";
import { keptSecret } from "./mariadb";

export function secret(bytes = 24): string {
  return randomBytes(bytes).toString("base64url");
}

/** The local object store's generated key pair, kept under `dir/secrets/` (made on first use). */
export function localStoreKeys(dir: string): { accessKeyId: string; secretAccessKey: string } {
  const secrets = path.join(dir, "secrets");
  return {
    accessKeyId: keptSecret(path.join(secrets, "s3-access-key-id"), () => `BEADLINE${randomBytes(8).toString("hex").toUpperCase()}`),
    secretAccessKey: keptSecret(path.join(secrets, "s3-secret-access-key"), () => secret(30)),
  };
}
