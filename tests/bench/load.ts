// Mixed load on `next start` over loopback (autocannon): 50 clients for 60 s (`npm run bench`: 30 s) reading the
// register (clerk), opening joint pages /joints/<id> (clerk) and submitting joints
// (fuser), run twice. Measures requests/s, p50/p99 latency, errors (socket errors, timeouts
// and any answer other than the expected status), server RSS before and after each run,
// and checks that every joint answered 201 is in the database. The second run must not
// grow the server's memory by more than 20 % over the first (a leak shows as steady growth).
// Bounded in count and time; sends only to the loopback server under test.
// `npm run bench` (tests/bench/run.ts) calls runLoadBench(ctx); not part of `npm test`.
import { randomUUID } from "node:crypto";
import { readFileSync } from "node:fs";
import type { Knex } from "knex";
import type { BenchContext, BenchFigure } from "./context";
import { demoJointBody } from "../support/joint-body";
import { TARGET_ROWS } from "./targets";

/** Issue #18's mixed-load target, per run: at least this throughput and a p99 under this latency. */
export const MIXED_LOAD_TARGET = { connections: 50, minRequestsPerS: 150, maxP99Ms: 1000 };

type Autocannon = (opts: Record<string, unknown>, cb: (err: Error | null, result: AutocannonResult) => void) => unknown;
type AutocannonResult = {
  requests: { average: number; total: number };
  latency: { p50: number; p99: number; p99_9?: number; average: number; max: number };
  errors: number;
  timeouts: number;
  non2xx: number;
  duration: number;
};

export type LoadOptions = {
  connections?: number;
  durationS?: number;
  runs?: number;
  /** Hard cap on requests per run (autocannon `amount`), so a fast server cannot run away. */
  maxRequestsPerRun?: number;
};

export type LoadRun = {
  run: number;
  requestsPerS: number;
  total: number;
  p50Ms: number;
  p99Ms: number;
  maxMs: number;
  errors: number;
  unexpected: Record<string, number>;
  statuses: Record<string, number>;
  rssBeforeMb: number;
  rssAfterMb: number;
  created: number;
  inDb: number;
};

type Kind = "register" | "joint-page" | "submit";
const EXPECTED: Record<Kind, number[]> = { register: [200], "joint-page": [200], submit: [201] };

function rssOf(pid: number): number {
  try {
    const m = /^VmRSS:\s+(\d+) kB/m.exec(readFileSync(`/proc/${pid}/status`, "utf8"));
    return m ? Number(m[1]) / 1024 : 0;
  } catch {
    return 0;
  }
}

async function settle(ms: number): Promise<void> {
  await new Promise((r) => setTimeout(r, ms));
}

/** Jobs, equipment and a body builder for valid joints of the demo fuser (demo scenario loaded). */
export async function submissionSetup(owner: Knex): Promise<{ body: (clientId: string) => Record<string, unknown>; jobIds: number[] }> {
  const fuser = await owner("users").where({ email: "fuser@larkmoor-gas.example" }).first("id", "crew_id");
  const demoJob = await owner("jobs").where({ code: "WO-24117" }).first("procedure_id");
  const machine = await owner("fusion_machines").where({ asset_tag: "FM-201" }).first("id");
  const heater = await owner("heater_plates").where({ asset_tag: "HP-31" }).first("id");
  if (!fuser || !demoJob || !machine || !heater) throw new Error("the load bench needs the demo scenario (fuser, job WO-24117, FM-201, HP-31)");
  const jobIds: number[] = [];
  const tag = Date.now().toString(36).slice(-4).toUpperCase();
  for (let i = 1; i <= 10; i += 1) {
    const [id] = await owner("jobs").insert({ code: `LD-${tag}-${i}`, name: `Load bench job ${i}`, place: "Load lane", status: "open", procedure_id: demoJob.procedure_id, crew_id: fuser.crew_id });
    await owner("job_counters").insert({ job_id: id, last_joint_no: 0 });
    jobIds.push(Number(id));
  }
  let n = 0;
  const body = (clientId: string) => demoJointBody({ clientId, jobId: jobIds[n++ % jobIds.length], machineId: machine.id, heaterId: heater.id, station: "Load 1+00" });
  return { body, jobIds };
}

