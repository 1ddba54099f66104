// `npm test`: starts a throw-away MariaDB (temporary data directory, free port, loopback),
// the fake object store and mail server, migrates, then runs type-check, lint, vitest
// (domain, database, actions/API), builds the app and runs the Playwright browser tests, then
// the cluster fault test (tests/fault/galera-cluster.ts: three Galera nodes, HAProxy, two
// instances, a node and an instance killed under load; on the same build).
// Stops everything and exits non-zero on any failure. Never touches the demo database.
//
// Flags: --skip-lint  --skip-e2e  --skip-cluster  --only-vitest [files…]  --only-e2e [files…]  --only-cluster
import { spawn } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { ensureMariadbInstalled, freePort } from "../database/local/mariadb";
import { startLocalStack, type LocalStack } from "../database/local/stack";
import { migrateLatest } from "../database/migrate";
import { redact } from "../database/local/redact";

const ROOT = path.resolve(__dirname, "..");
const args = process.argv.slice(2);
const flag = (name: string) => args.includes(name);
function filesAfter(name: string): string[] {
  const i = args.indexOf(name);
  if (i < 0) return [];
  const out: string[] = [];
  for (const a of args.slice(i + 1)) {
    if (a.startsWith("--")) break;
    out.push(a);
  }
  return out;
}
const onlyVitest = flag("--only-vitest");
const onlyE2e = flag("--only-e2e");
const onlyCluster = flag("--only-cluster");
const runLint = !flag("--skip-lint") && !onlyVitest && !onlyE2e && !onlyCluster;
const runVitest = !onlyE2e && !onlyCluster;
const runE2e = !flag("--skip-e2e") && !onlyVitest && !onlyCluster;
// The cluster test serves the browser tests' build (or builds it itself with --only-cluster).
const runCluster = onlyCluster || (!flag("--skip-cluster") && runE2e && !onlyE2e);

function run(label: string, command: string, commandArgs: string[], env: Record<string, string | undefined>): Promise<number> {
  const started = Date.now();
  console.log(`\n=== ${label} ===`);
  return new Promise((resolve) => {
    const child = spawn(command, commandArgs, { cwd: ROOT, env: { ...process.env, ...env }, stdio: "inherit" });
    child.on("exit", (code, signal) => {
      console.log(`=== ${label}: ${code === 0 ? "passed" : `FAILED (${signal ?? code})`} in ${((Date.now() - started) / 1000).toFixed(1)} s ===`);
      resolve(code ?? 1);
    });
  });
}

/** Test counts over both runners, for the closing line. */
const counts = { passed: 0, failed: 0, skipped: 0 };

function readJson(file: string): Record<string, unknown> | null {
  try {
    return existsSync(file) ? (JSON.parse(readFileSync(file, "utf8")) as Record<string, unknown>) : null;
  } catch {
    return null;
  }
}

function countVitest(file: string): void {
  const r = readJson(file) as { numPassedTests?: number; numFailedTests?: number; numPendingTests?: number; numTodoTests?: number } | null;
  if (!r) return;
  counts.passed += r.numPassedTests ?? 0;
  counts.failed += r.numFailedTests ?? 0;
  counts.skipped += (r.numPendingTests ?? 0) + (r.numTodoTests ?? 0);
}

function countPlaywright(file: string): void {
  const r = readJson(file) as { stats?: { expected?: number; unexpected?: number; skipped?: number; flaky?: number } } | null;
  if (!r?.stats) return;
  counts.passed += (r.stats.expected ?? 0) + (r.stats.flaky ?? 0);
  counts.failed += r.stats.unexpected ?? 0;
  counts.skipped += r.stats.skipped ?? 0;
}

const bin = (name: string) => path.join(ROOT, "node_modules", ".bin", name);

