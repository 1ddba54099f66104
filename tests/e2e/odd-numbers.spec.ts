// Against the production server (`next start`): every page is opened with each query
// parameter it reads set, one at a time, to a number no field accepts as it is (400 nines,
// 1e309, -0, NaN, hex, empty, huge …), and every [id]/[code] page with such segments: no 500
// (a bad filter is shown as refused, a bad id is a 404). And an anonymous sign-in body sent
// chunked without end is answered 413 after a few kilobytes, not read to its end.
// source: OWASP Input Validation Cheat Sheet (type and range checks), OWASP Denial of Service
// Cheat Sheet (bound request bodies), RFC 9110 §15.5.14 (413 Content Too Large).
import { readdirSync, readFileSync, statSync } from "node:fs";
import http from "node:http";
import path from "node:path";
import { expect, test, type APIRequestContext } from "@playwright/test";
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from "./pages/sign-in-page";
import { listeningPid, residentBytes } from "../support/listening-process";

const ODD = ["9".repeat(400), "1e309", "-0", "NaN", "0x1F", "", "99999999999999999999", "1.5", "-1", "%"];
/** Names a page may read; each page is walked with those its source mentions. */
const NAMES = ["job", "fuser", "machine", "finding", "joint", "weeks", "ids", "kind", "skip", "sheet", "stock", "status", "q", "code", "lot", "manufacturer", "from", "to", "outcome", "review", "sort", "dir", "sideA", "sideB", "limit", "after"];

function pages(): { route: string; source: string }[] {
  const root = path.join(process.cwd(), "app");
  const out: { route: string; source: string }[] = [];
  const walk = (dir: string) => {
    for (const entry of readdirSync(dir)) {
      const full = path.join(dir, entry);
      if (statSync(full).isDirectory()) walk(full);
      else if (entry === "page.tsx") {
        const segments = path.relative(root, dir).split(path.sep).filter((s) => s && !/^\(.*\)$/.test(s));
        if (segments.some((s) => s.startsWith("_") || s.startsWith("~"))) continue;
        out.push({ route: "/" + segments.join("/"), source: readFileSync(full, "utf8") });
      }
    }
  };
  walk(root);
  return out;
}

/** The register's filter lives in domain/register; its page hands the whole query to it. */
const REGISTER_NAMES = ["job", "from", "to", "fuser", "machine", "lot", "outcome", "review", "finding", "q", "sort", "dir"];

function namesOf(page: { route: string; source: string }): string[] {
  if (page.route === "/register") return REGISTER_NAMES;
  return NAMES.filter((n) => new RegExp(`(?:params|query)\\.${n}\\b|["']${n}["']|\\b${n}:`).test(page.source));
}

async function signedIn(playwright: { request: { newContext: (o: { baseURL: string }) => Promise<APIRequestContext> } }, baseURL: string, email: string): Promise<APIRequestContext> {
  const context = await playwright.request.newContext({ baseURL });
  const res = await context.post("/api/v1/session", { data: { email, password: DEMO_PASSWORD } });
  expect(res.status()).toBe(200);
  return context;
}

test("every page answers odd numbers in its query and path without a 500", async ({ playwright, baseURL }) => {
  test.setTimeout(300_000);
  const admin = await signedIn(playwright, baseURL!, DEMO_ACCOUNTS.admin);
  const fuser = await signedIn(playwright, baseURL!, DEMO_ACCOUNTS.fuser);
  const problems: string[] = [];
  let sent = 0;
  for (const page of pages().filter((p) => p.route !== "/sign-in")) {
    // Who may open it: the administrator, else the fuser (the Trench).
    const base = page.route.replace("[id]", "1").replace("[code]", "LV-C0001");
    const who = (await admin.get(base, { maxRedirects: 0 })).status() === 404 ? fuser : admin;
    const urls: string[] = [];
    for (const name of namesOf(page)) for (const value of ODD) urls.push(`${base}?${new URLSearchParams({ [name]: value })}`);
    if (/\[(id|code)\]/.test(page.route)) for (const value of ODD) urls.push(page.route.replace(/\[(id|code)\]/, encodeURIComponent(value) || "%20"));
    for (let i = 0; i < urls.length; i += 4) {
      await Promise.all(
        urls.slice(i, i + 4).map(async (url) => {
          const res = await who.get(url, { maxRedirects: 0 });
          sent += 1;
          if (res.status() >= 500) problems.push(`${url.slice(0, 80)} → ${res.status()}`);
        }),
      );
    }
  }
  expect(problems).toEqual([]);
  expect(sent).toBeGreaterThan(100);
  await admin.dispose();
  await fuser.dispose();
});