/**
 * The mixed load: per client connection the sequence register page, joint page, register
 * page, joint page, joint submission (40 % / 40 % / 20 %), repeated for `durationS`.
 */
export async function runMixedLoad(
  ctx: Pick<BenchContext, "baseUrl" | "serverPid" | "owner" | "signIn" | "demoPassword" | "log">,
  options: LoadOptions = {},
): Promise<LoadRun[]> {
  const connections = options.connections ?? MIXED_LOAD_TARGET.connections;
  const durationS = options.durationS ?? 60;
  const runs = options.runs ?? 2;
  const maxRequests = options.maxRequestsPerRun ?? 200_000;
  const { default: autocannon } = (await import("autocannon" as string)) as { default: Autocannon };
  const clerkCookie = await ctx.signIn("clerk@larkmoor-gas.example", ctx.demoPassword);
  const fuserCookie = await ctx.signIn("fuser@larkmoor-gas.example", ctx.demoPassword);
  const { body, jobIds } = await submissionSetup(ctx.owner);

  // Joint pages of real joints: a spread of ids over the whole register.
  const [range] = (await ctx.owner.raw("SELECT MIN(id) AS lo, MAX(id) AS hi, COUNT(*) AS n FROM joints")) as unknown as [{ lo: number | null; hi: number | null; n: number }[]];
  let pageIds: number[] = [];
  if (Number(range[0].n) > 0) {
    const lo = Number(range[0].lo);
    const hi = Number(range[0].hi);
    const step = Math.max(1, Math.floor((hi - lo) / 200));
    const rows = (await ctx.owner("joints").whereIn("id", Array.from({ length: 200 }, (_, i) => lo + i * step)).select("id")) as { id: number }[];
    pageIds = rows.map((r) => Number(r.id));
  }
  if (!pageIds.length) {
    // An empty register: make a few joints first so joint pages have something to show.
    for (let i = 0; i < 20; i += 1) {
      const res = await fetch(`${ctx.baseUrl}/api/v1/joints`, { method: "POST", headers: { cookie: fuserCookie, "content-type": "application/json" }, body: JSON.stringify(body(randomUUID())) });
      const json = (await res.json()) as { joint?: { id: number } };
      if (res.status !== 201 || !json.joint) throw new Error(`a seed joint answered ${res.status}`);
      pageIds.push(json.joint.id);
    }
  }
  const registerQueries = ["limit=100", "limit=100&outcome=out-of-limits", "limit=100&sort=number&dir=asc", "limit=50&review=pending-review", "limit=100&q=LV-C00"];

  // Warm-up: every kind once (first compiles, caches), each must answer as expected.
  const warm = [
    [`/api/v1/register?${registerQueries[0]}`, clerkCookie],
    [`/joints/${pageIds[0]}`, clerkCookie],
  ] as const;
  for (const [p, cookie] of warm) {
    const res = await fetch(`${ctx.baseUrl}${p}`, { headers: { cookie }, redirect: "manual" });
    await res.arrayBuffer();
    if (res.status !== 200) throw new Error(`warm-up ${p} answered ${res.status}`);
  }

  const results: LoadRun[] = [];
  for (let run = 1; run <= runs; run += 1) {
    const statuses = new Map<string, number>();
    const unexpected = new Map<string, number>();
    const pending = new Map<string, Record<string, unknown>>();
    let created = 0;
    let seq = 0;
    const [maxRow] = (await ctx.owner.raw("SELECT COALESCE(MAX(id), 0) AS id FROM joints")) as unknown as [{ id: number }[]];
    const maxBefore = Number(maxRow[0].id);
    const count = (kind: Kind, status: number) => {
      const key = `${kind} ${status}`;
      statuses.set(key, (statuses.get(key) ?? 0) + 1);
      if (!EXPECTED[kind].includes(status)) unexpected.set(key, (unexpected.get(key) ?? 0) + 1);
    };
    const read = (kind: Kind, path: () => string) => ({
      method: "GET",
      setupRequest: (req: Record<string, unknown>) => ({ ...req, method: "GET", path: path(), headers: { cookie: clerkCookie }, body: undefined }),
      onResponse: (status: number) => count(kind, status),
    });
    const submit = {
      method: "POST",
      setupRequest: (req: Record<string, unknown>, context: Record<string, unknown>) => {
        const clientId = randomUUID();
        const b = body(clientId);
        context.clientId = clientId;
        pending.set(clientId, b);
        return { ...req, method: "POST", path: "/api/v1/joints", headers: { cookie: fuserCookie, "content-type": "application/json" }, body: JSON.stringify(b) };
      },
      onResponse: (status: number, _body: string, context: Record<string, unknown>) => {
        count("submit", status);
        if (status === 201) created += 1;
        pending.delete(String(context.clientId));
      },
    };
    const register = read("register", () => `/api/v1/register?${registerQueries[seq++ % registerQueries.length]}`);
    const page = read("joint-page", () => `/joints/${pageIds[seq++ % pageIds.length]}`);

    await settle(2000);
    const rssBeforeMb = rssOf(ctx.serverPid);
    ctx.log(`load run ${run}/${runs}: ${connections} clients for ${durationS} s (register 40 %, joint pages 40 %, submissions 20 %); server RSS ${rssBeforeMb.toFixed(0)} MB`);
    const result = await new Promise<AutocannonResult>((resolve, reject) => {
      autocannon(
        { url: ctx.baseUrl, connections, duration: durationS, timeout: 10, requests: [register, page, register, page, submit], maxOverallRequests: maxRequests },
        (err, res) => (err ? reject(err) : resolve(res)),
      );
    });
    // Submissions cut off when the clock stopped: retried with the same client id (201 new, 200 already recorded).
    let retried = 0;
    for (const b of pending.values()) {
      const res = await fetch(`${ctx.baseUrl}/api/v1/joints`, { method: "POST", headers: { cookie: fuserCookie, "content-type": "application/json" }, body: JSON.stringify(b) });
      if (res.status === 201 || res.status === 200) retried += 1;
      await res.arrayBuffer();
    }
    const [countRow] = (await ctx.owner.raw("SELECT COUNT(*) AS n FROM joints WHERE id > ? AND job_id IN (?)", [maxBefore, jobIds])) as unknown as [{ n: number }[]];
    await settle(3000);
    const rssAfterMb = rssOf(ctx.serverPid);
    const errors = Number(result.errors ?? 0) + Number(result.timeouts ?? 0) + [...unexpected.values()].reduce((a, b) => a + b, 0);
    const r: LoadRun = {
      run,
      requestsPerS: result.requests.average,
      total: result.requests.total,
      p50Ms: result.latency.p50,
      p99Ms: result.latency.p99,
      maxMs: result.latency.max,
      errors,
      unexpected: Object.fromEntries(unexpected),
      statuses: Object.fromEntries(statuses),
      rssBeforeMb,
      rssAfterMb,
      created: created + retried,
      inDb: Number(countRow[0].n),
    };
    ctx.log(
      `load run ${run}: ${r.requestsPerS} req/s (${r.total} requests), p50 ${r.p50Ms} ms, p99 ${r.p99Ms} ms, max ${r.maxMs} ms; errors ${r.errors} (socket ${result.errors}, timeouts ${result.timeouts}, unexpected ${JSON.stringify(r.unexpected)}); statuses ${JSON.stringify(r.statuses)}; joints 201 ${r.created} / in DB ${r.inDb}; RSS ${rssBeforeMb.toFixed(0)} → ${rssAfterMb.toFixed(0)} MB`,
    );
    results.push(r);
  }
  return results;
}

