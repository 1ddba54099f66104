// A recall, as the records clerk answers it in the browser: trace the lot of the demo's
// cut-out joint (the demo scenario cuts out the first out-of-limits joint on WO-24117 and
// remakes it), see that joint marked out of the ground with a link to its remake, follow
// the link, find joints by the references the app prints and a joint tag's address, and
// read the lot's exports back with exceljs and as CSV: words, never stored codes. The
// expected joints come from the database the demo seed wrote.
import { readFileSync } from "node:fs";
import ExcelJS from "exceljs";
import { expect, test } from "@playwright/test";
import type { Knex } from "knex";
import { ownerKnex } from "@/database/migrate";
import { RegisterPage } from "./pages/register-page";
import { SignInPage } from "./pages/sign-in-page";
import { LotTracePage } from "./pages/trace-page";

let k: Knex;
type Case = { cutId: number; cutNo: number; remakeId: number; remakeNo: number; jobCode: string; manufacturer: string; lot: string; inspector: string; note: string };
let c: Case;

test.beforeAll(async () => {
  k = ownerKnex(process.env.MIGRATION_DATABASE_URL);
  const row = await k("joint_states as s")
    .join("joints as j", "j.id", "s.joint_id")
    .join("jobs as jb", "jb.id", "j.job_id")
    .join("joints as r", "r.id", "s.replaced_by_joint_id")
    .join("coils as ca", "ca.id", "j.coil_a_id")
    .join("joint_revisions as d", function () {
      this.on("d.joint_id", "=", "j.id").andOn("d.kind", "=", k.raw("'cut-out'"));
    })
    .join("users as u", "u.id", "d.by_user_id")
    .where("s.review_state", "cut-out")
    .first("j.id as cut_id", "j.joint_no as cut_no", "r.id as remake_id", "r.joint_no as remake_no", "jb.code as job_code", "ca.manufacturer", "ca.lot", "u.name as inspector", "d.reason as note");
  expect(row, "the demo scenario has a cut-out joint with its remake").toBeTruthy();
  c = { cutId: Number(row.cut_id), cutNo: Number(row.cut_no), remakeId: Number(row.remake_id), remakeNo: Number(row.remake_no), jobCode: row.job_code, manufacturer: row.manufacturer, lot: row.lot, inspector: row.inspector, note: row.note };
});

test.afterAll(async () => {
  await k?.destroy();
});

test("the clerk traces a lot: the cut-out joint shows as replaced, on screen and in both exports", async ({ page }) => {
  const cutRef = `${c.jobCode} joint ${c.cutNo}`;
  const remakeRef = `${c.jobCode} joint ${c.remakeNo}`;
  await new SignInPage(page).signInAs("clerk");
  const trace = new LotTracePage(page);
  await trace.open();
  await trace.traceLot(c.manufacturer, c.lot);
  await expect(trace.result()).toContainText("1 cut out");

  // The cut-out joint: its review state in words, out of the ground, replaced by its remake.
  const cutRow = trace.jointRows("Out of the ground");
  await expect(cutRow).toHaveCount(1);
  await expect(cutRow.getByRole("link", { name: cutRef, exact: true })).toBeVisible();
  await expect(cutRow).toContainText("Cut out");
  await expect(cutRow).toContainText(`Out of the ground; replaced by ${remakeRef}`);
  await expect(trace.jointsTable()).not.toContainText("cut-out");
  await page.screenshot({ path: "tests/e2e/artifacts/recall-lot.png", fullPage: true });

  // Both exports say the same in words.
  const xlsx = await trace.download("Export to spreadsheet (.xlsx)");
  const book = new ExcelJS.Workbook();
  await book.xlsx.load(readFileSync((await xlsx.path())!) as unknown as ArrayBuffer);
  const sheet = book.getWorksheet("Joints")!;
  const header = (sheet.getRow(1).values as unknown[]).slice(1) as string[];
  const records: Record<string, unknown>[] = [];
  sheet.eachRow((r, n) => {
    if (n > 1) records.push(Object.fromEntries(header.map((h, i) => [h, (r.values as unknown[])[i + 1] ?? null])));
  });
  expect(records.find((r) => r["Joint id"] === c.cutId)).toMatchObject({ "Review state": "Cut out", "In the ground": "No: cut out and replaced", "Replaced by": remakeRef });
  expect(records.find((r) => r["Joint id"] === c.remakeId)).toMatchObject({ "In the ground": "Yes", Remakes: cutRef });
  const statuses = (book.getWorksheet("Coils")!.getColumn(10).values as unknown[]).slice(2).filter(Boolean) as string[];
  expect(statuses.every((s) => !s.includes("-"))).toBe(true); // "In use", never "in-use"

  const csv = await trace.download("Export joints as CSV");
  const text = readFileSync((await csv.path())!, "utf8").replace(/^\uFEFF/, "");
  expect(text.split("\r\n")[0]).toContain("Review state,In the ground,Replaced by,Remakes");
  expect(text).toContain(`Cut out,No: cut out and replaced,${remakeRef}`);
  expect(text).not.toMatch(/cut-out|pending-review|in-use|used-up/);

  // The replaced-by link opens the remake's origins, which names the joint it remakes.
  await cutRow.getByRole("link", { name: remakeRef, exact: true }).click();
  await expect(page.getByRole("heading", { level: 1, name: `${remakeRef}: origins` })).toBeVisible();
  await expect(trace.fact("Remakes")).toContainText(cutRef);
});

test("the clerk finds a joint by the references the app prints and by its tag's address", async ({ page, baseURL }) => {
  const cutRef = `${c.jobCode} joint ${c.cutNo}`;
  await new SignInPage(page).signInAs("clerk");
  const trace = new LotTracePage(page);
  await trace.open();

  // A bad reference is answered in words on the field, and nothing is looked up.
  await trace.traceJoint("joint 10");
  await expect(page.getByRole("alert").filter({ hasText: "Say which job the joint is on, e.g. WO-24152 joint 10." })).toBeVisible();
  await expect(trace.jointField()).toHaveValue("joint 10");

  for (const text of [cutRef, `${c.jobCode}/${c.cutNo}`, `${c.jobCode} #${c.cutNo}`, `${baseURL}/joints/${c.cutId}`]) {
    await trace.open();
    await trace.traceJoint(text);
    await expect(page.getByRole("heading", { level: 1, name: `${cutRef}: origins` })).toBeVisible();
  }
  await expect(trace.fact("Review")).toContainText(`Cut out by ${c.inspector}`);
  await expect(trace.fact("Review")).toContainText(c.note);
  await expect(trace.fact("In the ground")).toContainText(`No — cut out; replaced by ${c.jobCode} joint ${c.remakeNo}`);
  await page.screenshot({ path: "tests/e2e/artifacts/recall-origins.png", fullPage: true });

  // The register's search takes the same references.
  const register = new RegisterPage(page);
  for (const text of [cutRef, `${baseURL}/joints/${c.cutId}`]) {
    await register.open();
    await expect(register.count()).toContainText(/\d+ joints ·/); // the screen is ready (its form no longer resets)
    await register.field("Search joint, coil id or lot").fill(text);
    await register.applyFilter();
    await expect(register.count()).toContainText("1 joint ·");
    await expect(register.grid().getByRole("link", { name: `Open joint ${c.cutNo} of ${c.jobCode}` })).toBeVisible();
  }
});
