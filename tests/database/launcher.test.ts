// The private MariaDB launcher: a second start reuses the data directory and the data is still there.
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { freePort, rootSql, startMariadb } from "@/database/local/mariadb";

describe("local MariaDB launcher", () => {
  const dir = mkdtempSync(path.join(os.tmpdir(), "beadline-launcher-"));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it("keeps data across a stop and a second start on the same directory", async () => {
    const port = await freePort();
    const first = await startMariadb({ dir, port });
    rootSql(dir, "CREATE DATABASE keepme; CREATE TABLE keepme.t (v VARCHAR(20)); INSERT INTO keepme.t VALUES ('still here');");
    await first.stop();
    expect(first.process.exitCode).not.toBeNull();

    const second = await startMariadb({ dir, port: await freePort() });
    try {
      expect(rootSql(dir, "SELECT v FROM keepme.t").trim()).toBe("still here");
    } finally {
      await second.stop();
    }
  }, 60_000);
});
