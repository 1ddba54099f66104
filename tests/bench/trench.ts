// The Trench page's first load, as a fuser's phone in a dead zone sees it (`npm run bench`,
// or alone: `npm run bench -- --only trench`).
//
// (a) First-load JavaScript: the script files the server-rendered /trench page names in its
//     <script src> tags, each gzipped with node:zlib (level 9, as a static file server
//     would pre-compress them), summed. Chunks loaded later on demand (camera scanner,
//     photo picker) are not in the page and are not counted.
// (b) Load times in Chromium with the network and CPU slowed through the DevTools protocol:
//     Network.emulateNetworkConditions (400 ms latency, 400 kbit/s = 50,000 bytes/s down and
//     up) and Emulation.setCPUThrottlingRate 4, on a 390 × 844 viewport:
//     - first visit, empty cache, until the screen is usable;
//     - a repeat visit in the same browser (HTTP cache and, when the build registers one,
//       the service worker), until usable; when a service worker controls the page, also
//       a repeat visit with the network offline.
//     "Usable" is the moment the "Record joint" button first becomes enabled: it is
//     rendered disabled by the server and enabled only after React hydrated the form and
//     restored the device's draft (trench-screen.tsx), so from then on the fuser can type,
//     time and record. Read in the page as performance.now() (ms since navigation start).
// (c) Beside them, the framework's floor under the same profile (when the caller passes one):
//     a bare Next.js page with one client form (tests/bench/floor.ts), its first-load JS and
//     its first visits until its own "Record joint" button is enabled.
import { gzipSync } from "node:zlib";
import { chromium, type Browser, type BrowserContext, type Page } from "playwright-core";
import type { BenchFigure } from "./context";

const CHROMIUM_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--disable-dev-shm-usage"];
const SLOW_NETWORK = { offline: false, latency: 400, downloadThroughput: 50_000, uploadThroughput: 50_000 };
const CPU_SLOWDOWN = 4;
const JS_TARGET_BYTES = 150 * 1000;
const FIRST_VISIT_TARGET_MS = 4000;
const SHELL_VISIT_TARGET_MS = 1000;

/** The script files a page's HTML names, in order, without repeats; `nomodule` polyfills (not loaded by current browsers) left out. */
export function scriptSources(html: string): string[] {
  const out: string[] = [];
  for (const m of html.matchAll(/<script\b([^>]*)>/g)) {
    const src = /\bsrc="([^"]+)"/.exec(m[1])?.[1]?.replace(/&amp;/g, "&");
    if (!src || /\bnomodule\b/i.test(m[1])) continue;
    if (!out.includes(src)) out.push(src);
  }
  return out;
}

type FirstLoad = { files: { src: string; raw: number; gzip: number }[]; gzip: number; raw: number; inlineRaw: number };

async function firstLoadJs(baseUrl: string, cookie: string, pagePath = "/trench"): Promise<FirstLoad> {
  const res = await fetch(`${baseUrl}${pagePath}`, { headers: { cookie } });
  if (res.status !== 200) throw new Error(`GET ${pagePath} answered ${res.status}`);
  const html = await res.text();
  if (!html.includes("Record joint")) throw new Error(`GET ${pagePath} did not render its "Record joint" form (not signed in as a fuser?)`);
  const files = [];
  for (const src of scriptSources(html)) {
    const r = await fetch(new URL(src, baseUrl), { headers: { cookie, "accept-encoding": "identity" } });
    if (r.status !== 200) throw new Error(`${src} answered ${r.status}`);
    const body = Buffer.from(await r.arrayBuffer());
    files.push({ src, raw: body.length, gzip: gzipSync(body, { level: 9 }).length });
  }
  // Inline scripts (the React Server Components payload) travel in the HTML document itself.
  let inlineRaw = 0;
  for (const m of html.matchAll(/<script\b(?![^>]*\bsrc=)[^>]*>([\s\S]*?)<\/script>/g)) inlineRaw += Buffer.byteLength(m[1]);
  return { files, gzip: files.reduce((a, f) => a + f.gzip, 0), raw: files.reduce((a, f) => a + f.raw, 0), inlineRaw };
}

/** Records, in the page, when the "Record joint" button is first enabled (ms since navigation start). */
const USABLE_PROBE = `(() => {
  const find = () => [...document.querySelectorAll('button[type="submit"]')].find((b) => b.textContent.trim() === "Record joint");
  const check = () => {
    const b = find();
    if (b && !b.disabled && window.__trenchUsableAt === undefined) window.__trenchUsableAt = performance.now();
  };
  new MutationObserver(check).observe(document, { subtree: true, childList: true, attributes: true, attributeFilter: ["disabled"] });
})();`;

