// The Trench screen in a phone-sized window (390 × 844 CSS px, a common phone viewport):
// folded it fits in three screens with the plan's key limits pinned at the top; a fuser
// whose qualification has lapsed is told first and Today offers no recording; opening the
// screen alone leaves no draft; the same two coils again are questioned; a coil page opened
// from a label scan puts the coil on a side.
//
// Values typed: tests/e2e/pages/demo-joint.ts, each with its published source.
import { expect, test, type Page } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";
import { TrenchPage } from "./pages/trench-page";
import { demoTypedJoint, fusionGaugePsi } from "./pages/demo-joint";

const SCREEN = { width: 390, height: 844 };
test.use({ viewport: SCREEN, hasTouch: true });

const JOINT = demoTypedJoint({ coilA: "LV-C0001", coilB: "LV-C0002", laidA: "10", station: "7+10" });

const SETUP = { job: "WO-24117 · Fenwick Lane main renewal", machine: "FM-201 · Hydraulic butt-fusion machine, 2–8 in IPS", heater: "HP-31" };

/** A day in the form "30 Nov", by ECMA-402 (Intl.DateTimeFormat, en-GB) — a reference outside the project. */
function dayMonth(daysFromToday: number): string {
  const now = new Date();
  const day = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate()) + daysFromToday * 86_400_000);
  return new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", timeZone: "UTC" }).format(day);
}

async function documentHeight(page: Page): Promise<number> {
  return page.evaluate(() => document.documentElement.scrollHeight);
}

test("folded, the Trench page fits in three phone screens; one safety box; the plan's limits stay at the top", async ({ page }) => {
  await new SignInPage(page).signInAs("fuser");
  const trench = new TrenchPage(page);
  await trench.goto();

  // One safety box, open until read, naming the four hazards and the procedure.
  await expect(page.getByRole("complementary", { name: /Safety|Before|While/ })).toHaveCount(1);
  const safety = trench.safety();
  for (const hazard of ["200–230 °C", "carriage", "Coiled pipe stores energy", "Static on PE gas pipe", "qualified written procedure"]) await expect(safety).toContainText(hazard);
  await trench.shot("flow-1-opened");
  await safety.getByRole("button", { name: /I have read these/ }).click();
  await expect(safety.locator("details")).not.toHaveAttribute("open");

  // The overdue heater plate says so in words. HP-12 was last checked 3 days ago with a
  // 1-day interval (demo scenario), so its check fell due 2 days ago.
  await expect(page.getByLabel("Heater plate").locator("option", { hasText: "HP-12" })).toHaveText(`HP-12 · check overdue since ${dayMonth(-2)}`);
  await expect(page.getByLabel("Heater plate").locator("option", { hasText: "HP-31" })).toHaveText(`HP-31 · check due ${dayMonth(1)}`);

  await trench.chooseSetup(SETUP);
  await trench.coil("A", JOINT.coilA);
  await trench.field("Drag pressure measured").fill(JOINT.drag);
  const plan = page.getByRole("region", { name: "Pressure plan" });
  await expect(plan).toBeVisible();
  // Where the limits come from is said once, in the plan's details line, folded.
  await expect(page.getByText(/from memory, unconfirmed/).filter({ visible: true })).toHaveCount(0);
  await plan.getByText("Where these limits come from").click();
  await expect(plan.getByText(/from memory, unconfirmed/).first()).toBeVisible();

  // The plan at a glance: the fusion gauge window worked out here, to the 1 psi shown.
  const glance = trench.planAtAGlance();
  const shown = /Fusion\s*(\d+)–(\d+) psi/.exec((await glance.textContent()) ?? "");
  expect(shown).not.toBeNull();
  expect(Math.abs(Number(shown![1]) - fusionGaugePsi(60))).toBeLessThanOrEqual(0.5 + 1e-6);
  expect(Math.abs(Number(shown![2]) - fusionGaugePsi(90))).toBeLessThanOrEqual(0.5 + 1e-6);

  const unfolded = await documentHeight(page);
  await trench.foldSteps();
  const folded = await documentHeight(page);
  await trench.shot("flow-2-folded");
  expect(folded).toBeLessThanOrEqual(3 * SCREEN.height);
  expect(folded).toBeLessThan(unfolded);
  // The folded set-up step still says what is chosen.
  await expect(trench.summary("1. Set up")).toContainText("WO-24117 · FM-201 · HP-31 · LV-C0001");

  // Unfolded and scrolled halfway down, the plan's line is still at the top of the screen.
  await trench.summary("4. Record the values").click();
  await trench.summary("2. Pressure plan").click();
  await page.evaluate(() => window.scrollTo(0, document.documentElement.scrollHeight / 2));
  await expect.poll(async () => (await glance.boundingBox())?.y).toBeLessThanOrEqual(1);
  await expect(glance).toContainText("Fusion");
  await trench.shot("flow-3-scrolled", false);

  // Read today and folded steps are remembered on the device.
  await page.reload();
  await expect(trench.recordButton).toBeEnabled();
  await expect(trench.safety()).toContainText("Read today");
  await expect(trench.safety().locator("details")).not.toHaveAttribute("open");
  await expect(trench.section("1. Set up")).not.toHaveAttribute("open");
});

