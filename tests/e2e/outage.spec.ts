// Fault test: while clients submit joints through the real HTTP server (POST /api/v1/joints
// on `next start` of the built app), the MariaDB server is stopped for 10 s and started again.
// Every request made during the outage gets a clear 503 JSON error (never a 500, never a
// hang beyond 10 s), the app recovers without a restart, every joint that got a 201 is in the
// database afterwards, none is half-written (each has its revision, state and audit entry),
// and a retry of every refused submission with its client id records it exactly once. A page
// opened in the browser during the outage says in words that it could not be loaded.
// The server's log lines carry request ids and no secret. This test brings up its own
// MariaDB, object store, mail catcher and web server, so stopping the database touches
// nothing else. source: common practice (no published source) for fail-fast dependency
// outages; RFC 9110 §15.6.4 (503 Service Unavailable, Retry-After).
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { randomUUID } from "node:crypto";
import { mkdtempSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { expect, test } from "@playwright/test";
import type { Knex } from "knex";
import { freePort, startMariadb, type MariadbServer } from "../../database/local/mariadb";
import { startLocalStack, type LocalStack } from "../../database/local/stack";
import { ownerKnex } from "../../database/migrate";
import { demoJointBody, waitForServer } from "../support/joint-body";

const ROOT = process.cwd();
const CLIENTS = 4;
const OUTAGE_MS = 10_000;
const HANG_LIMIT_MS = 10_000;

type Attempt = { clientId: string; started: number; ms: number; status: number; code?: string; retryAfter?: string | null; error?: string; body?: string };


test.describe("database outage while joints are submitted", () => {
  test.setTimeout(240_000);

  let tmp = "";
  let stack: LocalStack | null = null;
  let restarted: MariadbServer | null = null;
  let server: ChildProcess | null = null;
  let owner: Knex | null = null;
  const output: string[] = [];

  test.afterAll(async () => {
    await owner?.destroy();
    if (server && server.exitCode === null) {
      server.kill("SIGTERM");
      const deadline = Date.now() + 8000;
      while (server.exitCode === null && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
      if (server.exitCode === null) server.kill("SIGKILL");
    }
    await restarted?.stop();
    await stack?.stop();
    if (tmp) rmSync(tmp, { recursive: true, force: true });
  });

  test("every request during the outage gets a 503 in time, nothing is lost or half-written, the app recovers", async ({ page }) => {
    // --- its own stack and server ------------------------------------------------------
    tmp = mkdtempSync(path.join(os.tmpdir(), "beadline-outage-"));
    stack = await startLocalStack({ dir: tmp, ports: "free", log: () => undefined });
    // Migrations and seeds are TypeScript loaded at run time: run them through tsx, as npm test does.
    const tsx = path.join(ROOT, "node_modules", ".bin", "tsx");
    const env: NodeJS.ProcessEnv = { ...process.env, ...stack.env, NODE_ENV: "test" };
    const migrate = spawnSync(tsx, ["-e", `import(${JSON.stringify(path.join(ROOT, "database", "migrate.ts"))}).then((m) => (m.migrateLatest ?? m.default.migrateLatest)(process.env.MIGRATION_DATABASE_URL)).catch((e) => { console.error(e); process.exit(1); })`], { cwd: ROOT, env, encoding: "utf8" });
    expect(migrate.status, migrate.stderr).toBe(0);
    stack.grantRights();
    const seed = spawnSync(tsx, [path.join(ROOT, "tests", "support", "seed-demo-cli.ts")], { cwd: ROOT, env, encoding: "utf8" });
    expect(seed.status, seed.stderr).toBe(0);
    owner = ownerKnex(stack.env.MIGRATION_DATABASE_URL);
    const port = await freePort();
    const baseUrl = `http://127.0.0.1:${port}`;
    server = spawn(process.execPath, [path.join(ROOT, "node_modules", "next", "dist", "bin", "next"), "start", "-H", "127.0.0.1", "-p", String(port)], {
      cwd: ROOT,
      env: { ...process.env, ...stack.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1", BEADLINE_PUBLIC_URL: baseUrl, LOG_LEVEL: "info", MAIL_WORKER: "off" },
      stdio: ["ignore", "pipe", "pipe"],
    });
    server.stdout!.on("data", (d: Buffer) => output.push(d.toString()));
    server.stderr!.on("data", (d: Buffer) => output.push(d.toString()));
    await waitForServer(`${baseUrl}/sign-in`, server, 60_000);

    const signIn = await fetch(`${baseUrl}/api/v1/session`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ email: "fuser@larkmoor-gas.example", password: "beadline-demo-2026" }) });
    expect(signIn.status).toBe(200);
    const cookie = (signIn.headers.get("set-cookie") ?? "").split(";")[0];
    const machine = await owner("fusion_machines").where({ asset_tag: "FM-201" }).first("id");
    const heater = await owner("heater_plates").where({ asset_tag: "HP-31" }).first("id");
    const job = await owner("jobs").where({ code: "WO-24117" }).first("id");
    const bodies = new Map<string, Record<string, unknown>>();
    const body = (clientId: string) => {
      const b = demoJointBody({ clientId, jobId: job.id, machineId: machine.id, heaterId: heater.id, station: "Outage 1+00" });
      bodies.set(clientId, b);
      return b;
    };
    const submit = async (clientId: string, b: Record<string, unknown> = body(clientId)): Promise<Attempt> => {
      const started = Date.now();
      try {
        const res = await fetch(`${baseUrl}/api/v1/joints`, { method: "POST", headers: { cookie, "content-type": "application/json" }, body: JSON.stringify(b), signal: AbortSignal.timeout(HANG_LIMIT_MS + 5000) });
        const text = await res.text();
        let code: string | undefined;
        try {
          code = (JSON.parse(text) as { error?: { code?: string } }).error?.code;
        } catch {
          code = "not-json";
        }
        return { clientId, started, ms: Date.now() - started, status: res.status, code, retryAfter: res.headers.get("retry-after"), body: res.status >= 300 ? text.slice(0, 300) : undefined };
      } catch (error) {
        return { clientId, started, ms: Date.now() - started, status: 0, error: String((error as Error).message) };
      }
    };

    // A first joint proves the happy path before anything breaks.
    const first = await submit(randomUUID());
    expect(first.status, first.body).toBe(201);

    // --- clients submit continuously ----------------------------------------------------
    const attempts: Attempt[] = [first];
    let running = true;
    const clients = Array.from({ length: CLIENTS }, async () => {
      while (running) {
        attempts.push(await submit(randomUUID()));
        await new Promise((r) => setTimeout(r, 50));
      }
    });
    const phase = async (ms: number) => new Promise((r) => setTimeout(r, ms));

    await phase(3000);
    await owner.destroy(); // the test's own connection would only log "connection lost"
    const stopBegin = Date.now();
    await stack.mariadb.stop();
    const stopped = Date.now();
    // Requests that also read the session during the outage get 503 too, not 401.
    const sessionDuring = await fetch(`${baseUrl}/api/v1/session`, { headers: { cookie } });
    // A signed-in person opening a page during the outage reads what happened, not the framework's bare error.
    const pageDuring = async () => {
      const [name, ...value] = cookie.split("=");
      await page.context().addCookies([{ name, value: value.join("="), url: baseUrl }]);
      await page.goto(`${baseUrl}/`, { timeout: 8000 }).catch(() => null);
      const alert = page.getByRole("alert").filter({ hasText: "This page could not be loaded" });
      await alert.waitFor({ timeout: 8000 }).catch(() => null);
      await page.screenshot({ path: "tests/e2e/artifacts/page-during-outage.png", fullPage: true }).catch(() => null);
      return { shown: (await alert.count()) > 0, text: (await page.locator("body").innerText().catch(() => "")).slice(0, 300) };
    };
    const [pageSeen] = await Promise.all([pageDuring(), phase(OUTAGE_MS)]);
    const startBegin = Date.now();
    restarted = await startMariadb({ dir: stack.mariadb.dir, port: stack.mariadb.port });
    const started = Date.now();
    // Recovery: the same server process, no restart; wait for submissions to succeed again.
    let recoveredAt = 0;
    while (!recoveredAt && Date.now() - started < 20_000) {
      await phase(250);
      const ok = attempts.find((a) => a.started >= started && a.status === 201);
      if (ok) recoveredAt = ok.started + ok.ms;
    }
    await phase(3000);
    running = false;
    await Promise.all(clients);
    owner = ownerKnex(stack.env.MIGRATION_DATABASE_URL);

    // --- answers ------------------------------------------------------------------------
    expect(sessionDuring.status).toBe(503);
    expect(pageSeen.shown, `page during the outage read: ${pageSeen.text}`).toBe(true);
    expect(pageSeen.text).toContain("Nothing was changed");
    const during = attempts.filter((a) => a.started >= stopped && a.started + a.ms <= startBegin);
    const atEdges = attempts.filter((a) => (a.started >= stopBegin && a.started < stopped) || (a.started < startBegin && a.started + a.ms > startBegin) || (a.started >= startBegin && a.started < started));
    const afterRecovery = attempts.filter((a) => recoveredAt && a.started >= recoveredAt);
    const summary = {
      total: attempts.length,
      outage: during.length,
      outageStatuses: [...new Set(during.map((a) => a.status))],
      outageMaxMs: Math.max(...during.map((a) => a.ms)),
      outageMedianMs: during.map((a) => a.ms).sort((x, y) => x - y)[Math.floor(during.length / 2)],
      edges: atEdges.map((a) => a.status),
      recoveryMs: recoveredAt ? recoveredAt - started : null,
      afterRecovery: afterRecovery.length,
      stopMs: stopped - stopBegin,
      restartMs: started - startBegin,
    };
    console.log(`outage figures: ${JSON.stringify(summary)}`);
    const errorLines = output
      .join("")
      .split("\n")
      .filter((l) => l.startsWith("{") && /"level":(50|60)/.test(l));
    if (errorLines.length) console.log(`server error lines:\n${errorLines.map((l) => l.slice(0, 700)).join("\n")}`);

    expect(during.length, "requests were made during the outage").toBeGreaterThan(10);
    for (const a of during) {
      expect(a.status, `during the outage: ${JSON.stringify(a)}`).toBe(503);
      expect(a.code).toBe("unavailable");
      expect(a.retryAfter).toBeTruthy();
      expect(a.ms, "answered within 10 s").toBeLessThan(HANG_LIMIT_MS);
    }
    for (const a of attempts) {
      expect(a.status, `no answer may be a 500 or a hang: ${JSON.stringify(a)}`).not.toBe(0);
      expect(a.status, `no answer may be a server error other than 503: ${JSON.stringify(a)}`).not.toBe(500);
      expect([200, 201, 503]).toContain(a.status);
      expect(a.ms).toBeLessThan(HANG_LIMIT_MS);
    }
    expect(recoveredAt, "submissions succeed again without restarting the web server").toBeGreaterThan(0);
    expect(server.exitCode).toBeNull();
    expect(afterRecovery.length).toBeGreaterThan(5);
    for (const a of afterRecovery) expect(a.status, JSON.stringify(a)).toBe(201);

    // --- the database afterwards ----------------------------------------------------------
    const acknowledged = attempts.filter((a) => a.status === 201 || a.status === 200).map((a) => a.clientId);
    const rows = (await owner("joints").whereIn("client_id", acknowledged).select("id", "client_id")) as { id: number; client_id: string }[];
    expect(new Set(rows.map((r) => r.client_id))).toEqual(new Set(acknowledged));

    const halfWritten = async () =>
      (await owner!.raw(`
        SELECT j.id FROM joints j
        LEFT JOIN joint_revisions r ON r.joint_id = j.id AND r.revision_no = 1
        LEFT JOIN joint_states s ON s.joint_id = j.id
        LEFT JOIN audit_log a ON a.entity_type = 'joint' AND a.entity_id = CAST(j.id AS CHAR) AND a.action = 'joint-recorded'
        WHERE r.id IS NULL OR s.joint_id IS NULL OR a.id IS NULL`)) as unknown as [{ id: number }[]];
    expect((await halfWritten())[0], "joints without their revision, state or audit entry").toEqual([]);

    // The trench outbox retries refused submissions with the same client id: each lands once.
    const refused = attempts.filter((a) => a.status === 503);
    let retriedNew = 0;
    let retriedKnown = 0;
    for (const a of refused) {
      const again = await submit(a.clientId, bodies.get(a.clientId));
      expect([200, 201], JSON.stringify(again)).toContain(again.status);
      if (again.status === 201) retriedNew += 1;
      else retriedKnown += 1;
    }
    const ours = [...new Set(attempts.map((a) => a.clientId))];
    const [[count]] = (await owner.raw("SELECT COUNT(*) AS n, COUNT(DISTINCT client_id) AS d FROM joints WHERE client_id IN (?)", [ours])) as unknown as [{ n: number; d: number }[]];
    // A submission refused with 503 may still have committed (the database went away between
    // its commit and the answer): its retry finds it (200, "had been recorded already"). Every
    // submission is in the table exactly once either way.
    expect(Number(count.n)).toBe(acknowledged.length + retriedNew + retriedKnown);
    expect(Number(count.d)).toBe(Number(count.n));
    expect((await halfWritten())[0]).toEqual([]);
    const [[gaps]] = (await owner.raw("SELECT COUNT(*) AS n, MAX(joint_no) AS hi, MIN(joint_no) AS lo FROM joints WHERE job_id = ?", [job.id])) as unknown as [{ n: number; hi: number; lo: number }[]];
    expect(Number(gaps.lo)).toBe(1);
    expect(Number(gaps.hi) - Number(gaps.lo) + 1, "joint numbers stay gap-free across the outage").toBe(Number(gaps.n));
    console.log(`outage retries: ${refused.length} refused submissions retried: ${retriedNew} recorded now, ${retriedKnown} had been recorded already`);

    // --- the server's logs ----------------------------------------------------------------
    const text = output.join("");
    const secrets = [stack.env.SESSION_SECRET, decodeURIComponent(new URL(stack.env.DATABASE_URL).password), decodeURIComponent(new URL(stack.env.MIGRATION_DATABASE_URL).password), cookie.split("=").slice(1).join("=")];
    for (const s of secrets) expect(text.includes(s), "a secret in the server output").toBe(false);
    expect(text).not.toContain("Fe26.2*");
    const records = text
      .split("\n")
      .filter((l) => l.startsWith("{"))
      .map((l) => JSON.parse(l) as Record<string, unknown>);
    const requestLines = records.filter((r) => r.kind === "route" || r.msg === "database unavailable");
    expect(requestLines.length).toBeGreaterThan(during.length);
    for (const r of requestLines) expect(typeof r.requestId, JSON.stringify(r)).toBe("string");
    expect(records.some((r) => r.msg === "database unavailable")).toBe(true);
    expect(records.filter((r) => Number(r.level) >= 50).map((r) => r.msg), "no unexpected-error lines").toEqual([]);
  });
});
