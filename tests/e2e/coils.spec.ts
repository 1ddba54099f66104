// A records clerk receives a coil by typing its ASTM F2897 code, prints its label page
// (the QR on the sheet decodes to the coil's page), and finds the coil again through Trace.
import "../support/server-only-outside-next";
import { expect, test } from "@playwright/test";
import type { Knex } from "knex";
import { ownerKnex } from "@/database/migrate";
import jsQR from "jsqr";
import { PNG } from "pngjs";
import { CoilPage, LabelSheetPage, ReceiveCoilPage, TracePage } from "./pages/coils-page";
import { SignInPage } from "./pages/sign-in-page";

// Worked by hand from ASTM F2897-23a §§3–5: "QF"; lot 4430777 → base 62 "iAE9";
// 20 Oct 2026 = day 293 → DDDYY 29326 → "7D0"; H = PE4710 (Table 4); 12 = coiled pipe (Table 5);
// 2" IPS SDR 11 factor 38 (Table 6) → D = 38·378 + 38 + 1 = 14403 → "3Kj"; index "0".
const CODE = "QFiAE97D0H123Kj0";

let k: Knex;
test.beforeAll(() => {
  k = ownerKnex(process.env.MIGRATION_DATABASE_URL);
});
test.afterAll(async () => {
  await k.destroy();
});

/** How each recorded print of a coil's label was made, oldest first (the audit log). */
async function printsOf(coilCode: string): Promise<string[]> {
  const coil = await k("coils").where({ coil_code: coilCode }).first("id");
  const rows = await k("audit_log").where({ action: "coil-label-printed", entity_type: "coil", entity_id: String(coil.id) }).orderBy("id");
  return rows.map((r: { details: string }) => (JSON.parse(r.details) as { how: string }).how);
}

