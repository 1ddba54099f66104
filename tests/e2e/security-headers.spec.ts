// Security headers and browser-facing protections on the production server (`next start`):
// a Content-Security-Policy without 'unsafe-eval' that forbids framing, nosniff, a referrer
// policy, HSTS, no X-Powered-By — on pages, API answers, static assets and error pages —
// and Next's own Origin check on server actions (a cross-site action call changes nothing).
// source: OWASP HTTP Headers Cheat Sheet and OWASP Secure Headers Project; CSP Level 3
// (frame-ancestors, script-src); RFC 6797 (Strict-Transport-Security); Next.js docs,
// "Server Actions: security" (Origin compared with Host / X-Forwarded-Host).
// Pages: a nonce-based script policy (a new nonce on every answer, on every script Next
// writes), no 'unsafe-inline' for scripts; the attachment download: its own sandbox policy
// with nothing allowed to run, not replaced by the site-wide one.
import { existsSync, readFileSync } from "node:fs";
import path from "node:path";
import { PNG } from "pngjs";
import { expect, test, type APIRequestContext, type APIResponse } from "@playwright/test";
import { DEMO_ACCOUNTS, DEMO_PASSWORD } from "./pages/sign-in-page";

function directives(csp: string): Map<string, string[]> {
  const out = new Map<string, string[]>();
  for (const part of csp.split(";").map((s) => s.trim()).filter(Boolean)) {
    const [name, ...values] = part.split(/\s+/);
    out.set(name.toLowerCase(), values);
  }
  return out;
}

/** The one Content-Security-Policy header of an answer (two would both be enforced). */
function onePolicy(res: APIResponse, where: string): string {
  const all = res.headersArray().filter((h) => h.name.toLowerCase() === "content-security-policy");
  expect(all.length, `${where}: exactly one CSP header`).toBe(1);
  return all[0].value;
}

function expectSecurityHeaders(res: APIResponse, where: string): void {
  const h = res.headers();
  const csp = onePolicy(res, where);
  const d = directives(csp);
  const scriptSrc = d.get("script-src") ?? d.get("default-src") ?? [];
  expect(scriptSrc, `${where}: script-src`).not.toContain("'unsafe-eval'");
  expect(scriptSrc, `${where}: script-src`).not.toContain("'unsafe-inline'");
  expect(scriptSrc.some((s) => s === "*" || s === "http:" || s === "https:" || s === "data:"), `${where}: script-src allows any host`).toBe(false);
  expect(d.get("frame-ancestors"), `${where}: frame-ancestors`).toEqual(["'none'"]);
  expect(d.get("object-src"), `${where}: object-src`).toEqual(["'none'"]);
  expect(d.get("base-uri"), `${where}: base-uri`).toBeTruthy();
  expect(d.get("default-src"), `${where}: default-src`).toEqual(["'self'"]);
  expect(h["x-content-type-options"], `${where}: nosniff`).toBe("nosniff");
  expect(["no-referrer", "same-origin", "strict-origin", "strict-origin-when-cross-origin"], `${where}: referrer-policy`).toContain(h["referrer-policy"]);
  expect(h["x-frame-options"], `${where}: x-frame-options`).toBe("DENY");
  const hsts = h["strict-transport-security"] ?? "";
  expect(hsts, `${where}: HSTS`).toMatch(/max-age=(\d+)/);
  expect(Number(/max-age=(\d+)/.exec(hsts)?.[1] ?? 0), `${where}: HSTS max-age ≥ 1 year`).toBeGreaterThanOrEqual(31_536_000);
  expect(h["x-powered-by"], `${where}: x-powered-by`).toBeUndefined();
  expect(h["cross-origin-opener-policy"], `${where}: COOP`).toBe("same-origin");
  expect(h["cross-origin-resource-policy"], `${where}: CORP`).toBe("same-origin");
}

async function signIn(request: APIRequestContext, email: string): Promise<void> {
  const res = await request.post("/api/v1/session", { data: { email, password: DEMO_PASSWORD } });
  expect(res.status()).toBe(200);
}

