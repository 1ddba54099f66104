// Server CPU per page: `npx tsx tests/perf/page-cpu.ts [--app-dir DIR] [--skip-build] [--seconds N] [--bare-dir DIR]`.
// On a shared machine requests per second follow the other work; the CPU time the server
// process spends per request hardly does. So this starts a throw-away MariaDB with the demo
// scenario, `next start` of the app in DIR (default this checkout; another checkout of the
// project compares versions, its build in DIR/.next-bench), drives each page with autocannon
// (10 connections, N seconds after a 2 s warm-up) as the signed-in clerk, and divides the
// CPU time of the server's processes (user + system, /proc/<pid>/stat) by the requests
// served. 1000 ÷ that is the page rate one core could serve at most. (A checkout elsewhere, e.g.
// `git archive <commit> | tar -x -C /tmp/x` with node_modules linked from here, needs
// `turbopack: { root: "/" }` in its next.config.js to build, as the bench's floor app has.) With --bare-dir, the
// same for "/" of a prebuilt bare Next.js app in DIR: the framework's own cost of a
// server-rendered page. Not part of `npm test`.
import "../support/server-only-outside-next";
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { existsSync, readFileSync, readdirSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { freePort } from "../../database/local/mariadb";
import { startDemoStack, type DemoStack } from "./demo-stack";
import { signInCookie, waitForServer } from "../support/joint-body";
import { hammer } from "../bench/floor";

const args = process.argv.slice(2);
const argValue = (name: string) => (args.includes(name) ? args[args.indexOf(name) + 1] : undefined);
const ROOT = path.resolve(__dirname, "..", "..");
const APP_DIR = path.resolve(argValue("--app-dir") ?? ROOT);
const BARE_DIR = argValue("--bare-dir");
const SECONDS = Number(argValue("--seconds") ?? 8);
const SKIP_BUILD = args.includes("--skip-build");
const DIST_DIR = ".next-bench";
const TICK_MS = 1000 / 100; // USER_HZ: /proc reports CPU time in 1/100 s on Linux

/** CPU time (ms) used so far by a process and all its descendants. */
function treeCpuMs(root: number): number {
  const children = new Map<number, number[]>();
  const times = new Map<number, number>();
  for (const entry of readdirSync("/proc")) {
    if (!/^\d+$/.test(entry)) continue;
    try {
      const stat = readFileSync(`/proc/${entry}/stat`, "utf8");
      const fields = stat.slice(stat.lastIndexOf(")") + 2).split(" ");
      const ppid = Number(fields[1]);
      children.set(ppid, [...(children.get(ppid) ?? []), Number(entry)]);
      times.set(Number(entry), (Number(fields[11]) + Number(fields[12])) * TICK_MS);
    } catch {
      /* process ended */
    }
  }
  let total = 0;
  const walk = (p: number) => {
    total += times.get(p) ?? 0;
    for (const c of children.get(p) ?? []) walk(c);
  };
  walk(root);
  return total;
}

async function measure(child: ChildProcess, url: string, headers: Record<string, string>): Promise<{ cpuMsPerRequest: number; requestsPerS: number; total: number; bad: number }> {
  await hammer(url, { connections: 10, durationS: 2, headers });
  const before = treeCpuMs(child.pid!);
  const r = await hammer(url, { connections: 10, durationS: SECONDS, headers });
  const used = treeCpuMs(child.pid!) - before;
  return { cpuMsPerRequest: used / Math.max(1, r.total), requestsPerS: r.requestsPerS, total: r.total, bad: r.bad };
}

async function stop(child: ChildProcess | null): Promise<void> {
  if (!child || child.exitCode !== null) return;
  child.kill("SIGTERM");
  for (let i = 0; i < 80 && child.exitCode === null; i += 1) await new Promise((r) => setTimeout(r, 100));
  if (child.exitCode === null) child.kill("SIGKILL");
}

async function main(): Promise<number> {
  let demo: DemoStack | null = null;
  let server: ChildProcess | null = null;
  const nextBin = path.join(ROOT, "node_modules", "next", "dist", "bin", "next");
  const rows: string[][] = [["page", "requests", "bad", "req/s (this machine now)", "server CPU ms / request", "≤ req/s on one core"]];
  const row = (label: string, m: Awaited<ReturnType<typeof measure>>) =>
    rows.push([label, String(m.total), String(m.bad), m.requestsPerS.toFixed(0), m.cpuMsPerRequest.toFixed(2), (1000 / m.cpuMsPerRequest).toFixed(0)]);
  try {
    demo = await startDemoStack("beadline-page-cpu-");
    const { stack, jointId } = demo;
    const port = await freePort();
    const baseUrl = `http://127.0.0.1:${port}`;
    const env: NodeJS.ProcessEnv = { ...process.env, ...stack.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1", BEADLINE_DIST_DIR: DIST_DIR, BEADLINE_PUBLIC_URL: baseUrl, MAIL_WORKER: "off" };
    if (!SKIP_BUILD || !existsSync(path.join(APP_DIR, DIST_DIR, "BUILD_ID"))) {
      console.log(`next build of ${APP_DIR} into ${DIST_DIR} …`);
      const tsconfig = readFileSync(path.join(APP_DIR, "tsconfig.json"), "utf8");
      const build = spawnSync(process.execPath, [nextBin, "build"], { cwd: APP_DIR, env, stdio: ["ignore", "ignore", "inherit"] });
      writeFileSync(path.join(APP_DIR, "tsconfig.json"), tsconfig); // next build rewrites its include list
      if (build.status !== 0) throw new Error("next build failed");
    }
    server = spawn(process.execPath, [nextBin, "start", "-H", "127.0.0.1", "-p", String(port)], { cwd: APP_DIR, env, stdio: ["ignore", "ignore", "inherit"] });
    await waitForServer(`${baseUrl}/sign-in`, server, 60_000);
    const headers = { cookie: await signInCookie(baseUrl, "clerk@larkmoor-gas.example", "beadline-demo-2026") };
    for (const [label, urlPath] of [["signed-in GET /api/v1/session", "/api/v1/session"], ["Register page", "/register"], ["joint page", `/joints/${jointId}`]] as const) {
      row(label, await measure(server, `${baseUrl}${urlPath}`, headers));
    }
    await stop(server);
    server = null;
    if (BARE_DIR) {
      const barePort = await freePort();
      server = spawn(process.execPath, [nextBin, "start", "-H", "127.0.0.1", "-p", String(barePort)], { cwd: path.resolve(BARE_DIR), env: { ...process.env, NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1" }, stdio: ["ignore", "ignore", "inherit"] });
      await waitForServer(`http://127.0.0.1:${barePort}/`, server, 60_000);
      row("bare Next.js page (no session, no database)", await measure(server, `http://127.0.0.1:${barePort}/`, {}));
    }
    const widths = rows[0].map((_, i) => Math.max(...rows.map((r) => r[i].length)));
    console.log(`\n${APP_DIR}: load average ${os.loadavg().map((v) => v.toFixed(1)).join(" / ")} on ${os.cpus().length} cores`);
    for (const r of rows) console.log(r.map((c, i) => c.padEnd(widths[i])).join("  "));
    return 0;
  } finally {
    await stop(server);
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