test("a clerk receives a coil from its traceability code, prints its label and traces it", async ({ page, baseURL }) => {
  await new SignInPage(page).signInAs("clerk");
  const receive = new ReceiveCoilPage(page);
  await receive.open();
  const coilCode = await receive.field("Coil id (printed on our label)").inputValue();
  expect(coilCode).toMatch(/^LV-C\d{4}$/);

  // A lot typed from the print line that disagrees with the code is flagged …
  await receive.field("Lot").fill("4430778");
  await receive.typeTraceCode(CODE);
  await expect(receive.disagreement()).toContainText("The code carries lot 4430777, the form says 4430778");
  // … the fields the code encodes are filled (source: ASTM F2897-23a Tables 1, 4, 6).
  await expect(receive.field("Manufacturer id in the code")).toHaveValue("QF");
  await expect(receive.field("Production date")).toHaveValue("2026-10-20");
  await expect(receive.field("Material designation")).toHaveValue("PE4710");
  await expect(receive.field("Pipe maker")).toHaveValue("Quillfield Polymers");
  await expect(receive.field("Nominal size")).toHaveValue("2");
  await expect(receive.field("SDR (DR)")).toHaveValue("11");
  await receive.field("Lot").fill("4430777");
  await expect(receive.disagreement()).toHaveCount(0);

  await receive.field("Coil length").fill("152.4");
  await receive.field("Ovality measured at the end").fill("1.5");
  await expect(page.getByText("Inspection passes: the coil goes to the yard.")).toBeVisible();
  await page.screenshot({ path: "tests/e2e/artifacts/coils-receive.png", fullPage: true });
  await receive.receive();

  const coil = new CoilPage(page);
  await expect(coil.heading(coilCode)).toBeVisible();
  await expect(page.getByRole("status").filter({ hasText: `Coil ${coilCode} received into the yard` })).toBeVisible();
  await expect(page.getByText("In yard", { exact: true })).toBeVisible();
  // source: PPI Handbook of PE Pipe bend ratio 25 for DR 11 × OD 60.325 mm = 1.508 m
  await expect(page.getByText(/Do not bend this pipe tighter than a 1\.51 m radius/)).toBeVisible();
  await page.getByLabel("Length of the next run").fill("200");
  await expect(page.getByText(`The next run of 200.0 m is longer than the 152.4 m left on ${coilCode}`)).toBeVisible();
  await page.screenshot({ path: "tests/e2e/artifacts/coils-coil-page.png", fullPage: true });

  await coil.printLabel();
  const sheet = new LabelSheetPage(page);
  const label = sheet.label(`coil-${coilCode}`);
  await expect(label).toBeVisible();
  // The label prints the F2897 code as text too (readable when the QR or barcode will not scan).
  await expect(label.getByRole("img")).toHaveAttribute("aria-label", new RegExp(`F2897 ${CODE}`));
  // Scan the label as a phone would: screenshot it and decode the QR (source: jsQR, a general-purpose decoder).
  const shot = PNG.sync.read(await label.screenshot({ scale: "device" }));
  const decoded = jsQR(new Uint8ClampedArray(shot.data.buffer, shot.data.byteOffset, shot.data.byteLength), shot.width, shot.height)?.data;
  expect(decoded).toBe(`${baseURL}/coils/${coilCode}`);
  await page.evaluate(() => {
    window.print = () => undefined;
  });
  await sheet.print();
  await expect(page.getByRole("status").filter({ hasText: "1 coil label marked as printed." })).toBeVisible();
  // The print is recorded once, by the Print button's POST (the sheet's page load recorded nothing).
  expect(await printsOf(coilCode)).toEqual(["print"]);
  await page.emulateMedia({ media: "print" });
  await expect(page.getByRole("navigation", { name: "Screens" })).toBeHidden();
  await page.screenshot({ path: "tests/e2e/artifacts/coils-label-sheet-print.png", fullPage: true });
  await page.emulateMedia({ media: "screen" });

  // The decoded address opens the coil's page.
  await page.goto(decoded!);
  await expect(coil.heading(coilCode)).toBeVisible();
  await expect(page.getByText(/Label last printed \d{4}-\d{2}-\d{2}\./)).toBeVisible();
  // Fetching the label file (a GET, as a link on another site could) records nothing …
  expect((await page.request.get(`/api/v1/labels/coils/${await k("coils").where({ coil_code: coilCode }).first("id").then((c: { id: number }) => c.id)}?format=svg`)).status()).toBe(200);
  expect(await printsOf(coilCode)).toEqual(["print"]);
  // … the download button records the download once, then fetches the file.
  expect(await coil.downloadLabel("PNG")).toBe(`coil-${coilCode}.png`);
  await expect.poll(() => printsOf(coilCode)).toEqual(["print", "png"]);

  const trace = new TracePage(page);
  await trace.open();
  await trace.traceByCode(coilCode);
  await expect(trace.result()).toHaveText("Quillfield Polymers lot 4430777: 1 coil, 0 joints");
  await expect(page.getByRole("table", { name: "Coils of the lot" }).getByRole("link", { name: coilCode })).toBeVisible();
  await trace.traceByLot("Quillfield Polymers", "4430777");
  await expect(trace.result()).toHaveText("Quillfield Polymers lot 4430777: 1 coil, 0 joints");
  await trace.traceByCode(CODE);
  await expect(trace.result()).toHaveText("Quillfield Polymers lot 4430777: 1 coil, 0 joints");
  await page.screenshot({ path: "tests/e2e/artifacts/coils-trace.png", fullPage: true });
});

// Worked by hand from the field layout of ASTM F2897-23a Table 1 (positions 3–6 the lot) and
// the base 62 of Table 2 (0–9, a–z = 10–35, A–Z = 36–61); lots of their own, so the other tests'
// lot counts stay as they are: lot 4432000 = 18·62³ + 36·62² + 59·62 + 54 → "iAXS";
// lot 4432468 = 18·62³ + 37·62² + 5·62 + 26 → "iB5q"; Table 4: Z = PE100, H = PE4710; the rest
// as CODE above (20 Oct 2026, coiled pipe, 2" IPS SDR 11).
const FIRST_CODE = "QFiAXS7D0Z123Kj0"; // lot 4432000, PE100
const CORRECTED_CODE = "QFiB5q7D0H123Kj0"; // lot 4432468, PE4710

/** Internal values and field names that must never reach a screen (their words do). */
const RAW = ["in-yard", "on-trailer", "in-use", "used-up", "within-limits", "out-of-limits", "pending-review", "coil-to-coil", "manufacturerCode", "productionDate", "nominalSize", "disagreementReason", "code-lot", "typed-lot"];
async function expectNoRawValues(page: import("@playwright/test").Page): Promise<void> {
  const text = await page.locator("main").innerText();
  for (const raw of RAW) expect(text, `"${raw}" shown on ${page.url()}`).not.toContain(raw);
}

