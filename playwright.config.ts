// Browser tests: Debian's Chromium driven by Playwright against `next start` on a free
// port, with the demo scenario loaded into the throw-away database (tests/support/seed-demo-cli.ts).
// A 2 s burst window for "immediate" alert mail, so specs see mail within seconds.
import { defineConfig, devices } from "@playwright/test";

// tests/run.ts picks a free port and passes it down (worker processes re-read this file, so no pid-based values).
const port = Number(process.env.E2E_PORT || 3100);
const chromiumArgs = ["--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync", "--disable-dev-shm-usage"];

export default defineConfig({
  testDir: "tests/e2e",
  testMatch: "**/*.spec.ts",
  outputDir: "test-results",
  fullyParallel: false,
  workers: 1,
  retries: 0,
  timeout: 60_000,
  expect: { timeout: 10_000 },
  reporter: [["list"]],
  use: {
    baseURL: `http://127.0.0.1:${port}`,
    trace: "off",
    screenshot: "only-on-failure",
    launchOptions: { executablePath: "/usr/bin/chromium", args: chromiumArgs },
  },
  projects: [{ name: "chromium", use: { ...devices["Desktop Chrome"], launchOptions: { executablePath: "/usr/bin/chromium", args: chromiumArgs } } }],
  webServer: {
    command: `node node_modules/next/dist/bin/next start -H 127.0.0.1 -p ${port}`,
    url: `http://127.0.0.1:${port}/sign-in`,
    reuseExistingServer: false,
    timeout: 60_000,
    env: { ...(process.env as Record<string, string>), NODE_ENV: "production", NEXT_TELEMETRY_DISABLED: "1", BEADLINE_PUBLIC_URL: `http://127.0.0.1:${port}`, MAIL_BURST_WINDOW_S: "2" },
    stdout: "ignore",
    stderr: "pipe",
  },
});
