// The demo clerk exports a large view of the Register as a spreadsheet, watches rows
// written of the total, and stops it: nothing is downloaded and the export is recorded as
// stopped ("failed", with "cancelled" in its audit entry) with fewer rows than the total.
// The spec adds its own 50,000 joints in a job of their own (a 500-joint register fixture
// copied 100 times, fixtures/bulk-register-joints.ts), exports only that job, and removes
// everything again, so the other specs' counts are untouched. The browser's download is
// throttled (Chromium DevTools network emulation) so the server's writer, which waits for
// its reader, is still writing when the clerk reads the progress and presses Stop.
import { expect, test } from "@playwright/test";
import type { Knex } from "knex";
import { ownerKnex } from "@/database/migrate";
import { buildRegisterJoints, removeRegisterJoints, type RegisterFixture } from "@/fixtures/register-joints";
import { removeBulkJoints, repeatRegisterJoints, type BulkJoints } from "@/fixtures/bulk-register-joints";
import { RegisterPage } from "./pages/register-page";
import { DEMO_ACCOUNTS, SignInPage } from "./pages/sign-in-page";

let k: Knex;
let fixture: RegisterFixture | undefined;
let bulk: BulkJoints | undefined;
const TOTAL = 50_000;

test.beforeAll(async () => {
  test.setTimeout(180_000);
  k = ownerKnex(process.env.MIGRATION_DATABASE_URL);
  fixture = await buildRegisterJoints(k, { count: 500, seed: 71, now: new Date(Date.now() - 2 * 86_400_000), prefix: "XP" });
  bulk = await repeatRegisterJoints(k, fixture, { times: TOTAL / 500, jobCode: `XP-BULK-${process.pid}` });
});

test.afterAll(async () => {
  if (bulk) await removeBulkJoints(k, bulk);
  if (fixture) await removeRegisterJoints(k, fixture);
  await k?.destroy();
});

test("the clerk follows a large spreadsheet export row by row and stops it", async ({ page }) => {
  test.setTimeout(120_000);
  expect(bulk?.joints).toBe(TOTAL);
  const clerk = await k("users").where({ email: DEMO_ACCOUNTS.clerk }).first("id");
  const [{ last }] = (await k("exports").max({ last: "id" })) as { last: number | null }[];
  let downloads = 0;
  page.on("download", () => (downloads += 1));

  await new SignInPage(page).signInAs("clerk");
  const register = new RegisterPage(page);
  await register.openView(`job=${bulk!.jobId}`);
  await expect(register.count()).toContainText("50,000 joints", { timeout: 30_000 });

  // A slow line to the office (DevTools network emulation): about 150 kB/s down.
  const cdp = await page.context().newCDPSession(page);
  await cdp.send("Network.enable");
  await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: 150 * 1024, uploadThroughput: -1 });

  await register.exportButton("xlsx").click();
  await expect(register.stopExportButton()).toBeVisible();
  // Rows written of the total, from the export's progress address, in words and as a bar.
  await expect(register.exportStatus()).toContainText(/[1-9][\d,]* of 50,000 joints written/, { timeout: 30_000 });
  await expect(register.exportProgress()).toHaveAttribute("max", String(TOTAL));
  const shown = Number((await register.exportProgress().getAttribute("value")) ?? 0);
  expect(shown).toBeGreaterThan(0);
  expect(shown).toBeLessThan(TOTAL);
  await page.screenshot({ path: "tests/e2e/artifacts/register-export-progress.png", fullPage: true });

  await register.stopExportButton().click();
  await expect(register.exportStatus()).toContainText(/Export stopped at [1-9][\d,]* of 50,000 joints written/);
  await expect(register.exportStatus()).toContainText("Nothing was downloaded");
  await expect(register.stopExportButton()).toBeHidden();
  await expect(register.exportButton("xlsx")).toBeEnabled();
  await cdp.send("Network.emulateNetworkConditions", { offline: false, latency: 0, downloadThroughput: -1, uploadThroughput: -1 });

  // The server saw the download go away: the export is recorded as stopped part-way.
  const mine = () => k("exports").where({ user_id: clerk.id }).andWhere("id", ">", last ?? 0).orderBy("id", "desc").first();
  await expect.poll(async () => (await mine())?.status, { timeout: 30_000 }).toBe("failed");
  const record = await mine();
  expect(Number(record.row_count)).toBeLessThan(TOTAL);
  const audit = await k("audit_log").where({ entity_type: "export", entity_id: String(record.id), action: "register-export-failed" }).first("details");
  const details = typeof audit.details === "string" ? JSON.parse(audit.details) : audit.details;
  expect(details).toMatchObject({ error: "cancelled", format: "xlsx" });
  expect(downloads).toBe(0);
});