/** Figures for the bench table (tests/bench/run.ts prints them). */
export function loadFigures(runs: LoadRun[], connections = 50, durationS = 60): BenchFigure[] {
  const figures: BenchFigure[] = [];
  for (const r of runs) {
    // The issue's target is for 50 clients; at any other client count the figures are shown without a verdict.
    const judged = connections === MIXED_LOAD_TARGET.connections;
    const targetRow = judged ? TARGET_ROWS.mixedLoad.row : undefined;
    figures.push({
      figure: `mixed load run ${r.run} (${connections} clients, ${durationS} s): requests/s`,
      value: Math.round(r.requestsPerS),
      unit: "req/s",
      target: `≥ ${MIXED_LOAD_TARGET.minRequestsPerS} req/s`,
      pass: judged ? r.requestsPerS >= MIXED_LOAD_TARGET.minRequestsPerS : null,
      targetRow,
      note: `${r.total} requests; statuses ${JSON.stringify(r.statuses)}`,
    });
    figures.push({ figure: `mixed load run ${r.run}: p99 latency`, value: r.p99Ms, unit: "ms", target: `< ${MIXED_LOAD_TARGET.maxP99Ms} ms`, pass: judged ? r.p99Ms < MIXED_LOAD_TARGET.maxP99Ms : null, targetRow, note: `p50 ${r.p50Ms} ms, max ${r.maxMs} ms` });
    figures.push({ figure: `mixed load run ${r.run}: errors`, value: r.errors, target: "0", pass: r.errors === 0, targetRow, note: Object.keys(r.unexpected).length ? `unexpected ${JSON.stringify(r.unexpected)}` : "socket errors, timeouts and unexpected statuses" });
    figures.push({ figure: `mixed load run ${r.run}: joints answered 201 = in database`, value: `${r.created} = ${r.inDb}`, target: "equal", pass: r.created === r.inDb });
    figures.push({ figure: `mixed load run ${r.run}: server RSS before → after`, value: `${r.rssBeforeMb.toFixed(0)} → ${r.rssAfterMb.toFixed(0)}`, unit: "MB", pass: null });
  }
  if (runs.length >= 2) {
    const first = runs[0].rssAfterMb;
    const last = runs[runs.length - 1].rssAfterMb;
    const growth = first > 0 ? ((last - first) / first) * 100 : NaN;
    figures.push({ figure: "mixed load: server RSS growth from run 1 to the last run", value: Number(growth.toFixed(1)), unit: "%", target: "≤ 20 %", pass: growth <= 20, note: `${first.toFixed(0)} MB after run 1, ${last.toFixed(0)} MB after run ${runs.length}` });
  }
  return figures;
}

