// Charts that read: the inspector's pressure-trace chart and the Insights heater chart mark
// points outside their window by shape (hollow triangles; inside: filled circles), keep
// their key below the plot, carry round axis ticks and fit a 390 px phone without sideways
// scrolling. The spec records its own joints (fixture builder) and attaches its own trace
// through the upload route, so it depends on no other spec's data.
import "../support/server-only-outside-next";
import { expect, test, type Locator, type Page } from "@playwright/test";
import type { Knex } from "knex";
import { ownerKnex } from "@/database/migrate";
import { makeReviewJoint, type ReviewBase, demoReviewBase } from "@/fixtures/review-joints";
import { pressureTraceToCsv } from "@/domain/pressure-trace/parse";
import { synthesizePressureTrace } from "@/domain/pressure-trace/synthesize";
import { ReviewPage } from "./pages/review-page";
import { SignInPage } from "./pages/sign-in-page";

let k: Knex;
let base: ReviewBase;
let fuserId: number;

test.beforeAll(async () => {
  k = ownerKnex(process.env.MIGRATION_DATABASE_URL);
  ({ base, fuserId } = await demoReviewBase(k));
});

test.afterAll(async () => {
  await k?.destroy();
});

/** The numbers on an axis's ticks, in order. */
async function tickValues(axis: Locator): Promise<number[]> {
  const texts = await axis.locator(".recharts-cartesian-axis-tick-value").allTextContents();
  return texts.map((t) => Number(t.replace(/[^0-9.-]/g, "")));
}

/** Ticks are evenly spaced by 1, 2 or 5 × 10^n (Heckbert's nice steps). */
function expectRoundSteps(ticks: number[]): void {
  expect.soft(ticks.length, `ticks ${ticks.join(", ")}`).toBeGreaterThanOrEqual(3);
  if (ticks.length < 2) return;
  const step = ticks[1]! - ticks[0]!;
  const mantissa = step / 10 ** Math.floor(Math.log10(step));
  expect.soft([1, 2, 5].some((m) => Math.abs(mantissa - m) < 1e-6), `ticks ${ticks.join(", ")}`).toBe(true);
  for (let i = 1; i < ticks.length; i += 1) expect.soft(Math.abs(ticks[i]! - ticks[i - 1]! - step), `ticks ${ticks.join(", ")}`).toBeLessThan(step * 1e-6);
}

/** The figure fits the viewport and its key lies wholly below the plot. */
async function expectKeyBelowPlot(page: Page, plot: Locator, key: Locator): Promise<void> {
  const p = (await plot.boundingBox())!;
  const l = (await key.boundingBox())!;
  expect.soft(l.y).toBeGreaterThanOrEqual(p.y + p.height - 1);
  const width = page.viewportSize()!.width;
  expect.soft(p.x + p.width).toBeLessThanOrEqual(width);
  expect.soft(l.x + l.width).toBeLessThanOrEqual(width);
}

