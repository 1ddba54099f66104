// Queries per page: `npx tsx tests/perf/page-queries.ts [--skip-build] [--sql]`. Starts a throw-away
// MariaDB with the demo scenario (as `npm run bench -- --only floor` does), builds the app into
// .next-bench (reused with --skip-build when a build is there), starts `next start` with
// BEADLINE_COUNT_QUERIES=1 and asks each signed-in page and two API routes twice as the role
// that uses it, reading the server's "queries per request" log line (app/_lib/query-count.ts).
// Prints first and repeated requests and fails (exit 1) when a repeated request sends more
// statements than its ceiling below: a guard against pages drifting back to a dozen round
// trips, not a timing measurement. Not part of `npm test` (it builds Next).
import "../support/server-only-outside-next";
import { spawn, spawnSync } from "node:child_process";
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { freePort } from "../../database/local/mariadb";
import { startDemoStack, type DemoStack } from "./demo-stack";
import { signInCookie, waitForServer } from "../support/joint-body";

const ROOT = path.resolve(__dirname, "..", "..");
const DIST_DIR = ".next-bench";
const SKIP_BUILD = process.argv.includes("--skip-build");
/** --sql: print each repeated request's statements (SQL text, no values) under the table. */
const WITH_SQL = process.argv.includes("--sql");
const DEMO_PASSWORD = "beadline-demo-2026";

type Role = "clerk" | "fuser" | "inspector" | "admin";
/** Ceiling of statements for a repeated request (the session's user read included). */
type Page = { label: string; path: string | ((jointId: number) => string); role: Role; max: number };

// Ceilings: the counts measured after the round trips were cut (2026-12-02; before: Today 7/10/5,
// Register 6, joint page 7, Review 16, Trench 20). Two of each page's statements are the session's
// person and the organisation's time zone, which a per-process cache of the zone takes to one.
const PAGES: Page[] = [
  { label: "Today (clerk)", path: "/", role: "clerk", max: 4 },
  { label: "Today (fuser)", path: "/", role: "fuser", max: 8 },
  { label: "Today (inspector)", path: "/", role: "inspector", max: 3 },
  { label: "Register", path: "/register", role: "clerk", max: 2 },
  { label: "joint page", path: (id) => `/joints/${id}`, role: "clerk", max: 6 },
  { label: "Review", path: "/review", role: "inspector", max: 9 },
  { label: "Trench", path: "/trench", role: "fuser", max: 15 },
  { label: "GET /api/v1/session", path: "/api/v1/session", role: "clerk", max: 1 },
  { label: "GET /api/v1/register", path: "/api/v1/register", role: "clerk", max: 4 },
];

