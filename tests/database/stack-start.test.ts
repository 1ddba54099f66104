// A failed first start of the local stack leaks nothing and does not stick: the error is one
// line with every generated secret masked, and the next start succeeds without any clean-up.
// Each case runs the stack launcher (tests/support/local-stack-cli.ts) as its own process on a
// fresh directory, the way `npm start` and `npm test` run it.
import { spawn, spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { initialisingDir } from "@/database/local/mariadb";

const ROOT = path.resolve(__dirname, "../..");
const CLI = [path.join(ROOT, "node_modules", ".bin", "tsx"), path.join(ROOT, "tests", "support", "local-stack-cli.ts")];
const dirs: string[] = [];
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

function freshDir(): string {
  const dir = mkdtempSync(path.join(os.tmpdir(), "beadline-stack-start-"));
  dirs.push(dir);
  return dir;
}

function launch(dir: string, ...args: string[]) {
  const r = spawnSync(CLI[0]!, [CLI[1]!, dir, ...args], { encoding: "utf8", cwd: ROOT, timeout: 120_000 });
  return { status: r.status, output: `${r.stdout}${r.stderr}`, stderr: r.stderr };
}

function secretsOf(dir: string): string[] {
  const folder = path.join(dir, "secrets");
  return readdirSync(folder).map((name) => readFileSync(path.join(folder, name), "utf8").trim());
}

describe("local stack first start", () => {
  it("reports a failing set-up statement in one line without the passwords it carried, and starts next time", () => {
    const dir = freshDir();
    const failed = launch(dir, "--fault", "provision-sql");
    expect(failed.status).toBe(1);
    const lines = failed.stderr.trim().split("\n");
    expect(lines).toHaveLength(1);
    expect(lines[0]).toMatch(/^\[beadline\] Could not start .*\[redacted\].*run the same command again/);
    const secrets = secretsOf(dir);
    expect(secrets).toHaveLength(5);
    for (const s of secrets) expect(failed.output).not.toContain(s);
    for (const log of ["initialise.log", "error.log"]) expect(readFileSync(path.join(dir, "mariadb", log), "utf8")).not.toContain(secrets[0]);

    const next = launch(dir);
    expect(next.output).toMatch(/stack ready/);
    expect(next.status).toBe(0);
  }, 240_000);

  it("redoes a first initialisation that was killed half-way instead of sticking on it", async () => {
    const dir = freshDir();
    const partial = initialisingDir(path.join(dir, "mariadb"));
    const child = spawn(CLI[0]!, [CLI[1]!, dir], { cwd: ROOT, stdio: "ignore", detached: true });
    const deadline = Date.now() + 90_000;
    // Kill the whole launcher (and mariadb-install-db's bootstrap server) while the system tables are being written.
    while (!existsSync(path.join(partial, "mysql")) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 20));
    expect(existsSync(path.join(partial, "mysql"))).toBe(true);
    process.kill(-child.pid!, "SIGKILL");
    await new Promise((r) => child.once("exit", r));
    expect(existsSync(path.join(dir, "mariadb", "data"))).toBe(false);

    const next = launch(dir);
    expect(next.output).toMatch(/stack ready/);
    expect(next.status).toBe(0);
    expect(existsSync(partial)).toBe(false);
    expect(existsSync(path.join(dir, "mariadb", "data", "mysql"))).toBe(true);
  }, 240_000);
});
