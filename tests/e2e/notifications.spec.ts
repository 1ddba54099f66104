// Every signed-in person reads their own notifications: the demo fuser's joint is cut out,
// the notice goes out through the outbox and the mail worker, the fuser reads it on the
// Notifications screen (phone width, no sideways scrolling), sees it was sent, follows the
// link in the mail's text and lands on the joint's page — not a "not found". An inspector's
// alert about another joint is not on the fuser's screen. The fuser then switches their
// alert mail to hourly. Joints are written straight into the test database with the
// fixture builder, and the notice is queued the way the review decision queues it.
import "../support/server-only-outside-next";
import { expect, test } from "@playwright/test";
import type { Knex } from "knex";
import { ownerKnex } from "@/database/migrate";
import { enqueueCutOutNotice } from "@/app/_server/mail/cut-out-notice";
import { enqueueJointAlert } from "@/app/_server/mail/joint-alert";
import { makeReviewJoint, type ReviewBase, demoReviewBase } from "@/fixtures/review-joints";
import { NotificationsPage } from "./pages/notifications-page";
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

test("a fuser reads their own cut-out notice and its link opens the joint", async ({ page, baseURL }) => {
  // The mail's links carry the app's public address, as the server's own would.
  process.env.BEADLINE_PUBLIC_URL = baseURL;
  const joint = await makeReviewJoint(k, base, { fuserId, madeAt: new Date(Date.now() - 3 * 3_600_000), fault: "cooling-short", pistonAreaMm2: 1006.5, station: "7+40" });
  const reason = `Cooling cut short on the remake check ${Date.now()}`;
  await enqueueCutOutNotice({ jointId: joint.jointId, reason, inspectorName: "Demo Inspector" }, k);
  const other = await makeReviewJoint(k, base, { fuserId, madeAt: new Date(Date.now() - 2 * 3_600_000), fault: "heater-cold", pistonAreaMm2: 1006.5 });
  await enqueueJointAlert({ jointId: other.jointId }, k); // to the inspectors, not the fuser
  const subject = `Cut out: ${base.jobCode} joint ${joint.jointNo} must be remade`;

  await page.setViewportSize({ width: 390, height: 844 });
  await new SignInPage(page).signInAs("fuser");
  await page.getByRole("navigation", { name: "Screens" }).getByRole("link", { name: "Notifications" }).click();
  const screen = new NotificationsPage(page);
  await expect(page.getByRole("heading", { name: "Notifications", level: 1 })).toBeVisible();
  // The mail worker folds the notice into a mail after the (test) burst window and sends it.
  await expect
    .poll(
      async () => {
        await screen.open();
        // Read without waiting: the mail may not be made yet, and a later poll reloads.
        const item = screen.message(subject);
        return (await item.count()) ? ((await item.first().textContent()) ?? "") : "";
      },
      { timeout: 30_000, intervals: [1000, 2000, 3000] },
    )
    .toMatch(/Sent \d{4}-\d\d-\d\d \d\d:\d\d/);
  await expect(page.getByText(`Out of limits: ${base.jobCode} joint ${other.jointNo}`)).toHaveCount(0);
  const mail = await screen.read(subject);
  await expect(mail.getByText(reason)).toBeVisible();
  expect(await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth)).toBeLessThanOrEqual(0);
  await page.screenshot({ path: "tests/e2e/artifacts/notifications.png", fullPage: true });

  // The link in the mail's own text, as the fuser's mail program would show it.
  const link = mail.getByRole("link", { name: `${baseURL}/joints/${joint.jointId}` });
  await expect(link).toHaveAttribute("href", `/joints/${joint.jointId}`);
  const response = page.waitForResponse((r) => r.url().endsWith(`/joints/${joint.jointId}`) && r.request().resourceType() === "document");
  await link.click();
  expect((await response).status()).toBe(200);
  await expect(page.getByRole("heading", { name: `Joint ${joint.jointNo} on ${base.jobCode}`, level: 1 })).toBeVisible();

  // The fuser chooses hourly mail; the choice is kept.
  await screen.open();
  await screen.grouping().getByLabel(/One mail an hour/).click();
  await expect(screen.grouping().getByRole("status")).toContainText("Saved: one mail an hour");
  await screen.open();
  await expect(screen.grouping().getByLabel(/One mail an hour/)).toBeChecked();
  await k("users").where({ id: fuserId }).update({ mail_grouping: "immediate" });
});

test("an inspector reads their own out-of-limits alert and its link opens the joint in Review", async ({ page, baseURL }) => {
  process.env.BEADLINE_PUBLIC_URL = baseURL;
  const joint = await makeReviewJoint(k, base, { fuserId, madeAt: new Date(Date.now() - 3_600_000), fault: "heater-cold", pistonAreaMm2: 1006.5, station: "9+15" });
  await enqueueJointAlert({ jointId: joint.jointId }, k);
  const about = `${base.jobCode} joint ${joint.jointNo}`;

  await new SignInPage(page).signInAs("inspector");
  const screen = new NotificationsPage(page);
  // The alert goes out alone or folded with others that fell in the same window.
  const item = screen.mail().getByRole("listitem").filter({ hasText: about });
  await expect
    .poll(
      async () => {
        await screen.open();
        return (await item.count()) ? ((await item.first().textContent()) ?? "") : "";
      },
      { timeout: 30_000, intervals: [1000, 2000, 3000] },
    )
    .toMatch(/Sent \d{4}-\d\d-\d\d \d\d:\d\d/);
  await item.first().locator("summary, button").first().click();
  const link = item.first().getByRole("link", { name: `${baseURL}/review?joint=${joint.jointId}` });
  await expect(link).toHaveAttribute("href", `/review?joint=${joint.jointId}`);
  await link.click();
  await expect(page).toHaveURL(new RegExp(`/review\\?joint=${joint.jointId}$`));
  // The joint is open in the selected-joint panel.
  await expect(page.getByLabel("Selected joint").getByRole("heading", { name: about, exact: true })).toBeVisible();
});