async function main(): Promise<number> {
  const tmp = mkdtempSync(path.join(os.tmpdir(), "beadline-test-"));
  let stack: LocalStack | null = null;
  const results: [string, number][] = [];
  const stopAll = async () => {
    if (stack) await stack.stop();
    stack = null;
    rmSync(tmp, { recursive: true, force: true });
  };
  process.on("SIGINT", () => void stopAll().then(() => process.exit(130)));
  try {
    if (runLint) {
      results.push(["type-check", await run("type-check (tsc --noEmit)", bin("tsc"), ["--noEmit", "-p", "."], {})]);
      results.push(["lint", await run("lint (eslint)", bin("eslint"), ["."], {})]);
    }
    ensureMariadbInstalled();
    const distDir = process.env.BEADLINE_TEST_DIST_DIR || ".next-test";
    if (runVitest || runE2e) {
      console.log("\n=== starting throw-away MariaDB, object store and mail server ===");
      stack = await startLocalStack({ dir: tmp, ports: "free" });
      await migrateLatest(stack.env.MIGRATION_DATABASE_URL);
      stack.grantRights();
      const env = { ...stack.env, NODE_ENV: "test", NEXT_TELEMETRY_DISABLED: "1", BEADLINE_TEST_TMP: tmp };

      if (runVitest) {
        const files = filesAfter("--only-vitest");
        const report = path.join(tmp, "vitest.json");
        results.push(["vitest", await run("vitest (domain, database, actions, API)", bin("vitest"), ["run", "--reporter=default", "--reporter=json", `--outputFile.json=${report}`, ...files], env)]);
        countVitest(report);
      }
      if (runE2e) {
        const e2eEnv = { ...env, NODE_ENV: "production", BEADLINE_DIST_DIR: distDir, BEADLINE_PUBLIC_URL: "" };
        // next build adds its dist folder to tsconfig.json's include list: keep the file as committed.
        const tsconfig = readFileSync(path.join(ROOT, "tsconfig.json"), "utf8");
        const build = await run("next build (for browser tests)", process.execPath, [path.join(ROOT, "node_modules", "next", "dist", "bin", "next"), "build"], e2eEnv);
        writeFileSync(path.join(ROOT, "tsconfig.json"), tsconfig);
        results.push(["next build", build]);
        if (build === 0) {
          results.push(["demo seed", await run("demo scenario into the test database", bin("tsx"), ["tests/support/seed-demo-cli.ts"], env)]);
          const files = filesAfter("--only-e2e");
          const e2ePort = String(await freePort());
          const report = path.join(tmp, "playwright.json");
          results.push(["playwright", await run("browser tests (Playwright, Chromium)", bin("playwright"), ["test", "--reporter=list,json", ...files], { ...e2eEnv, E2E_PORT: e2ePort, PLAYWRIGHT_JSON_OUTPUT_NAME: report, CI: process.env.CI ?? "" })]);
          countPlaywright(report);
        }
      }
    }
    if (runCluster) {
      // Its own Galera nodes, HAProxy and instances on free ports; the throw-away server is not needed.
      if (stack) await stack.stop();
      stack = null;
      const report = path.join(tmp, "cluster.json");
      const code = await run("cluster fault test (three Galera nodes, HAProxy, two instances)", bin("tsx"), ["tests/fault/galera-cluster.ts"], { BEADLINE_DIST_DIR: distDir, NEXT_TELEMETRY_DISABLED: "1", CLUSTER_REPORT: report });
      results.push(["cluster", code]);
      const r = readJson(report) as { passed?: number; failed?: number; skipped?: number } | null;
      counts.passed += r?.passed ?? 0;
      counts.failed += r?.failed ?? (code === 0 ? 0 : 1);
      counts.skipped += r?.skipped ?? 0;
    }
  } catch (error) {
    console.error(`test run failed: ${redact(String((error as Error).stack ?? error))}`);
    results.push(["setup", 1]);
  } finally {
    await stopAll();
  }
  console.log("\n=== summary ===");
  for (const [name, code] of results) console.log(`${code === 0 ? "pass" : "FAIL"}  ${name}`);
  const failed = results.filter(([, c]) => c !== 0).length;
  // A failing step that is not a test runner (type-check, lint, build, set-up) counts as a failure too.
  const stepFailures = results.filter(([name, c]) => c !== 0 && name !== "vitest" && name !== "playwright" && name !== "cluster").length;
  console.log(`\ntests: ${counts.passed} passed, ${counts.failed + stepFailures} failed, ${counts.skipped} skipped`);
  return failed === 0 && results.length > 0 ? 0 : 1;
}

void main().then((code) => process.exit(code));
