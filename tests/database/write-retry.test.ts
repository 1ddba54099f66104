// Write transactions rerun as a whole on a deadlock (database/client.ts writeTransaction,
// behind every db().transaction(callback)). The deadlock here is a real one, made by
// MariaDB's InnoDB: two connections update two rows in opposite order. InnoDB rolls back
// the smaller of the two — "InnoDB tries to pick small transactions to roll back, where the
// size of a transaction is determined by the number of rows inserted, updated, or deleted"
// (source: MySQL Reference Manual §17.7.5.2 "Deadlock Detection"; MariaDB's InnoDB behaves
// the same) — so the opposing transaction changes five rows first and the transaction under
// test, one row, is the one chosen. A Galera certification failure reaches the client as
// the same error (errno 1213, ER_LOCK_DEADLOCK; source: MariaDB Galera Cluster known
// limitations and its test suite's recorded results, "ERROR 40001: Deadlock found when
// trying to get lock; try restarting transaction" at COMMIT).
import { afterAll, beforeEach, describe, expect, it } from "vitest";
import { defineRoute } from "@/app/_lib/guard";
import { db, isWriteContention, writeRetryReason, writeRetryStats, writeTransaction, WriteRetriesExhausted } from "@/database/client";
import { insertAuditEntry } from "@/database/queries/audit-log";
import { closeOwnerDb, ownerDb, resetDatabase } from "../support/db";
import { requestAs } from "../support/session";
import { makeUser } from "../support/users";

type Deferred = { promise: Promise<void>; resolve: () => void };
function deferred(): Deferred {
  let resolve!: () => void;
  const promise = new Promise<void>((r) => (resolve = r));
  return { promise, resolve };
}

/**
 * The opposing writer, on the owner's own pool (another connection, unwrapped knex): takes
 * row `b` and four more rows, says so, waits until the transaction under test holds row
 * `a`, then asks for `a` — closing the cycle — and commits once it gets it.
 */
function opposingWriter(ids: { a: number; b: number; more: number[] }, holdsB: Deferred, testHoldsA: Deferred): Promise<void> {
  return ownerDb().transaction(async (trx) => {
    // One row at a time by primary key: on a table this small an IN list may be read by a
    // full scan, which would lock row A as well and make a plain lock wait, not a deadlock.
    for (const id of [ids.b, ...ids.more]) await trx("users").where({ id }).update({ name: trx.raw("CONCAT(name, '+')") });
    holdsB.resolve();
    await testHoldsA.promise;
    await trx("users").where({ id: ids.a }).update({ name: "opposing writer took A" });
  });
}

