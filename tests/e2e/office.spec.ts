// Office set-up in the browser: an admin adds a procedure and publishes a tightened version,
// adds a machine and a heater plate and records a heater check, adds a fuser and records a
// requalification; the fuser's Today page shows the new status. Uses its own records so the
// demo people, procedures and equipment other browser tests rely on stay as seeded.
import { expect, test } from "@playwright/test";
import { CrewPage, EquipmentPage, ProceduresPage, TodayPage } from "./pages/office-pages";
import { SignInPage } from "./pages/sign-in-page";

const SHOT = (name: string) => ({ path: `tests/e2e/artifacts/office-${name}.png`, fullPage: true });
const iso = (d: Date) => d.toISOString().slice(0, 10);

test("an admin keeps procedures, equipment and qualifications; the fuser's Today shows the new status", async ({ page }) => {
  test.setTimeout(240_000); // four sign-ins and a dozen saves on a shared 2-core machine
  const signIn = new SignInPage(page);
  await signIn.signInAs("admin"); // the demo admin works in SI units

  // Procedures: add one based on ASTM F2620, then tighten its heater window.
  const procedures = new ProceduresPage(page);
  await procedures.addProcedure({ code: "E2E-BF-01", name: "Browser-test butt fusion based on F2620", basedOn: "ASTM F2620 butt fusion" });
  await procedures.open("E2E-BF-01");
  // source: ASTM F2620 heater surface 400–450 °F = 204–232 °C (PPI "Melt Procedure" page, CONFIRMED); shown with its status.
  const v1 = procedures.windows(1).getByRole("row", { name: /Heater surface temperature/ });
  await expect(v1).toContainText("204–232 °C");
  await expect(v1).toContainText("confirmed");
  // F2620 interfacial pressure 60–90 psi is from memory, unconfirmed.
  await expect(procedures.windows(1).getByRole("row", { name: /Fusion interfacial pressure/ })).toContainText("from memory, unconfirmed");

  // A loosening is refused with the field named.
  await procedures.publishTightened("E2E-BF-01", { "Heater temperature minimum": "200" }, "Trying to loosen");
  await expect(page.getByText(/below the 204 °C of ASTM F2620/).first()).toBeVisible();
  await page.reload();
  // The handling wait and misalignment rules are listed with their sources (PPI generic
  // procedure: 30 minutes; pipe makers' guides: 10 % of the wall).
  await expect(procedures.windows(1).getByRole("row", { name: /Handling after cooling/ })).toContainText("30 minutes");
  await expect(procedures.windows(1).getByRole("row", { name: /Outside misalignment/ })).toContainText("10 % of the wall");
  // An operator's cold-weather rule: a tent below 0 °C (our own rule, marked as the operator's).
  await procedures.publishTightened("E2E-BF-01", { "Heater temperature minimum": "210", "Heater temperature maximum": "225", "Shelter needed below": "0" }, "Tightened after the trial joints", { "Shelter needed in the cold": "At least: Tent" });
  await expect(page.getByText("Version 2 of E2E-BF-01 published")).toBeVisible();
  await page.reload();
  await expect(page.getByRole("heading", { name: "Version 2 (current)" })).toBeVisible();
  await expect(page.getByRole("heading", { name: "Version 1 (superseded)" })).toBeVisible();
  await expect(procedures.windows(2).getByRole("row", { name: /Heater surface temperature/ })).toContainText("210–225 °C");
  const cold = procedures.windows(2).getByRole("row", { name: /Shelter in the cold/ });
  await expect(cold).toContainText("at least a tent below 0 °C");
  await expect(cold).toContainText("operator's value");
  await expect(procedures.windows(1).getByRole("row", { name: /Heater surface temperature/ })).toContainText("204–232 °C");
  await page.screenshot(SHOT("procedure-versions"));

  // Equipment: a machine with its piston area, a heater plate and a passing check against the new window.
  const equipment = new EquipmentPage(page);
  await equipment.goto();
  await equipment.addMachine({ assetTag: "FM-E2E", description: "Browser-test machine", pistonArea: "1500" });
  await page.reload();
  await expect(equipment.row("FM-E2E")).toContainText("1500.0 mm²");
  await expect(equipment.row("FM-E2E")).toContainText("Yes");
  await equipment.addHeater({ assetTag: "HP-E2E", description: "Browser-test heater plate" });
  await page.reload();
  await expect(equipment.row("HP-E2E")).toContainText("Never checked");
  const failed = await equipment.recordCheck("HP-E2E", { procedure: "E2E-BF-01 version 2", instrument: "Contact pyrometer PY-E2E", faceA: ["215", "218", "230"], faceB: ["216", "217", "219"] });
  // 230 °C is outside the tightened 210–225 °C window: the plate is flagged.
  await expect(failed).toContainText("flagged until a check passes");
  await page.reload();
  await expect(page.getByRole("status").filter({ hasText: "stays flagged" })).toBeVisible();
  await page.screenshot(SHOT("heater-flagged"));
  const form = page.getByRole("form", { name: "Record a surface-temperature check of HP-E2E" });
  await form.getByLabel("Instrument").fill("Contact pyrometer PY-E2E");
  for (const [i, v] of ["215", "218", "220"].entries()) await form.getByLabel(`Face A point ${i + 1}`).fill(v);
  for (const [i, v] of ["216", "217", "219"].entries()) await form.getByLabel(`Face B point ${i + 1}`).fill(v);
  await form.getByRole("button", { name: "Record heater check" }).click();
  await expect(form.getByRole("status")).toContainText("Check passed");
  await page.reload();
  await expect(page.getByRole("table").getByRole("row")).toHaveCount(3); // header + two checks
  await page.screenshot(SHOT("heater-checks"));

  // Crew: a new fuser with an old (lapsed) qualification, then a requalification today.
  const crew = new CrewPage(page);
  const password = "browser test passphrase 2026";
  await crew.addPerson({ name: "Pat Wexcombe", email: "pat.wexcombe@larkmoor-gas.example", password, roles: ["Fuser"] });
  await crew.openPerson("Pat Wexcombe");
  const longAgo = iso(new Date(Date.now() - 800 * 86_400_000));
  // source: 49 CFR 192.285(c) — intervals not exceeding 15 months: 800 days ago has lapsed.
  await expect(await crew.recordQualification("Pat Wexcombe", { procedure: "E2E-BF-01 — Browser-test butt fusion based on F2620", date: longAgo, method: "Ultrasonic inspection", result: "No flaws found", evaluator: "Dana Pellworth" })).toContainText("ran out");
  await signIn.signOut();

  await signIn.signIn("pat.wexcombe@larkmoor-gas.example", password);
  const today = new TodayPage(page);
  await today.goto();
  await expect(today.panel("Your qualification")).toContainText("Lapsed after");
  await signIn.signOut();

  await signIn.signInAs("admin");
  await crew.openPerson("Pat Wexcombe");
  const requalified = await crew.recordQualification("Pat Wexcombe", {
    procedure: "E2E-BF-01 — Browser-test butt fusion based on F2620",
    date: iso(new Date()),
    method: "Visual examination and bend test",
    result: "3 straps bent, no voids, failure outside the joint",
    evaluator: "Dana Pellworth",
  });
  await expect(requalified).toContainText("Qualified until");
  await page.reload();
  await expect(page.getByRole("region", { name: "Qualification status" })).toContainText("Qualified until");
  await page.screenshot(SHOT("crew-person"));
  await signIn.signOut();

  await signIn.signIn("pat.wexcombe@larkmoor-gas.example", password);
  await today.goto();
  await expect(today.panel("Your qualification")).toContainText("E2E-BF-01");
  await expect(today.panel("Your qualification")).toContainText("Qualified until");
  await expect(today.panel("Your qualification")).not.toContainText("Lapsed");
  await expect(today.panel("Your open drafts")).toContainText("No drafts on this device");
  await page.screenshot(SHOT("today-fuser"));
});

