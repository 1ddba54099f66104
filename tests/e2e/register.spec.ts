// The demo clerk works the Register in the browser: the grid fills from the server's
// keyset pages, a filter and a sort land in the URL (and survive a reload), the exports
// download and read back with exceljs, and a row opens its joint page. The demo scenario
// records no joints of its own, so the test adds a deterministic register of 260 joints
// (fixtures/register-joints.ts) and removes it again afterwards.
import { readFileSync } from "node:fs";
import ExcelJS from "exceljs";
import { expect, test } from "@playwright/test";
import type { Knex } from "knex";
import { ownerKnex } from "@/database/migrate";
import { buildRegisterJoints, removeRegisterJoints, type RegisterFixture } from "@/fixtures/register-joints";
import { RegisterPage } from "./pages/register-page";
import { CrewPage } from "./pages/office-pages";
import { SignInPage } from "./pages/sign-in-page";

let k: Knex;
let fixture: RegisterFixture;
let total: number;
let outOfLimits: number;

test.beforeAll(async () => {
  k = ownerKnex(process.env.MIGRATION_DATABASE_URL);
  fixture = await buildRegisterJoints(k, { count: 260, seed: 5, now: new Date(Date.now() - 86_400_000), prefix: "EE" });
  const [[all], [out]] = await Promise.all([k("joint_states").count({ n: "*" }), k("joint_states").where({ outcome: "out-of-limits" }).count({ n: "*" })]);
  total = Number(all.n);
  outOfLimits = Number(out.n);
});

test.afterAll(async () => {
  if (fixture) await removeRegisterJoints(k, fixture);
  await k?.("organisation_settings").delete(); // back to the server's zone for the other specs
  await k?.destroy();
});

test("the clerk filters, sorts, exports and opens a joint from the register", async ({ page }) => {
  await new SignInPage(page).signInAs("clerk");
  const register = new RegisterPage(page);
  await register.open();

  // The count comes with the grid's first page (slow on a loaded machine: up to 30 s).
  await expect(register.count()).toContainText(`${total.toLocaleString("en-US")} joints`, { timeout: 30_000 });
  await expect(register.dataRows().first()).toBeVisible();
  expect(await register.dataRows().count()).toBeGreaterThan(5);
  await expect(register.columnHeader(/Heater temperature \(°C\)/)).toBeVisible(); // the clerk reads SI units
  await page.screenshot({ path: "tests/e2e/artifacts/register.png", fullPage: true });

  // A filter goes into the URL and the count follows it.
  await register.field("Outcome").selectOption("out-of-limits");
  await register.applyFilter();
  await expect(page).toHaveURL(/[?&]outcome=out-of-limits/);
  await expect(register.count()).toContainText(`${outOfLimits.toLocaleString("en-US")} joints`);
  await expect(register.grid().getByRole("gridcell", { name: "Out of limits" }).first()).toBeVisible();
  await expect(register.grid().getByRole("gridcell", { name: "Within limits" })).toHaveCount(0);

  // Sorting by a header is done by the server and lands in the URL too.
  await register.columnHeader(/Made at \(UTC\)/).click();
  await expect(page).toHaveURL(/[?&]dir=asc/);

  // The view is bookmarkable: a reload keeps filter and sort.
  await page.reload();
  await expect(register.field("Outcome")).toHaveValue("out-of-limits");
  await expect(register.count()).toContainText("Date made, oldest first");
  await page.screenshot({ path: "tests/e2e/artifacts/register-filtered.png", fullPage: true });

  // The spreadsheet holds exactly the filtered rows.
  const xlsx = await register.export("xlsx");
  expect(xlsx.suggestedFilename()).toMatch(/^beadline-register-\d{4}-\d{2}-\d{2}\.xlsx$/);
  const book = new ExcelJS.Workbook();
  await book.xlsx.load(readFileSync((await xlsx.path())!) as unknown as ArrayBuffer);
  expect(book.getWorksheet("Joints")!.rowCount).toBe(outOfLimits + 1);
  expect(book.getWorksheet("About this export")).toBeTruthy();

  const csv = await register.export("csv");
  const lines = readFileSync((await csv.path())!, "utf8").replace(/^\uFEFF/, "").trim().split("\r\n");
  expect(lines).toHaveLength(outOfLimits + 1);

  // Opening a row goes to the joint's page.
  const firstLink = register.grid().getByRole("link", { name: /^Open joint \d+ of / }).first();
  const href = await firstLink.getAttribute("href");
  expect(href).toMatch(/^\/joints\/\d+$/);
  await firstLink.click();
  await expect(page).toHaveURL(new RegExp(`${href}$`));
});

test("a fuser has no register", async ({ page }) => {
  await new SignInPage(page).signInAs("fuser");
  await expect(page.getByRole("navigation", { name: "Screens" }).getByRole("link", { name: "Register", exact: true })).toHaveCount(0);
  const api = await page.request.get("/api/v1/register");
  expect(api.status()).toBe(403);
  const exported = await page.request.get("/api/v1/exports/register?format=csv");
  expect(exported.status()).toBe(403);
});

test("the admin sets the organisation's time zone and the register shows local times and local days", async ({ page }) => {
  await new SignInPage(page).signInAs("admin");
  const status = await new CrewPage(page).setTimeZone("America/Chicago");
  await expect(status).toContainText("Time zone set to America/Chicago");
  await expect(page.getByText("Times in America/Chicago")).toBeVisible();
  await page.screenshot({ path: "tests/e2e/artifacts/organisation-time-zone.png", fullPage: true });

  const register = new RegisterPage(page);
  await register.open();
  await expect(register.columnHeader(/Made at \(America\/Chicago\)/)).toBeVisible();
  await expect(register.field("Made on or after (local day, America/Chicago)")).toBeVisible();
  // IANA tz database: Chicago is UTC−06:00 (CST) or UTC−05:00 (CDT); every time shows one of them.
  await expect(register.grid().getByRole("gridcell", { name: /^\d{4}-\d{2}-\d{2} \d{2}:\d{2} \u221206:00$|^\d{4}-\d{2}-\d{2} \d{2}:\d{2} \u221205:00$/ }).first()).toBeVisible();
  await page.screenshot({ path: "tests/e2e/artifacts/register-local-time.png", fullPage: true });
});