test("the trace and heater charts mark out-of-window points by shape, with the key below the plot", async ({ page }) => {
  // A joint whose held pressure falls below the fusion window part-way through cooling.
  const joint = await makeReviewJoint(k, base, { fuserId, madeAt: new Date(Date.now() - 3 * 3_600_000), station: "7+35" });
  const cold = await makeReviewJoint(k, base, { fuserId, madeAt: new Date(Date.now() - 2 * 3_600_000), fault: "heater-cold", station: "7+40" });
  const label = `${base.jobCode} joint ${joint.jointNo}`;
  const v = joint.values;
  const trace = synthesizePressureTrace({
    sampleIntervalS: 1,
    beadUpS: 20,
    heatSoakS: 60,
    changeoverS: 6,
    pressureBuildUpS: 3,
    coolingS: 200,
    beadUpGaugePressureMpa: v.beadUpGaugePressureMpa!,
    dragPressureMpa: v.dragPressureMpa!,
    fusionGaugePressureMpa: v.fusionGaugePressureMpa!,
    reducedCoolingGaugePressureMpa: joint.plan.fusionGaugePressureMpa.min * 0.6,
    reducedAfterS: 120,
    heaterTemperatureC: 218,
    noiseMpa: 0.002,
    seed: 11,
  });

  await new SignInPage(page).signInAs("inspector");
  const upload = await page.request.post("/api/v1/traces", {
    multipart: { jointId: String(joint.jointId), file: { name: "charts-spec.csv", mimeType: "text/csv", buffer: Buffer.from(pressureTraceToCsv(trace.samples, "psi")) } },
  });
  expect(upload.status()).toBe(201);

  await page.setViewportSize({ width: 1280, height: 900 });
  const review = new ReviewPage(page);
  await review.open();
  const detail = await review.openJoint(label);
  const plot = detail.locator('[data-chart="pressure-trace"]');
  await expect(plot.locator(".recharts-surface")).toBeVisible();
  await plot.scrollIntoViewIfNeeded();
  await page.screenshot({ path: "tests/e2e/artifacts/trace-chart-desktop.png" });
  // Out of the window: hollow triangles along the samples below the fusion window (thinned to
  // one per 1/50 of the time axis, so a run of them stays separate marks); the summary counts every sample.
  const outside = plot.locator('path[data-point="outside"]');
  expect(await outside.count()).toBeGreaterThan(5);
  await expect(outside.first()).toHaveAttribute("fill", "#ffffff");
  await expect(plot).toHaveAttribute("aria-label", /Fusion pressure window [\d.]+ psi to [\d.]+ psi: [1-9]\d* of \d+ samples outside/);
  const key = detail.getByRole("list", { name: "Key to the pressure trace" });
  await expect(key.getByRole("listitem").filter({ hasText: /^Sample outside its pressure window \(\d+\)$/ })).toBeVisible();
  await expect(key.getByRole("listitem").filter({ hasText: "Pressure window of the plan" })).toBeVisible();
  await expectKeyBelowPlot(page, plot, key);
  // Round ticks in psi and seconds (the inspector's units are US).
  expectRoundSteps(await tickValues(plot.locator(".recharts-yAxis-tick-labels").first()));
  expectRoundSteps(await tickValues(plot.locator(".recharts-xAxis-tick-labels")));
  // The fusion window is drawn (not dropped for lying outside the axis).
  expect(await plot.locator(".recharts-reference-area").count()).toBeGreaterThanOrEqual(2);

  await page.setViewportSize({ width: 390, height: 844 });
  await expect(plot.locator(".recharts-surface")).toBeVisible();
  await plot.scrollIntoViewIfNeeded();
  await page.screenshot({ path: "tests/e2e/artifacts/trace-chart-phone.png" });
  await expectKeyBelowPlot(page, plot, key);

  // Insights: the cold-heater joint is a hollow triangle among filled circles.
  await page.goto("/insights");
  const heater = page.locator('[data-chart="heater"]');
  await expect(heater.locator(".recharts-surface")).toBeVisible();
  await heater.scrollIntoViewIfNeeded();
  await page.screenshot({ path: "tests/e2e/artifacts/insights-heater-phone.png" });
  await page.screenshot({ path: "tests/e2e/artifacts/insights-phone-full.png", fullPage: true });
  expect(await heater.locator('path[data-point="outside"]').count()).toBeGreaterThanOrEqual(1);
  expect(await heater.locator('circle[data-point="inside"]').count()).toBeGreaterThanOrEqual(1);
  await expect(heater).toHaveAttribute("aria-label", /; [1-9]\d* outside it \(/);
  const heaterKey = page.getByRole("list", { name: "Key to heater temperature of recorded joints" });
  await expect(heaterKey.getByRole("listitem").filter({ hasText: /^Outside the window \([1-9]\d*\)$/ })).toBeVisible();
  await expectKeyBelowPlot(page, heater, heaterKey);
  expectRoundSteps(await tickValues(heater.locator(".recharts-yAxis-tick-labels")));
  const scrolls = await page.evaluate(() => document.documentElement.scrollWidth > document.documentElement.clientWidth);
  expect.soft(scrolls).toBe(false);
  await page.setViewportSize({ width: 1280, height: 900 });
  await heater.scrollIntoViewIfNeeded();
  await page.screenshot({ path: "tests/e2e/artifacts/insights-desktop.png", fullPage: true });
  expect(cold.check.outcome).toBe("out-of-limits");
});
