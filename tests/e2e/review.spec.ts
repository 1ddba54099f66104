// The demo inspector works the review queue: opens it, decides joints, and the queue
// shrinks; a joint recorded meanwhile appears without a reload; the alert mail for an
// out-of-limits joint reaches the development mailbox. Joints are written straight into
// the test database with the fixture builder (the way the trench records them).
import "../support/server-only-outside-next";
import { expect, test } from "@playwright/test";
import type { Knex } from "knex";
import { ownerKnex } from "@/database/migrate";
import { enqueueJointAlert } from "@/app/_server/mail/joint-alert";
import { makeReviewJoint, type FaultName, type ReviewBase, demoReviewBase } from "@/fixtures/review-joints";
import { MailboxPage, ReviewPage } from "./pages/review-page";
import { SignInPage } from "./pages/sign-in-page";

let k: Knex;
let base: ReviewBase;
let fuserId: number;

async function record(fault?: FaultName, hoursAgo = 30): Promise<string> {
  const joint = await makeReviewJoint(k, base, { fuserId, madeAt: new Date(Date.now() - hoursAgo * 3_600_000), fault, pistonAreaMm2: 1006.5, station: "4+20" });
  await enqueueJointAlert({ jointId: joint.jointId }, k);
  return `${base.jobCode} joint ${joint.jointNo}`;
}

test.beforeAll(async () => {
  k = ownerKnex(process.env.MIGRATION_DATABASE_URL);
  ({ base, fuserId } = await demoReviewBase(k));
});

test.afterAll(async () => {
  await k?.destroy();
});

test("the inspector opens the queue, decides joints, and the queue shrinks", async ({ page }) => {
  const cold = await record("heater-cold", 50);
  const good = await record(undefined, 40);
  await new SignInPage(page).signInAs("inspector");
  const review = new ReviewPage(page);
  await review.open();
  await expect(review.item(cold)).toBeVisible();
  await expect(review.item(good)).toBeVisible();
  const before = await review.waitingCount();
  // Out of limits first: the cold-heater joint is listed before the within-limits one.
  const labels = await review.queue().getByRole("article").evaluateAll((els) => els.map((e) => e.getAttribute("aria-label")));
  expect(labels.indexOf(cold)).toBeLessThan(labels.indexOf(good));
  await page.screenshot({ path: "tests/e2e/artifacts/review-queue.png", fullPage: true });

  const detail = await review.openJoint(cold);
  // Findings in plain words, in the inspector's units (the demo inspector uses US units).
  await expect(detail.getByRole("listitem").filter({ hasText: /Heater temperature \d+ °F is below the 400–450 °F window/ })).toBeVisible();
  await expect(detail.getByRole("row", { name: /Heater temperature/ })).toContainText("Out of limits");
  await page.screenshot({ path: "tests/e2e/artifacts/review-joint.png", fullPage: true });

  // Cutting out needs the reason: the form names the field.
  await detail.getByLabel("Cut it out (the fuser must remake it)").check();
  await detail.getByRole("button", { name: "Record decision" }).click();
  await expect(detail.getByText("Say why the joint is cut out")).toBeVisible();

  await review.decide(detail, "Cut it out (the fuser must remake it)", "Heater 12 °C under the window; cut out and remake");
  await expect(page.getByRole("status").filter({ hasText: `${cold} cut out` })).toBeVisible();
  await expect(review.item(cold)).toHaveCount(0);
  await expect.poll(() => review.waitingCount()).toBe(before - 1);

  const okDetail = await review.openJoint(good);
  await review.decide(okDetail, "Accept the joint", "Bead even, values inside the plan");
  await expect(review.item(good)).toHaveCount(0);
  await expect.poll(() => review.waitingCount()).toBe(before - 2);
  await page.screenshot({ path: "tests/e2e/artifacts/review-after-decisions.png", fullPage: true });
});

test("a joint recorded at the trench appears in the open queue without a reload", async ({ page }) => {
  await new SignInPage(page).signInAs("inspector");
  const review = new ReviewPage(page);
  await review.open();
  const before = await review.waitingCount();
  const fresh = await record("cooling-short", 1);
  await expect(review.item(fresh)).toBeVisible({ timeout: 15_000 });
  await expect.poll(() => review.waitingCount()).toBe(before + 1);
  await review.filterBy("Finding", "Cooling");
  await expect(review.item(fresh)).toBeVisible();
  await page.screenshot({ path: "tests/e2e/artifacts/review-live.png", fullPage: true });
});

test("the out-of-limits alert arrives in the development mailbox", async ({ page }) => {
  const label = await record("changeover-long", 2);
  await new SignInPage(page).signInAs("admin");
  const mailbox = new MailboxPage(page);
  // The server's mail worker sends every couple of seconds; reload until it has. The alert
  // goes out alone, or folded with others that fell in the admin's same burst window.
  const alert = `Out of limits: ${label} (1 finding)`;
  const item = mailbox.received().getByRole("listitem").filter({ hasText: alert });
  await expect
    .poll(
      async () => {
        await mailbox.open();
        return item.count();
      },
      { timeout: 30_000, intervals: [1000, 2000, 3000] },
    )
    .toBe(1);
  await item.locator("summary").click();
  await expect(item.getByText(alert).first()).toBeVisible();
  await page.screenshot({ path: "tests/e2e/artifacts/mailbox.png", fullPage: true });
});

test("Insights shows its charts", async ({ page }) => {
  await new SignInPage(page).signInAs("inspector");
  await page.goto("/insights");
  for (const title of ["First-pass yield by week", "Findings by parameter", "First-pass yield by fuser", "First-pass yield by machine", "Heater temperature of recorded joints", "Cooling time: recorded against required"]) {
    await expect(page.getByRole("heading", { name: title })).toBeVisible();
  }
  await expect(page.locator(".recharts-surface").first()).toBeVisible();
  await page.screenshot({ path: "tests/e2e/artifacts/insights.png", fullPage: true });
});