type Visit = { usableMs: number; scriptBytes: number; scripts: number; controlledBySw: boolean; domContentLoadedMs: number };

async function visit(page: Page, baseUrl: string, opts: { offline?: boolean; pagePath?: string } = {}): Promise<Visit> {
  const cdp = await page.context().newCDPSession(page);
  await cdp.send("Network.enable");
  await cdp.send("Network.emulateNetworkConditions", opts.offline ? { ...SLOW_NETWORK, offline: true } : SLOW_NETWORK);
  await cdp.send("Emulation.setCPUThrottlingRate", { rate: CPU_SLOWDOWN });
  let scriptBytes = 0;
  let scripts = 0;
  const types = new Map<string, string>();
  cdp.on("Network.responseReceived", (e: { requestId: string; type?: string }) => types.set(e.requestId, e.type ?? ""));
  cdp.on("Network.loadingFinished", (e: { requestId: string; encodedDataLength: number }) => {
    if (types.get(e.requestId) === "Script") {
      scripts += 1;
      scriptBytes += e.encodedDataLength;
    }
  });
  await page.goto(`${baseUrl}${opts.pagePath ?? "/trench"}`, { waitUntil: "commit", timeout: 120_000 });
  await page.waitForFunction(() => (window as unknown as { __trenchUsableAt?: number }).__trenchUsableAt !== undefined, null, { timeout: 120_000, polling: 250 });
  const result = await page.evaluate(() => ({
    usableMs: (window as unknown as { __trenchUsableAt: number }).__trenchUsableAt,
    controlledBySw: Boolean(navigator.serviceWorker?.controller),
    domContentLoadedMs: (performance.getEntriesByType("navigation")[0] as PerformanceNavigationTiming | undefined)?.domContentLoadedEventEnd ?? NaN,
  }));
  await cdp.send("Emulation.setCPUThrottlingRate", { rate: 1 });
  await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });
  await cdp.detach();
  return { ...result, scriptBytes, scripts };
}

const med = (v: number[]) => [...v].sort((a, b) => a - b)[Math.floor((v.length - 1) / 2)];
const sec = (ms: number) => Number((ms / 1000).toFixed(2));

/**
 * The framework's floor under the same profile: a bare Next.js page with one client form
 * (tests/bench/floor.ts, FLOOR_PAGE) on its own server, first-load JS and first visits until
 * its "Record joint" button is enabled. What no App Router page of this stack can beat.
 */
async function measurePageFloor(browser: Browser, floorUrl: string, floorPath: string, runs: number, log: (line: string) => void): Promise<{ js: FirstLoad; cold: Visit[] }> {
  const js = await firstLoadJs(floorUrl, "", floorPath);
  const cold: Visit[] = [];
  for (let i = 0; i < runs; i += 1) {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, hasTouch: true, isMobile: true, deviceScaleFactor: 1 });
    try {
      await context.addInitScript(USABLE_PROBE);
      cold.push(await visit(await context.newPage(), floorUrl, { pagePath: floorPath }));
    } finally {
      await context.close();
    }
  }
  log(`floor page (bare Next.js, one client form): ${(js.gzip / 1000).toFixed(1)} kB first-load JS gzip; first visits ${cold.map((v) => `${sec(v.usableMs)} s (${(v.scriptBytes / 1000).toFixed(0)} kB of scripts)`).join(", ")}`);
  return { js, cold };
}

/**
 * Measures the Trench page's first load for a signed-in fuser. `cookie` is the session
 * cookie ("name=value"); `runs` cold/warm pairs are taken and their medians reported.
 */
