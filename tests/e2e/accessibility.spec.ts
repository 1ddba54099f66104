// Gloves and sunlight: the fuser's screens on a phone (390 × 844), checked by axe-core
// (the reference implementation of the WCAG rules, through @axe-core/playwright) and by
// measuring the touch targets in the browser.
//
// - No serious or critical axe violation of WCAG 2.x A/AA (and 2.1/2.2 AA) on Trench,
//   Today and a joint's page. // source: axe-core rule set, tags wcag2a/wcag2aa/wcag21a/wcag21aa/wcag22aa
// - Text contrast at least 7:1 on Trench, with its pressure plan shown: axe-core's
//   "color-contrast-enhanced" rule. // source: WCAG 2.x SC 1.4.6 Contrast (Enhanced), level AAA, 7:1 (4.5:1 for large text)
// - Every control on Trench at least 48 × 48 CSS px. // source: WCAG 2.x SC 2.5.5 Target Size
//   (Enhanced), level AAA: at least 44 × 44 CSS px, with an exception for targets inline in a
//   sentence; 48 px is the issue's figure for gloved hands (common practice for touch UIs).
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";
import { TrenchPage } from "./pages/trench-page";

test.use({ viewport: { width: 390, height: 844 }, hasTouch: true });

const WCAG_A_AA = ["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"];
const MIN_TARGET_PX = 48;

type Violation = { id: string; impact?: string | null; help: string; nodes: { target: unknown; failureSummary?: string }[] };
const describe = (vs: Violation[]) => vs.map((v) => `${v.impact} ${v.id}: ${v.help}\n  ${v.nodes.map((n) => `${JSON.stringify(n.target)} ${n.failureSummary ?? ""}`.replace(/\s+/g, " ")).join("\n  ")}`).join("\n");

async function seriousViolations(page: Page): Promise<Violation[]> {
  const result = await new AxeBuilder({ page }).withTags(WCAG_A_AA).analyze();
  return (result.violations as Violation[]).filter((v) => v.impact === "serious" || v.impact === "critical");
}

async function enhancedContrast(page: Page): Promise<{ violations: Violation[]; checked: number }> {
  const result = await new AxeBuilder({ page }).withRules(["color-contrast-enhanced"]).analyze();
  return { violations: result.violations as Violation[], checked: result.passes.reduce((n, r) => n + r.nodes.length, 0) };
}

/**
 * Every visible control on the page with its size: buttons, links, form controls and
 * summaries. A radio or checkbox inside a label is measured by its label (tapping the
 * label works the control). Links inline in a sentence are left out (SC 2.5.5's exception).
 */
async function targetSizes(page: Page): Promise<{ what: string; width: number; height: number }[]> {
  return page.evaluate(() => {
    const out: { what: string; width: number; height: number }[] = [];
    const controls = document.querySelectorAll<HTMLElement>("a[href], button, input:not([type=hidden]), select, textarea, summary, [role=button]");
    for (const el of controls) {
      const style = getComputedStyle(el);
      if (style.visibility === "hidden" || style.display === "none" || el.getClientRects().length === 0) continue;
      if (el.tagName === "A" && style.display === "inline" && el.closest("p")) continue;
      const target = (el instanceof HTMLInputElement && (el.type === "radio" || el.type === "checkbox") && el.closest("label")) || el;
      const box = target.getBoundingClientRect();
      const name = (el.getAttribute("aria-label") || el.textContent || (el as HTMLInputElement).name || el.id || "").trim().replace(/\s+/g, " ").slice(0, 60);
      out.push({ what: `${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ""} "${name}"`, width: Math.round(box.width * 10) / 10, height: Math.round(box.height * 10) / 10 });
    }
    return out;
  });
}

