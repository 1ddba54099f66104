// The Register export off the request thread: the file is written in a worker thread, so
// another request is answered while a large export streams; the clerk can follow rows
// written of the total and stop the export, which stops the writer and leaves nothing
// behind (no thread, the export recorded as cancelled with the rows it had reached).
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as exportGet } from "@/app/api/v1/exports/register/route";
import { GET as progressGet } from "@/app/api/v1/exports/register/progress/route";
import { GET as sessionGet } from "@/app/api/v1/session/route";
import { runningWriterThreads } from "@/app/_server/register/export-files";
import { closeDb } from "@/database/client";
import { buildRegisterJoints } from "@/fixtures/register-joints";
import { ownerDb, resetDatabase } from "../support/db";
import { requestAs } from "../support/session";
import { makeUser } from "../support/users";

const ROWS = 50_000;
const noParams = { params: Promise.resolve({}) };
let clerk: { id: number };
let otherClerk: { id: number };

async function waitForExportEnd(id: number): Promise<{ status: string; row_count: number | null }> {
  for (let i = 0; i < 600; i += 1) {
    const row = await ownerDb()("exports").where({ id }).first();
    if (row && row.status !== "running") return row;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error("export did not finish");
}

async function progressOf(user: { id: number }, id: number) {
  const res = await progressGet(await requestAs(user, `/api/v1/exports/register/progress?id=${id}`), noParams);
  return { status: res.status, body: (await res.json()) as { status: string; rowsWritten: number; expectedRows: number | null } };
}

describe("register export in a worker thread", () => {
  beforeAll(async () => {
    await resetDatabase();
    await buildRegisterJoints(ownerDb(), { count: ROWS, seed: 41 });
    clerk = await makeUser({ roles: ["clerk"], unitSystem: "si" });
    otherClerk = await makeUser({ roles: ["clerk"], unitSystem: "si" });
  }, 600_000);

  afterAll(async () => {
    await closeDb();
  });

  it("answers another request while a 50,000-row export streams, and reports rows written of the total", async () => {
    const res = await exportGet(await requestAs(clerk, "/api/v1/exports/register?format=xlsx"), noParams);
    expect(res.status).toBe(200);
    const id = Number(res.headers.get("x-beadline-export-id"));
    expect(Number(res.headers.get("x-beadline-row-estimate"))).toBe(ROWS);

    let exportEnded = 0;
    let bytes = 0;
    const reading = (async () => {
      const reader = res.body!.getReader();
      for (;;) {
        const { done, value } = await reader.read();
        if (done) break;
        bytes += value.byteLength;
      }
      exportEnded = performance.now();
    })();

    // Once the writer is under way: the session answer and the progress answer both come
    // back while the export is still writing.
    for (let i = 0; i < 400 && bytes === 0; i += 1) await new Promise((r) => setTimeout(r, 25));
    const session = await sessionGet(await requestAs(clerk, "/api/v1/session"), noParams);
    const sessionAnswered = performance.now();
    expect(session.status).toBe(200);
    const during = await progressOf(clerk, id);
    expect(during.status).toBe(200);
    expect(during.body.status).toBe("running");
    expect(during.body.expectedRows).toBe(ROWS);
    expect(during.body.rowsWritten).toBeLessThan(ROWS);
    // Someone else's export is not theirs to follow.
    expect((await progressOf(otherClerk, id)).status).toBe(404);

    await reading;
    expect(exportEnded).toBeGreaterThan(0);
    expect(sessionAnswered).toBeLessThan(exportEnded);
    const ended = await waitForExportEnd(id);
    expect(ended).toMatchObject({ status: "done", row_count: ROWS });
    const after = await progressOf(clerk, id);
    expect(after.body).toMatchObject({ status: "done", rowsWritten: ROWS });
    expect(runningWriterThreads.size).toBe(0);
  }, 300_000);

  it.each(["xlsx", "csv"] as const)("a %s export stopped by the clerk stops its writer thread and leaves nothing but the record of the stop", async (format) => {
    const res = await exportGet(await requestAs(clerk, `/api/v1/exports/register?format=${format}`), noParams);
    const id = Number(res.headers.get("x-beadline-export-id"));
    const reader = res.body!.getReader();
    const first = await reader.read();
    expect(first.done).toBe(false);
    expect(runningWriterThreads.size).toBe(1);
    await reader.cancel();

    const ended = await waitForExportEnd(id);
    expect(ended.status).toBe("failed");
    expect(ended.row_count ?? 0).toBeLessThan(ROWS);
    for (let i = 0; i < 100 && runningWriterThreads.size > 0; i += 1) await new Promise((r) => setTimeout(r, 20));
    expect(runningWriterThreads.size).toBe(0);
    const audit = await ownerDb()("audit_log").where({ entity_type: "export", entity_id: id, action: "register-export-failed" }).first();
    expect(typeof audit.details === "string" ? JSON.parse(audit.details) : audit.details).toMatchObject({ error: "cancelled" });
    expect((await progressOf(clerk, id)).body.status).toBe("failed");
  }, 120_000);
});