describe("write transactions rerun on a deadlock", () => {
  let ids: { a: number; b: number; more: number[] };

  beforeEach(async () => {
    await resetDatabase();
    const people = [];
    for (let i = 0; i < 6; i += 1) people.push(await makeUser({ roles: ["clerk"] }));
    ids = { a: people[0]!.id, b: people[1]!.id, more: people.slice(2).map((p) => p.id) };
  });
  afterAll(async () => {
    await closeOwnerDb();
  });

  it("db().transaction reruns the whole callback after a real InnoDB deadlock and commits once", async () => {
    const before = writeRetryStats().reruns;
    let tries = 0;
    let opposing: Promise<void> | null = null;
    const result = await db().transaction(async (trx) => {
      tries += 1;
      await trx("users").where({ id: ids.a }).update({ name: `A by try ${tries}` });
      if (tries === 1) {
        const holdsB = deferred();
        const testHoldsA = deferred();
        opposing = opposingWriter(ids, holdsB, testHoldsA);
        await holdsB.promise;
        testHoldsA.resolve();
      }
      // First try: row B is the opposing writer's, which waits for row A: a deadlock.
      await trx("users").where({ id: ids.b }).update({ name: `B by try ${tries}` });
      await insertAuditEntry({ actorUserId: null, action: "retry-probe", entityType: "user", entityId: ids.a, requestId: `probe-${ids.a}` }, trx);
      return tries;
    });
    await opposing;

    expect(result).toBe(2);
    expect(writeRetryStats().reruns - before).toBe(1);
    const rows = (await ownerDb()("users").whereIn("id", [ids.a, ids.b]).orderBy("id").select("id", "name")) as { id: number; name: string }[];
    // The second try ran after the opposing writer committed: its writes are the last ones.
    expect(rows.map((r) => r.name)).toEqual(["A by try 2", "B by try 2"]);
    // What the callback wrote, it wrote once: the first try's insert was rolled back with it.
    expect(await ownerDb()("audit_log").where({ request_id: `probe-${ids.a}` }).count({ n: "*" }).first()).toMatchObject({ n: 1 });
    // The opposing writer's other rows are committed as well.
    const more = (await ownerDb()("users").whereIn("id", ids.more).select("name")) as { name: string }[];
    expect(more.every((r) => r.name.endsWith("+"))).toBe(true);
  });

  it("gives up after the set number of tries with WriteRetriesExhausted, leaving nothing written", async () => {
    let tries = 0;
    const opposing: Promise<void>[] = [];
    const caught = await writeTransaction(
      db(),
      async (trx) => {
        tries += 1;
        await trx("users").where({ id: ids.a }).update({ name: `A by try ${tries}` });
        const holdsB = deferred();
        const testHoldsA = deferred();
        opposing.push(opposingWriter(ids, holdsB, testHoldsA));
        await holdsB.promise;
        testHoldsA.resolve();
        await trx("users").where({ id: ids.b }).update({ name: `B by try ${tries}` });
        await insertAuditEntry({ actorUserId: null, action: "retry-probe", entityType: "user", entityId: ids.a, requestId: `give-up-${ids.a}` }, trx);
      },
      { attempts: 2 },
    ).catch((e: unknown) => e);
    await Promise.all(opposing);

    expect(tries).toBe(2);
    expect(caught).toBeInstanceOf(WriteRetriesExhausted);
    expect(caught).toMatchObject({ attempts: 2, reason: "conflict", lastError: { code: "ER_LOCK_DEADLOCK", errno: 1213 } });
    expect(isWriteContention(caught)).toBe(true);
    expect(await ownerDb()("audit_log").where({ request_id: `give-up-${ids.a}` }).count({ n: "*" }).first()).toMatchObject({ n: 0 });
    expect((await ownerDb()("users").where({ id: ids.a }).first("name"))?.name).toBe("opposing writer took A");
  });

  it("a route whose write keeps losing answers 503 with Retry-After and the one error shape", async () => {
    const admin = await makeUser({ roles: ["admin"] });
    const route = defineRoute({ permission: "signed-in" }, async () => {
      await writeTransaction(
        db(),
        async (trx) => {
          await trx("users").where({ id: ids.a }).update({ name: "route A" });
          const holdsB = deferred();
          const testHoldsA = deferred();
          const other = opposingWriter(ids, holdsB, testHoldsA);
          await holdsB.promise;
          testHoldsA.resolve();
          try {
            await trx("users").where({ id: ids.b }).update({ name: "route B" });
          } finally {
            // Let the opposing writer finish before the next try starts (each try makes its own).
            void other.catch(() => undefined);
          }
        },
        { attempts: 2 },
      );
      return Response.json({ ok: true }, { status: 201 });
    });
    const res = await route(await requestAs(admin, "/api/v1/x", { method: "POST", json: {} }), { params: Promise.resolve({}) });
    expect(res.status).toBe(503); // source: RFC 9110 §15.6.4 (503 Service Unavailable, may carry Retry-After)
    expect(Number(res.headers.get("retry-after"))).toBeGreaterThan(0);
    expect(await res.json()).toEqual({ error: { code: "unavailable", message: expect.stringMatching(/busy.*Nothing was saved/) } });
  });

  it("reruns on deadlocks and on a Galera node that is not serving, nothing else", () => {
    // Codes and numbers per MariaDB's error list (ER_LOCK_DEADLOCK 1213, ER_UNKNOWN_COM_ERROR
    // 1047 "WSREP has not yet prepared node for application use", ER_LOCK_WAIT_TIMEOUT 1205,
    // ER_DUP_ENTRY 1062), in the shape mysql2 gives them (code, errno).
    expect(writeRetryReason({ code: "ER_LOCK_DEADLOCK", errno: 1213 })).toBe("conflict");
    expect(writeRetryReason({ code: "ER_UNKNOWN_COM_ERROR", errno: 1047, message: "WSREP has not yet prepared node for application use" })).toBe("node-not-ready");
    for (const e of [{ code: "ER_LOCK_WAIT_TIMEOUT", errno: 1205 }, { code: "ER_DUP_ENTRY", errno: 1062 }, { code: "ECONNREFUSED" }, new Error("boom"), null]) {
      expect(writeRetryReason(e)).toBeNull();
    }
    // Not rerun, but answered 503: a lock wait that timed out.
    expect(isWriteContention({ code: "ER_LOCK_WAIT_TIMEOUT", errno: 1205 })).toBe(true);
    expect(isWriteContention({ code: "ER_DUP_ENTRY", errno: 1062 })).toBe(false);
  });
});