test("Trench, Today and a joint's page have no serious accessibility violation on a phone; Trench text reaches 7:1", async ({ page }) => {
  test.setTimeout(180_000);
  await new SignInPage(page).signInAs("fuser");

  const trench = new TrenchPage(page);
  await trench.goto();
  expect(describe(await seriousViolations(page)), "Trench, empty form").toBe("");

  // With the pressure plan on screen: the gauge pressures and limits the fuser reads.
  await trench.chooseSetup({ job: "WO-24117 · Fenwick Lane main renewal", machine: "FM-201 · Hydraulic butt-fusion machine, 2–8 in IPS", heater: "HP-31" });
  await trench.coil("A", "LV-C0001");
  await trench.field("Drag pressure measured").fill("10");
  const plan = page.getByRole("region", { name: "Pressure plan" });
  await expect(plan).toBeVisible();
  await plan.getByText("Where these limits come from").click();
  expect(describe(await seriousViolations(page)), "Trench with the pressure plan").toBe("");
  const contrast = await enhancedContrast(page);
  expect(contrast.checked, "text elements axe measured").toBeGreaterThan(20);
  expect(describe(contrast.violations), "Trench text below 7:1").toBe("");
  // Control: the rule does flag text below 7:1 here — red #b91c1c on #fee2e2 is 5.3:1 by the
  // WCAG 2.x relative-luminance formula (the theme's "fail" colour before this check).
  await page.evaluate(() => {
    const p = document.createElement("p");
    p.id = "contrast-control";
    p.textContent = "Heater temperature 232 °C";
    p.style.cssText = "color:#b91c1c;background:#fee2e2;font-size:16px";
    document.querySelector("main")!.append(p);
  });
  expect((await enhancedContrast(page)).violations.flatMap((v) => v.nodes.map((n) => JSON.stringify(n.target)))).toContain(JSON.stringify(["#contrast-control"]));
  await page.evaluate(() => document.getElementById("contrast-control")!.remove());

  await page.goto("/");
  await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
  expect(describe(await seriousViolations(page)), "Today").toBe("");

  const r = await page.request.get("/api/v1/joints?limit=1");
  expect(r.status()).toBe(200);
  const [joint] = ((await r.json()) as { joints: { id: number }[] }).joints;
  expect(joint, "the demo fuser has a joint on record").toBeTruthy();
  await page.goto(`/joints/${joint.id}`);
  await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
  expect(describe(await seriousViolations(page)), "joint page").toBe("");
});

test("every control on Trench is at least 48 px high and wide for gloved hands", async ({ page }) => {
  await new SignInPage(page).signInAs("fuser");
  const trench = new TrenchPage(page);
  await trench.goto();
  await trench.chooseSetup({ job: "WO-24117 · Fenwick Lane main renewal", machine: "FM-201 · Hydraulic butt-fusion machine, 2–8 in IPS", heater: "HP-31" });
  await trench.coil("A", "LV-C0001");
  await trench.field("Drag pressure measured").fill("10");
  await expect(page.getByRole("region", { name: "Pressure plan" })).toBeVisible();

  // Control: a 44 px button (the theme's touch size before this check) is measured and caught.
  await page.evaluate(() => {
    const b = document.createElement("button");
    b.type = "button";
    b.textContent = "control";
    b.style.cssText = "height:44px;width:120px";
    document.querySelector("main")!.append(b);
  });
  expect((await targetSizes(page)).find((s) => s.what === 'button "control"')).toEqual({ what: 'button "control"', width: 120, height: 44 });
  await page.evaluate(() => [...document.querySelectorAll("main > button")].find((b) => b.textContent === "control")!.remove());

  const sizes = await targetSizes(page);
  // The form's own controls are there (so the check below cannot pass on an empty page).
  expect(sizes.some((s) => s.what.includes('"Record joint"'))).toBe(true);
  expect(sizes.filter((s) => s.what.startsWith("select")).length).toBeGreaterThanOrEqual(4);
  const small = sizes.filter((s) => s.height < MIN_TARGET_PX || s.width < MIN_TARGET_PX);
  expect(small.map((s) => `${s.what}: ${s.width} × ${s.height} px`).join("\n"), `controls under ${MIN_TARGET_PX} px`).toBe("");
});