test("the insights page shows a refused job filter as a message, not an error", async ({ playwright, baseURL }) => {
  const admin = await signedIn(playwright, baseURL!, DEMO_ACCOUNTS.admin);
  const res = await admin.get("/insights?job=1e309");
  expect(res.status()).toBe(200);
  expect(await res.text()).toContain("The job in the address is not a job on file; showing every job.");
  await admin.dispose();
});

/** Sends an anonymous sign-in body chunked (no length) until answered or `cap` bytes are written. */
function streamSignInBody(baseURL: string | undefined, cap: number): Promise<{ status: number; body: string; written: number }> {
  const url = new URL("/api/v1/session", baseURL);
  const CHUNK = Buffer.alloc(64 * 1024, 0x20);
  let written = 0;
  return new Promise<{ status: number; body: string }>((resolve, reject) => {
    const req = http.request(url, { method: "POST", headers: { "content-type": "application/json", "transfer-encoding": "chunked" } }, (res) => {
      let body = "";
      res.setEncoding("utf8");
      res.on("data", (c: string) => (body += c));
      res.on("end", () => resolve({ status: res.statusCode ?? 0, body }));
    });
    req.on("error", (error) => (written > 0 ? undefined : reject(error))); // the server may close the socket once it has answered
    let answered = false;
    req.on("response", () => (answered = true));
    const pump = () => {
      while (!answered && written < cap) {
        written += CHUNK.length;
        if (!req.write(CHUNK)) return void req.once("drain", pump);
      }
      req.end();
    };
    pump();
  }).then((a) => ({ ...a, written }));
}

test("an anonymous sign-in body streamed without end is refused with 413 after a few kilobytes", async ({ baseURL }) => {
  const { written, ...answer } = await streamSignInBody(baseURL, 100 * 1024 * 1024);
  expect(answer.status).toBe(413);
  expect(JSON.parse(answer.body)).toMatchObject({ error: { code: "too-large", message: expect.stringContaining("8 kB") } });
  // Answered long before the 100 MiB were sent: the server stopped reading at its limit.
  expect(written).toBeLessThan(20 * 1024 * 1024);
});

test("the server's memory grows by less than 32 MB while an anonymous 128 MiB body is refused", async ({ baseURL }) => {
  // The bar: reading a whole body before checking its size raised server memory by
  // ~750 MB for a 400 MiB body. Resident memory of the `next start` process is sampled every
  // 20 ms while the body is offered, and the peak compared with the figure before.
  const pid = listeningPid(Number(new URL(baseURL!).port));
  const before = residentBytes(pid);
  let peak = before;
  const sampler = setInterval(() => (peak = Math.max(peak, residentBytes(pid))), 20);
  try {
    const answer = await streamSignInBody(baseURL, 128 * 1024 * 1024);
    expect(answer.status).toBe(413);
    await new Promise((r) => setTimeout(r, 200));
  } finally {
    clearInterval(sampler);
  }
  peak = Math.max(peak, residentBytes(pid));
  expect(peak - before, `server RSS ${(before / 2 ** 20).toFixed(1)} MB before, ${(peak / 2 ** 20).toFixed(1)} MB at its peak`).toBeLessThan(32 * 1024 * 1024);
});