export async function measureTrenchLoad({ baseUrl, cookie, log, runs = 3, floor }: { baseUrl: string; cookie: string; log: (line: string) => void; runs?: number; /** A bare Next.js page to measure beside the Trench (tests/bench/floor.ts). */ floor?: { url: string; path: string } }): Promise<{ figures: BenchFigure[]; detail: Record<string, unknown> }> {
  const figures: BenchFigure[] = [];
  const js = await firstLoadJs(baseUrl, cookie);
  log(`trench first-load JS: ${js.files.length} script files, ${(js.gzip / 1000).toFixed(1)} kB gzip (${(js.raw / 1000).toFixed(1)} kB raw); inline RSC payload ${(js.inlineRaw / 1000).toFixed(1)} kB raw`);
  for (const f of [...js.files].sort((a, b) => b.gzip - a.gzip).slice(0, 8)) log(`  ${(f.gzip / 1000).toFixed(1).padStart(6)} kB gzip  ${f.src}`);
  figures.push({ figure: "Trench first-load JS (script files of /trench, gzip)", value: Number((js.gzip / 1000).toFixed(1)), unit: "kB", target: "< 150 kB", pass: js.gzip < JS_TARGET_BYTES, note: `${js.files.length} files, ${(js.raw / 1000).toFixed(0)} kB before gzip; on-demand chunks (camera, photos) not counted` });

  const [name, ...rest] = cookie.split("=");
  const browser: Browser = await chromium.launch({ executablePath: "/usr/bin/chromium", headless: true, args: CHROMIUM_ARGS });
  const cold: Visit[] = [];
  const warm: Visit[] = [];
  const offline: Visit[] = [];
  let pageFloor: Awaited<ReturnType<typeof measurePageFloor>> | null = null;
  try {
    if (floor) pageFloor = await measurePageFloor(browser, floor.url, floor.path, runs, log);
    for (let i = 0; i < runs; i += 1) {
      const context: BrowserContext = await browser.newContext({ viewport: { width: 390, height: 844 }, hasTouch: true, isMobile: true, deviceScaleFactor: 1 });
      try {
        await context.addCookies([{ name, value: rest.join("="), url: baseUrl }]);
        await context.addInitScript(USABLE_PROBE);
        const page = await context.newPage();
        cold.push(await visit(page, baseUrl));
        // Give a service worker, if the build has one, time to install and claim the page.
        await page.waitForTimeout(3000);
        warm.push(await visit(page, baseUrl));
        if (warm[warm.length - 1].controlledBySw) offline.push(await visit(page, baseUrl, { offline: true }));
      } finally {
        await context.close();
      }
      log(`trench visit ${i + 1}: first ${sec(cold[i].usableMs)} s (${cold[i].scripts} scripts, ${(cold[i].scriptBytes / 1000).toFixed(0)} kB on the wire), repeat ${sec(warm[i].usableMs)} s (${warm[i].controlledBySw ? "service worker" : "HTTP cache, no service worker"})${offline[i] ? `, offline ${sec(offline[i].usableMs)} s` : ""}`);
    }
  } finally {
    await browser.close();
  }
  if (pageFloor) {
    const floorColdMs = med(pageFloor.cold.map((v) => v.usableMs));
    figures.push({ figure: "floor: bare Next.js page with one client form, first-load JS (gzip)", value: Number((pageFloor.js.gzip / 1000).toFixed(1)), unit: "kB", pass: null, note: `${pageFloor.js.files.length} files; the framework alone, before any Beadline code; the Trench carries ${((js.gzip - pageFloor.js.gzip) / 1000).toFixed(1)} kB more` });
    figures.push({ figure: "floor: bare Next.js page with one client form, first visit until usable", value: sec(floorColdMs), unit: "s", pass: null, note: `median of ${runs}: ${pageFloor.cold.map((v) => sec(v.usableMs)).join(", ")} s; same profile and "usable" test as the Trench rows below` });
  }
  const coldMs = med(cold.map((v) => v.usableMs));
  const warmMs = med(warm.map((v) => v.usableMs));
  const sw = warm.every((v) => v.controlledBySw);
  const conditions = "400 ms RTT, 400 kbit/s, CPU ÷4, 390×844";
  figures.push({ figure: "Trench first visit, empty cache, until usable", value: sec(coldMs), unit: "s", target: "< 4 s", pass: coldMs < FIRST_VISIT_TARGET_MS, note: `median of ${runs}: ${cold.map((v) => sec(v.usableMs)).join(", ")} s; ${conditions}; usable = "Record joint" enabled (hydrated, draft restored)` });
  figures.push({
    figure: sw ? "Trench repeat visit from the offline shell (service worker)" : "Trench repeat visit, warm HTTP cache (no service worker in this build)",
    value: sec(warmMs),
    unit: "s",
    target: "< 1 s",
    pass: warmMs < SHELL_VISIT_TARGET_MS,
    note: `median of ${runs}: ${warm.map((v) => sec(v.usableMs)).join(", ")} s; ${conditions}; ${warm.map((v) => (v.scriptBytes / 1000).toFixed(0)).join("/")} kB of scripts over the network`,
  });
  if (offline.length) {
    const offMs = med(offline.map((v) => v.usableMs));
    figures.push({ figure: "Trench repeat visit with the network offline (service worker)", value: sec(offMs), unit: "s", target: "< 1 s", pass: offMs < SHELL_VISIT_TARGET_MS, note: `median of ${offline.length}: ${offline.map((v) => sec(v.usableMs)).join(", ")} s; CPU ÷4` });
  }
  return { figures, detail: { firstLoadJs: js, cold, warm, offline, pageFloor } };
}