test("opening Trench and leaving leaves no joint in progress; typing something does", async ({ page }) => {
  await new SignInPage(page).signInAs("fuser");
  const trench = new TrenchPage(page);
  await trench.goto();
  await page.goto("/");
  const drafts = page.getByRole("region", { name: "Your open drafts" });
  await expect(drafts).toContainText("No drafts on this device.");
  await expect(page.getByText("A joint in progress")).toHaveCount(0);

  await trench.goto();
  await trench.coil("A", "LV-C0001");
  await page.goto("/");
  await expect(drafts.getByRole("link", { name: "A joint in progress" })).toBeVisible();
});

test("a fuser whose qualification lapsed sees the refusal first, and Today offers no recording", async ({ page }) => {
  // Sam Quarrie was qualified 520 days ago (demo scenario): more than 15 months, so lapsed
  // // source: 49 CFR 192.285(c) (requalify at intervals not exceeding 15 months)
  await new SignInPage(page).signIn("fuser3@larkmoor-gas.example");
  await expect(page.getByRole("heading", { name: "You cannot record joints" })).toBeVisible();
  await expect(page.getByRole("link", { name: /Record/ })).toHaveCount(0);
  await page.screenshot({ path: "tests/e2e/artifacts/trench-flow-4-today-blocked.png", fullPage: true });

  const trench = new TrenchPage(page);
  await page.goto("/trench");
  await expect(page.getByRole("heading", { name: "Trench: record a joint" })).toBeVisible();
  const refusal = page.getByRole("alert").filter({ hasText: "You cannot record this joint" });
  await expect(refusal).toContainText("LVG-BF-01");
  // The refusal opens on the first screen (it lists every procedure the fuser may not use
  // now, so with more open jobs it may run on below the fold).
  const box = await refusal.boundingBox();
  const heading = await refusal.getByText("You cannot record this joint").boundingBox();
  expect(heading!.y + heading!.height).toBeLessThanOrEqual(SCREEN.height);
  const setupBox = await trench.section("1. Set up").boundingBox();
  expect(box!.y).toBeLessThan(setupBox!.y);
  await expect(trench.recordButton).toBeDisabled();
  await trench.shot("flow-5-blocked", false);
});

test("the same two coils again: asked whether it is a remake or a mistake before recording", async ({ page }) => {
  await new SignInPage(page).signInAs("fuser");
  const trench = new TrenchPage(page);
  // The latest joint the server holds between LV-C0001 and LV-C0002 (demo joints on WO-24117).
  const r = await page.request.get("/api/v1/joints?limit=200");
  const body = (await r.json()) as { joints: { jointNo: number; madeAt: string; coilA: { code: string } | null; coilB: { code: string } | null; job: { code: string } }[] };
  const pair = body.joints.filter((j) => j.job.code === "WO-24117" && [j.coilA?.code, j.coilB?.code].sort().join("+") === "LV-C0001+LV-C0002").sort((a, b) => b.madeAt.localeCompare(a.madeAt));
  expect(pair.length).toBeGreaterThan(0);
  const earlier = pair[0]!.jointNo;

  await trench.goto();
  await trench.chooseSetup(SETUP);
  await trench.fillTypedJoint(JOINT);
  const before = body.joints.length;
  await trench.recordButton.click();
  const question = trench.sameCoilsQuestion();
  await expect(question).toBeVisible();
  await expect(question.getByRole("heading")).toHaveText(`These two coils were already joined in joint ${earlier}. Is this a remake of that joint, or a mistake?`);
  await trench.shot("flow-6-same-coils", false);
  // Nothing was sent while the question is open.
  await expect(trench.outboxStatus()).toContainText("Nothing is waiting to be sent");

  await question.getByRole("button", { name: "Change the coils" }).click();
  await expect(question).toHaveCount(0);
  await expect(page.getByLabel("Coil on side B")).toBeFocused();

  await trench.recordButton.click();
  await expect(question).toBeVisible();
  await question.getByRole("button", { name: "Record anyway" }).click();
  await expect(trench.result()).toHaveText(/^Joint \d+ on WO-24117: Within limits$/);
  const after = (await (await page.request.get("/api/v1/joints?limit=200")).json()) as { joints: unknown[] };
  expect(after.joints.length).toBe(before + 1);
});

test("a coil page reached from a label scan offers Use as side A and B, filling the Trench sides", async ({ page }) => {
  await new SignInPage(page).signInAs("fuser");
  await page.goto("/coils/LV-C0003");
  await page.getByRole("link", { name: "Use as side A" }).click();
  const trench = new TrenchPage(page);
  await expect(trench.recordButton).toBeEnabled();
  await expect(page.getByLabel("Coil on side A")).toHaveValue("LV-C0003");
  await expect(page.getByText(/^LV-C0003 ·/)).toBeVisible();
  await expect(page).toHaveURL(/\/trench$/);

  await page.goto("/coils/LV-C0001");
  await page.getByRole("link", { name: "Use as side B" }).click();
  await expect(trench.recordButton).toBeEnabled();
  await expect(page.getByLabel("Coil on side B")).toHaveValue("LV-C0001");
  await expect(page.getByLabel("Coil on side A")).toHaveValue("LV-C0003");
  await trench.shot("flow-7-from-coil-page", false);
});