test("each role's Today shows what needs them now", async ({ page }) => {
  test.setTimeout(120_000);
  const signIn = new SignInPage(page);
  const today = new TodayPage(page);

  await signIn.signInAs("admin");
  await today.goto();
  // The demo scenario: Kit lapses within 30 days, Sam has lapsed, FM-330 has no piston area, HP-12 is overdue.
  await expect(today.panel("Qualifications lapsing or lapsed")).toContainText("Kit Marlowe-Fenn");
  await expect(today.panel("Qualifications lapsing or lapsed")).toContainText("Sam Quarrie");
  await expect(today.panel("Machines without a piston area")).toContainText("FM-330");
  await expect(today.panel("Heater checks due")).toContainText("HP-12");
  await page.screenshot(SHOT("today-admin"));
  await signIn.signOut();

  await signIn.signInAs("clerk");
  await today.goto();
  await expect(today.panel("Coils waiting for a label")).toContainText("LV-C0011");
  await expect(today.panel("Your exports in progress")).toBeVisible();
  await page.screenshot(SHOT("today-clerk"));
  await signIn.signOut();

  await signIn.signInAs("inspector");
  await today.goto();
  await expect(today.panel("Review queue")).toContainText("waiting for review");
  await page.screenshot(SHOT("today-inspector"));
  await signIn.signOut();

  await signIn.signInAs("fuser");
  await today.goto();
  await expect(today.panel("Your jobs")).toContainText("WO-24117");
  await expect(today.panel("Your qualification")).toContainText("LVG-BF-01");
  await page.screenshot(SHOT("today-robin"));
});