async function main(): Promise<number> {
  let demo: DemoStack | null = null;
  let server: ReturnType<typeof spawn> | null = null;
  try {
    demo = await startDemoStack("beadline-queries-");
    const { stack, jointId } = demo;
    const port = await freePort();
    const baseUrl = `http://127.0.0.1:${port}`;
    const env: NodeJS.ProcessEnv = { ...process.env, ...stack.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1", BEADLINE_DIST_DIR: DIST_DIR, BEADLINE_PUBLIC_URL: baseUrl, MAIL_WORKER: "off" };
    const nextBin = path.join(ROOT, "node_modules", "next", "dist", "bin", "next");
    if (!SKIP_BUILD || !existsSync(path.join(ROOT, DIST_DIR, "BUILD_ID"))) {
      console.log(`next build into ${DIST_DIR} …`);
      const tsconfig = readFileSync(path.join(ROOT, "tsconfig.json"), "utf8");
      const build = spawnSync(process.execPath, [nextBin, "build"], { cwd: ROOT, env, stdio: ["ignore", "ignore", "inherit"] });
      writeFileSync(path.join(ROOT, "tsconfig.json"), tsconfig); // next build rewrites its include list
      if (build.status !== 0) throw new Error("next build failed");
    }
    server = spawn(process.execPath, [nextBin, "start", "-H", "127.0.0.1", "-p", String(port)], { cwd: ROOT, env: { ...env, BEADLINE_COUNT_QUERIES: WITH_SQL ? "sql" : "1" }, stdio: ["ignore", "pipe", "inherit"] });
    const counted: { path: string; queries: number; statements?: string[] }[] = [];
    let pending = "";
    server.stdout!.on("data", (chunk: Buffer) => {
      pending += chunk.toString("utf8");
      const lines = pending.split("\n");
      pending = lines.pop() ?? "";
      for (const line of lines) {
        try {
          const rec = JSON.parse(line) as { msg?: string; path?: string; queries?: number; statements?: string[] };
          if (rec.msg === "queries per request" && rec.path && typeof rec.queries === "number") counted.push({ path: rec.path, queries: rec.queries, statements: rec.statements });
        } catch {
          /* not a log line */
        }
      }
    });
    await waitForServer(`${baseUrl}/sign-in`, server, 60_000);
    const cookies: Record<Role, string> = {
      clerk: await signInCookie(baseUrl, "clerk@larkmoor-gas.example", DEMO_PASSWORD),
      fuser: await signInCookie(baseUrl, "fuser@larkmoor-gas.example", DEMO_PASSWORD),
      inspector: await signInCookie(baseUrl, "inspector@larkmoor-gas.example", DEMO_PASSWORD),
      admin: await signInCookie(baseUrl, "admin@larkmoor-gas.example", DEMO_PASSWORD),
    };
    /** One request; its statements from the server's log line (written when the answer has gone out). */
    const ask = async (urlPath: string, role: Role): Promise<{ status: number; queries: number; header: string | null; bytes: number; statements?: string[] }> => {
      const before = counted.length;
      const res = await fetch(`${baseUrl}${urlPath}`, { headers: { cookie: cookies[role] }, redirect: "manual" });
      const bytes = (await res.arrayBuffer()).byteLength;
      // The line is written when the answer has gone out; on a busy machine it may take a moment.
      for (let i = 0; i < 500 && !counted.slice(before).some((c) => c.path === urlPath); i += 1) await new Promise((r) => setTimeout(r, 20));
      const line = counted.slice(before).find((c) => c.path === urlPath);
      if (!line) throw new Error(`no "queries per request" line for ${urlPath} (is BEADLINE_COUNT_QUERIES wired in instrumentation.ts?)`);
      return { status: res.status, queries: line.queries, header: res.headers.get("x-beadline-queries"), bytes, statements: line.statements };
    };
    const rows: string[][] = [["page", "path", "status", "first", "repeated", "header", "ceiling", "", "bytes"]];
    let over = 0;
    const sqlText: string[] = [];
    for (const p of PAGES) {
      const urlPath = typeof p.path === "function" ? p.path(jointId) : p.path;
      const first = await ask(urlPath, p.role);
      const again = await ask(urlPath, p.role);
      const ok = again.status === 200 && again.queries <= p.max;
      if (!ok) over += 1;
      if (again.statements) sqlText.push(`\n${p.label} (${urlPath}):`, ...again.statements.map((q, i) => `  ${i + 1}. ${q}`));
      rows.push([p.label, urlPath, String(again.status), String(first.queries), String(again.queries), again.header ?? "—", `≤ ${p.max}`, ok ? "ok" : "OVER", String(again.bytes)]);
    }
    const widths = rows[0].map((_, i) => Math.max(...rows.map((r) => r[i].length)));
    for (const r of rows) console.log(r.map((c, i) => c.padEnd(widths[i])).join("  "));
    if (sqlText.length) console.log(sqlText.join("\n"));
    console.log(`\nstatements per request (knex 'query' events); "header" is the count when the headers went out; bytes of the answer (HTML with its inline RSC payload, uncompressed).`);
    return over ? 1 : 0;
  } finally {
    if (server && server.exitCode === null) {
      server.kill("SIGTERM");
      for (let i = 0; i < 80 && server.exitCode === null; i += 1) await new Promise((r) => setTimeout(r, 100));
      if (server.exitCode === null) server.kill("SIGKILL");
    }
    if (demo) await demo.stop();
  }
}

main().then(
  (code) => process.exit(code),
  (error) => {
    console.error(error);
    process.exit(1);
  },
);
