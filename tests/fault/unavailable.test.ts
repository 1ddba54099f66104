// A database that goes away: on a private MariaDB of its own, this test stops the server
// in the middle of a transaction and while idle, and checks that every error the driver and
// knex raise is recognised as "unavailable" (→ 503 with Retry-After through the guard, never
// a 500), that a request fails within the 10 s budget, that nothing of the interrupted
// transaction is kept, and that the same pool works again once the server is back.
// The full HTTP version (real `next start`, concurrent clients) is tests/e2e/outage.spec.ts.
// source: common practice (no published source); RFC 9110 §15.6.4 (503, Retry-After).
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import knexFactory, { type Knex } from "knex";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { z } from "zod";
import { defineRoute } from "@/app/_lib/guard";
import { captureLogs } from "@/app/_lib/log";
import { isDatabaseUnavailable } from "@/database/client";
import { freePort, rootSql, startMariadb, type MariadbServer } from "@/database/local/mariadb";
import { resetDatabase } from "../support/db";
import { cookieHeaderFor, requestAs } from "../support/session";
import { makeUser } from "../support/users";

// eslint-disable-next-line @typescript-eslint/no-require-imports
const baseConfig = require("../../knexfile.js") as Knex.Config;

describe("database outage at the driver and guard", () => {
  const dir = mkdtempSync(path.join(os.tmpdir(), "beadline-fault-"));
  let server: MariadbServer;
  let port: number;
  let k: Knex;

  beforeAll(async () => {
    port = await freePort();
    server = await startMariadb({ dir, port });
    rootSql(server.dir, "CREATE DATABASE fault; CREATE USER 'f'@'127.0.0.1' IDENTIFIED BY 'fault-pw'; GRANT ALL ON fault.* TO 'f'@'127.0.0.1'; CREATE TABLE fault.t (id INT PRIMARY KEY, v VARCHAR(20)) ENGINE=InnoDB;");
    // The app's own pool settings (knexfile.js), pointed at this private server.
    const appConnection = (baseConfig.connection as () => Knex.MySql2ConnectionConfig)();
    k = knexFactory({ ...baseConfig, connection: { ...appConnection, host: "127.0.0.1", port, user: "f", password: "fault-pw", database: "fault" } });
    await resetDatabase();
  }, 60_000);

  afterAll(async () => {
    await k?.destroy();
    await server?.stop();
    rmSync(dir, { recursive: true, force: true });
  });

  it("a transaction cut off by a shutdown fails as 'unavailable', and none of it is kept", async () => {
    let caught: unknown = null;
    try {
      await k.transaction(async (trx) => {
        await trx("t").insert({ id: 1, v: "half" });
        await server.stop();
        await trx("t").insert({ id: 2, v: "never" });
      });
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeTruthy();
    expect(isDatabaseUnavailable(caught), String((caught as Error)?.message)).toBe(true);

    // While the server is down: a fresh query fails fast, and is recognised too.
    const started = Date.now();
    const down = await k.raw("SELECT 1").catch((e: unknown) => e);
    expect(Date.now() - started).toBeLessThan(10_000);
    expect(isDatabaseUnavailable(down), String((down as Error)?.message)).toBe(true);

    // Back up on the same data directory and port: the same pool recovers by itself.
    server = await startMariadb({ dir, port });
    let rows: { id: number }[] = [];
    for (let i = 0; i < 20; i += 1) {
      try {
        rows = (await k("t").select("id")) as { id: number }[];
        break;
      } catch (error) {
        expect(isDatabaseUnavailable(error)).toBe(true);
        await new Promise((r) => setTimeout(r, 250));
      }
    }
    expect(rows).toEqual([]); // the interrupted transaction left nothing
    await k("t").insert({ id: 3, v: "after" });
    expect(await k("t").count({ n: "*" }).first()).toMatchObject({ n: 1 });
  }, 60_000);

  it("the guard answers 503 with Retry-After and the one error shape, not a 500", async () => {
    const u = await makeUser({ roles: ["admin"] });
    const route = defineRoute({ permission: "signed-in" }, async () => {
      await k("t").insert({ id: 10, v: "x" });
      return Response.json({ ok: true }, { status: 201 });
    });
    await server.stop();
    const started = Date.now();
    const res = await route(await requestAs(u, "/api/v1/x", { method: "POST", json: {} }), { params: Promise.resolve({}) });
    expect(Date.now() - started).toBeLessThan(10_000);
    expect(res.status).toBe(503);
    expect(res.headers.get("retry-after")).toBeTruthy();
    expect(await res.json()).toEqual({ error: { code: "unavailable", message: expect.stringMatching(/cannot reach its database.*Nothing was saved/) } });
    server = await startMariadb({ dir, port });
  }, 60_000);

  it("a client hanging up mid-body is not reported as a database outage", async () => {
    const u = await makeUser({ roles: ["admin"] });
    const route = defineRoute({ permission: "signed-in", schema: z.object({ a: z.string() }) }, async () => Response.json({ ok: true }));
    const body = new ReadableStream<Uint8Array>({
      start(controller) {
        controller.enqueue(new TextEncoder().encode('{"a":'));
        // What Node's HTTP server raises when the client's socket closes while the body is read.
        controller.error(Object.assign(new Error("aborted"), { code: "ECONNRESET" }));
      },
    });
    const logs = captureLogs("info");
    try {
      const headers = { ...(await cookieHeaderFor(u)), "content-type": "application/json" };
      const res = await route(new Request("http://127.0.0.1:3000/api/v1/x", { method: "POST", headers, body, duplex: "half" } as RequestInit), { params: Promise.resolve({}) });
      expect(res.status).toBe(400);
      const msgs = logs.records().map((r) => r.msg);
      expect(msgs).toContain("client closed the request");
      expect(msgs).not.toContain("database unavailable");
    } finally {
      logs.stop();
    }
  });

  it("recognises the driver's and pool's outage errors, and not ordinary ones", () => {
    // Shapes seen from mysql2 / knex / tarn during outages (codes per the MariaDB error list).
    for (const e of [
      { code: "ECONNREFUSED", message: "connect ECONNREFUSED 127.0.0.1:3307" },
      { code: "PROTOCOL_CONNECTION_LOST", message: "Connection lost: The server closed the connection.", fatal: true },
      { message: "ROLLBACK - Can't add new command when connection is in closed state" },
      { code: "ER_SERVER_SHUTDOWN", message: "Server shutdown in progress" },
      { code: "ER_CONNECTION_KILLED", message: "Connection was killed" },
      { name: "KnexTimeoutError", message: "Knex: Timeout acquiring a connection. The pool is probably full." },
    ]) {
      expect(isDatabaseUnavailable(e), e.message).toBe(true);
    }
    for (const e of [{ code: "ER_DUP_ENTRY", message: "Duplicate entry 'x' for key 'client_id'" }, { code: "ER_NO_SUCH_TABLE", message: "Table 'x' doesn't exist" }, new Error("boom"), null, undefined, "text"]) {
      expect(isDatabaseUnavailable(e)).toBe(false);
    }
  });
});