test.describe("security headers", () => {
  test("on the sign-in page, an API answer, an error answer and a 404 page", async ({ request }) => {
    const page = await request.get("/sign-in");
    expect(page.status()).toBe(200);
    expectSecurityHeaders(page, "GET /sign-in");

    const api = await request.get("/api/v1/session");
    expect(api.status()).toBe(401);
    expectSecurityHeaders(api, "GET /api/v1/session (401)");

    const missing = await request.get("/no-such-page-here", { maxRedirects: 0 });
    expectSecurityHeaders(missing, `GET /no-such-page-here (${missing.status()})`);

    const signedIn = await request.get("/", { maxRedirects: 0 });
    expectSecurityHeaders(signedIn, `GET / signed out (${signedIn.status()})`);
  });

  test("on static assets (scripts and styles of the built app)", async ({ request }) => {
    const html = await (await request.get("/sign-in")).text();
    const assets = [...html.matchAll(/(?:src|href)="(\/_next\/static\/[^"]+\.(?:js|css))"/g)].map((m) => m[1]);
    expect(assets.length).toBeGreaterThan(0);
    for (const asset of assets.slice(0, 3)) {
      const res = await request.get(asset);
      expect(res.status()).toBe(200);
      expectSecurityHeaders(res, asset);
    }
  });

  test("pages get a new script nonce on every answer, and every script Next writes carries it", async ({ request }) => {
    const nonces: string[] = [];
    for (let i = 0; i < 2; i++) {
      const res = await request.get("/sign-in");
      const scriptSrc = directives(onePolicy(res, "GET /sign-in")).get("script-src") ?? [];
      const nonce = /^'nonce-([A-Za-z0-9+/=]{16,})'$/.exec(scriptSrc.find((s) => s.startsWith("'nonce-")) ?? "")?.[1];
      expect(nonce, "script-src has a nonce").toBeTruthy();
      expect(scriptSrc).toContain("'strict-dynamic'");
      nonces.push(nonce!);
      const html = await res.text();
      const scripts = [...html.matchAll(/<script\b([^>]*)>/g)].map((m) => m[1]);
      expect(scripts.length).toBeGreaterThan(0);
      for (const attrs of scripts) expect(attrs, "every <script> carries the answer's nonce").toContain(`nonce="${nonce}"`);
    }
    expect(nonces[0]).not.toBe(nonces[1]);
  });

  test("a page's scripts run under the policy: the sign-in page works and the browser reports no violation", async ({ page }) => {
    const violations: string[] = [];
    page.on("console", (m) => {
      if (m.type() === "error" && /Content Security Policy/i.test(m.text())) violations.push(m.text());
    });
    await page.goto("/sign-in");
    await page.getByLabel("E-mail").fill("not-an-address");
    await page.getByRole("button", { name: "Sign in" }).click();
    // The form's own check (client-side script) names the field: React hydrated under the nonce.
    await expect(page.getByText("Enter a valid e-mail address.")).toBeVisible();
    await expect(page.getByText("Enter your password.")).toBeVisible();
    expect(violations).toEqual([]);
  });

  test("an attachment download keeps its own sandbox policy, where nothing may run", async ({ request }) => {
    await signIn(request, DEMO_ACCOUNTS.fuser);
    const png = new PNG({ width: 4, height: 3 });
    png.data.fill(180);
    const up = await request.post("/api/v1/attachments", {
      multipart: { file: { name: "bead.png", mimeType: "image/png", buffer: PNG.sync.write(png) } },
    });
    expect(up.status()).toBe(201);
    const { attachment } = (await up.json()) as { attachment: { url: string } };
    for (const res of [await request.get(attachment.url), await request.get("/api/v1/attachments/999999999")]) {
      const where = `GET ${res.url()} (${res.status()})`;
      const d = directives(onePolicy(res, where));
      expect(d.has("sandbox"), `${where}: sandbox`).toBe(true);
      expect(d.get("default-src"), `${where}: default-src`).toEqual(["'none'"]);
      expect(d.has("script-src"), `${where}: no script source`).toBe(false);
      expect(d.get("frame-ancestors"), `${where}: frame-ancestors`).toEqual(["'none'"]);
      expect(res.headers()["x-content-type-options"]).toBe("nosniff");
    }
  });

  test("a page inside a frame of another site is refused by the browser", async ({ page }) => {
    // The browser enforces frame-ancestors 'none': the framed document never loads.
    let framedLoaded = false;
    page.on("framenavigated", (frame) => {
      if (frame !== page.mainFrame() && frame.url().includes("/sign-in")) framedLoaded = true;
    });
    await page.setContent(`<iframe id="f" src="${test.info().project.use.baseURL}/sign-in"></iframe>`);
    await page.waitForTimeout(1500);
    const frame = page.frames().find((f) => f !== page.mainFrame());
    const hasForm = frame ? await frame.locator("form").count().catch(() => 0) : 0;
    expect(hasForm).toBe(0);
    expect(framedLoaded && hasForm > 0).toBe(false);
  });
});

/** The id of a server action in the built app, by exported name (server-reference-manifest.json). */
function actionId(name: string): string | null {
  const dist = process.env.BEADLINE_DIST_DIR || ".next";
  const file = path.join(process.cwd(), dist, "server", "server-reference-manifest.json");
  if (!existsSync(file)) return null;
  const manifest = JSON.parse(readFileSync(file, "utf8")) as { node?: Record<string, { exportedName?: string; filename?: string }> };
  for (const [id, info] of Object.entries(manifest.node ?? {})) {
    if (info.exportedName === name) return id;
  }
  return null;
}

test.describe("server actions keep Next's Origin check", () => {
  test("a cross-site call of the unit-preference action is refused and changes nothing; a same-site call works", async ({ request, baseURL }) => {
    const id = actionId("setUnitSystemAction");
    expect(id, "setUnitSystemAction in the build's server-reference-manifest.json").toBeTruthy();
    await signIn(request, DEMO_ACCOUNTS.clerk);
    const who = async () => ((await (await request.get("/api/v1/session")).json()) as { user: { unitSystem: string } }).user.unitSystem;
    const start = await who();
    const target = start === "si" ? "us" : "si";
    const call = (origin: string) =>
      request.post("/", {
        headers: { "next-action": id!, origin, "content-type": "text/plain;charset=UTF-8", accept: "text/x-component" },
        data: JSON.stringify([{ unitSystem: target }]),
        maxRedirects: 0,
      });

    const evil = await call("https://evil.example");
    expect(evil.status(), "cross-site server action").toBeGreaterThanOrEqual(400);
    expect(await who()).toBe(start);

    const same = await call(new URL(baseURL!).origin);
    expect(same.status()).toBe(200);
    expect(await who()).toBe(target);
    // Put the demo person back as they were.
    const back = await request.post("/", { headers: { "next-action": id!, origin: new URL(baseURL!).origin, "content-type": "text/plain;charset=UTF-8" }, data: JSON.stringify([{ unitSystem: start }]) });
    expect(back.status()).toBe(200);
    expect(await who()).toBe(start);
  });

  test("a cross-site POST to a route handler that changes data gets 403", async ({ request }) => {
    await signIn(request, DEMO_ACCOUNTS.fuser);
    const res = await request.delete("/api/v1/session", { headers: { origin: "https://evil.example" } });
    expect(res.status()).toBe(403);
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe("forbidden");
    expect((await request.get("/api/v1/session")).status()).toBe(200); // still signed in
  });
});