test("a clerk corrects a code and the lot follows; a recall by the code's lot finds the coil", async ({ page }) => {
  await new SignInPage(page).signInAs("clerk");
  const receive = new ReceiveCoilPage(page);
  await receive.open();
  const coilCode = await receive.field("Coil id (printed on our label)").inputValue();
  await receive.typeTraceCode(FIRST_CODE);
  await expect(receive.field("Lot")).toHaveValue("4432000");
  await expect(receive.field("Material designation")).toHaveValue("PE100");
  // The code is corrected: the fields it filled follow it, and the note names them as the form does.
  await receive.replaceTraceCode(CORRECTED_CODE);
  await expect(receive.field("Lot")).toHaveValue("4432468");
  await expect(receive.field("Material designation")).toHaveValue("PE4710");
  await expect(receive.filledNote()).toHaveText("Filled from the code: Lot and Material designation.");
  await expect(receive.disagreement()).toHaveCount(0);
  await expectNoRawValues(page);
  await receive.field("Coil length").fill("152.4");
  await receive.receive();
  await expect(new CoilPage(page).heading(coilCode)).toBeVisible();

  // A second coil whose lot was typed by hand from another print line: it disagrees with its
  // code, so it saves only with a reason.
  await receive.open();
  const second = await receive.field("Coil id (printed on our label)").inputValue();
  await receive.field("Lot").fill("4432000");
  await receive.typeTraceCode(CORRECTED_CODE);
  await expect(receive.disagreement()).toContainText("The code carries lot 4432468, the form says 4432000");
  await receive.field("Coil length").fill("150");
  await receive.receive();
  await expect(page.getByText("The code disagrees with Lot: correct the fields or the code, or say why the coil is saved as it is.").first()).toBeVisible();
  await receive.field("Why the coil is saved although it disagrees with its code").fill("Print line on the pipe reads lot 4432000; the maker is checking");
  await receive.receive();
  await expect(new CoilPage(page).heading(second)).toBeVisible();
  await expect(page.getByText("The code carries lot 4432468, the form says 4432000")).toBeVisible();
  await expect(page.getByText("Saved as it is because: “Print line on the pipe reads lot 4432000; the maker is checking”")).toBeVisible();

  // The recall names the lot in the code: both coils are found, and the screen says how.
  const trace = new TracePage(page);
  await trace.open();
  await trace.traceByLot("Quillfield Polymers", "4432468");
  await expect(trace.result()).toHaveText("Quillfield Polymers lot 4432468: 2 coils, 0 joints");
  await expect(trace.foundBy(coilCode)).toHaveText("Typed lot and the lot in its code");
  await expect(trace.foundBy(second)).toHaveText("Lot in its traceability code");
  await expect(page.getByRole("note")).toContainText(`${second} (typed lot 4432000) carries this lot only in its traceability code`);
  await expectNoRawValues(page);
  await page.screenshot({ path: "tests/e2e/artifacts/coils-trace-code-lot.png", fullPage: true });
});

test("a seeded lot traces to its coils; a bad search names the field", async ({ page }) => {
  await new SignInPage(page).signInAs("clerk");
  const trace = new TracePage(page);
  await trace.open();
  await page.getByRole("button", { name: "Trace lot" }).click();
  await expect(page.getByText("Enter a lot (with its manufacturer), or a traceability code or coil id.")).toBeVisible();
  await trace.traceByLot("Quillfield Polymers", "4410021");
  await expect(trace.result()).toContainText("Quillfield Polymers lot 4410021: 4 coils");
  for (const code of ["LV-C0001", "LV-C0002", "LV-C0003", "LV-C0012"]) {
    await expect(page.getByRole("table", { name: "Coils of the lot" }).getByRole("link", { name: code })).toBeVisible();
  }
  const joints = page.getByRole("table", { name: "Joints made with the lot" });
  // The demo scenario records joints on this lot (database/seeds/02-demo-joints.ts).
  await expect(joints).toBeVisible();
  {
    await page.screenshot({ path: "tests/e2e/artifacts/coils-trace-lot.png", fullPage: true });
    // Joint → origins from the first joint of the lot.
    await joints.getByRole("link").first().click();
    await expect(page.getByRole("heading", { level: 1, name: /joint \d+: origins$/ })).toBeVisible();
    for (const section of ["Fusion machine", "Heater plate", "Fuser", "Procedure"]) await expect(page.getByRole("heading", { level: 2, name: section })).toBeVisible();
    await expect(page.getByRole("region", { name: "Component A" }).getByText(/Quillfield Polymers lot \d{7}/)).toBeVisible();
    await page.screenshot({ path: "tests/e2e/artifacts/coils-trace-joint-origins.png", fullPage: true });
  }
});