/** Called by `npm run bench` with the running server and its database. */
export async function runLoadBench(ctx: BenchContext, options: LoadOptions = {}): Promise<BenchFigure[]> {
  const runs = await runMixedLoad(ctx, options);
  return loadFigures(runs, options.connections ?? MIXED_LOAD_TARGET.connections, options.durationS ?? 60);
}

// Stand-alone: `tsx tests/bench/load.ts --base-url http://127.0.0.1:3000 --server-pid <pid> [--duration 60] [--connections 50]`
// against a running server with the demo scenario, MIGRATION_DATABASE_URL set to its database.
if (process.argv[1] && /tests[\\/]bench[\\/]load\.ts$/.test(process.argv[1])) {
  const args = process.argv.slice(2);
  const value = (name: string) => (args.includes(name) ? args[args.indexOf(name) + 1] : undefined);
  void (async () => {
    const { ownerKnex } = await import("../../database/migrate");
    const baseUrl = value("--base-url") ?? "http://127.0.0.1:3000";
    const owner = ownerKnex(process.env.MIGRATION_DATABASE_URL);
    const signIn = async (email: string, password: string) => {
      const res = await fetch(`${baseUrl}/api/v1/session`, { method: "POST", headers: { "content-type": "application/json" }, body: JSON.stringify({ email, password }) });
      if (res.status !== 200) throw new Error(`sign-in of ${email} answered ${res.status}`);
      return (res.headers.get("set-cookie") ?? "").split(";")[0];
    };
    const options = { durationS: Number(value("--duration") ?? 60), connections: Number(value("--connections") ?? 50), runs: Number(value("--runs") ?? 2) };
    try {
      const runs = await runMixedLoad({ baseUrl, serverPid: Number(value("--server-pid") ?? 0), owner, signIn, demoPassword: "beadline-demo-2026", log: (l) => console.log(`[load] ${l}`) }, options);
      const figures = loadFigures(runs, options.connections, options.durationS);
      for (const f of figures) console.log(`${f.pass === null ? "info" : f.pass ? "pass" : "FAIL"}  ${f.figure}: ${f.value}${f.unit ? ` ${f.unit}` : ""}${f.note ? `  (${f.note})` : ""}`);
      process.exitCode = figures.some((f) => f.pass === false) ? 1 : 0;
    } finally {
      await owner.destroy();
    }
  })();
}
