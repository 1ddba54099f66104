// The review queue at utility scale: more than 50 joints waiting on a job of this spec's
// own (written with the fixture builder, the way the trench records them; the demo
// database is shared, so every check is scoped to this job or to joints made here). The
// inspector pages past the first 50, filters (the filter lives in the URL), accepts ticked
// joints within limits in one go — one that turned out of limits after the page loaded is
// skipped with its reason — and follows links to a waiting joint past the first page, to a
// decided joint and to no joint. On a phone (390 px wide) the screen never scrolls sideways
// and opening a joint brings it into view. Named to run after review.spec.ts, and its
// joints still waiting are accepted at the end so other specs see the queue they expect.
import "../support/server-only-outside-next";
import { expect, test } from "@playwright/test";
import type { Knex } from "knex";
import { ownerKnex } from "@/database/migrate";
import { makeReviewBase, makeReviewJoint, type MadeJoint, type ReviewBase } from "@/fixtures/review-joints";
import { ReviewPage } from "./pages/review-page";
import { SignInPage } from "./pages/sign-in-page";

let k: Knex;
let base: ReviewBase;
let fuserId: number;
/** Within limits, oldest first (made 40 days ago, a minute apart). */
const within: MadeJoint[] = [];
const outOfLimits: MadeJoint[] = [];
const WITHIN = 58;
const label = (j: MadeJoint) => `${base.jobCode} joint ${j.jointNo}`;

test.beforeAll(async () => {
  test.setTimeout(120_000);
  k = ownerKnex(process.env.MIGRATION_DATABASE_URL);
  base = await makeReviewBase(k, { code: `SC${process.pid % 10000}` });
  fuserId = (await k("users").where({ email: "fuser@larkmoor-gas.example" }).first("id")).id;
  const start = Date.now() - 40 * 86_400_000;
  for (let i = 0; i < WITHIN; i += 1) within.push(await makeReviewJoint(k, base, { fuserId, madeAt: new Date(start + i * 60_000), station: `${i}+00` }));
  for (let i = 0; i < 2; i += 1) outOfLimits.push(await makeReviewJoint(k, base, { fuserId, madeAt: new Date(start + (WITHIN + i) * 60_000), fault: "cooling-short" }));
});

test.afterAll(async () => {
  // Leave nothing of this spec waiting: the rest of its joints are accepted (revision and projection, as a decision writes them).
  const inspector = await k("users").where({ email: "inspector@larkmoor-gas.example" }).first("id");
  const waiting = (await k("joint_states as js").join("joints as j", "j.id", "js.joint_id").where("j.job_id", base.jobId).where("js.review_state", "pending-review").select("js.joint_id", "js.revision_no")) as { joint_id: number; revision_no: number }[];
  for (const w of waiting) {
    await k("joint_revisions").insert({ joint_id: w.joint_id, revision_no: w.revision_no + 1, kind: "accepted", by_user_id: inspector.id, at: new Date(), reason: "Browser test clean-up", review_state: "accepted" });
    await k("joint_states").where({ joint_id: w.joint_id }).update({ review_state: "accepted", revision_no: w.revision_no + 1 });
  }
  await k?.destroy();
});

test("the inspector pages past the first 50, filters, and accepts within-limits joints in one go", async ({ page }) => {
  await new SignInPage(page).signInAs("inspector");
  const review = new ReviewPage(page);
  await review.open(`?job=${base.jobId}`);
  // The filter from the link: this job's 60 waiting joints, 2 out of limits, the first 50 shown.
  await expect(page.getByRole("status").filter({ hasText: "waiting" }).first()).toContainText("60 joints waiting, 2 out of limits (showing 50)");
  expect(await review.choiceCount("Job", base.jobCode)).toBe(60);
  expect(await review.choiceCount("Outcome", "Out of limits")).toBe(2);
  await expect(review.item(label(within[0]!))).toBeVisible();
  await expect(review.item(label(within[55]!))).toHaveCount(0);
  await review.showMore();
  await expect(review.item(label(within[55]!))).toBeVisible();
  await expect(review.item(label(outOfLimits[1]!))).toBeVisible();
  await expect.poll(() => review.shownCount()).toBe(60);
  await expect(page.getByRole("button", { name: /^Show more joints/ })).toHaveCount(0);

  // Within limits only; the URL carries the filter, so a reload shows the same view.
  await review.filterBy("Outcome", "Within limits");
  await expect(page).toHaveURL(new RegExp(`job=${base.jobId}&outcome=within-limits`));
  await expect.poll(() => review.waitingCount()).toBe(WITHIN);
  await page.reload();
  await expect(page.getByLabel("Outcome", { exact: true })).toHaveValue("within-limits");
  await expect.poll(() => review.waitingCount()).toBe(WITHIN);

  // Tick three; one of them is found out of limits after the page loaded (as a re-check would turn it).
  const [a, b, c] = [within[0]!, within[1]!, within[2]!];
  for (const j of [a, b, c]) await review.tick(label(j));
  await k("joint_states").where({ joint_id: b.jointId }).update({ outcome: "out-of-limits" });
  const result = await review.acceptTicked("Values and bead photos in order; accepted together");
  await expect(result).toContainText("2 joints accepted");
  await expect(result.getByRole("list", { name: "Skipped joints" })).toContainText(`${label(b)}: out of limits`);
  await expect(review.item(label(a))).toHaveCount(0);
  await expect(review.item(label(c))).toHaveCount(0);
  for (const j of [a, c]) {
    const revisions = await k("joint_revisions").where({ joint_id: j.jointId }).orderBy("revision_no");
    expect(revisions.map((r) => [r.revision_no, r.kind, r.reason])).toEqual([
      [1, "recorded", null],
      [2, "accepted", "Values and bead photos in order; accepted together"],
    ]);
  }
  expect(await k("joint_states").where({ joint_id: b.jointId }).first()).toMatchObject({ review_state: "pending-review", revision_no: 1 });
  await page.screenshot({ path: "tests/e2e/artifacts/review-batch.png", fullPage: true });
});

test("links to a joint land: waiting past the first page, decided, and unknown", async ({ page }) => {
  await new SignInPage(page).signInAs("inspector");
  const review = new ReviewPage(page);
  // The newest joint of this spec sits past the first 50 of the whole queue (oldest first).
  const far = within[WITHIN - 1]!;
  await review.open(`?joint=${far.jointId}`);
  await expect(review.detail().getByRole("heading", { name: label(far), exact: true })).toBeVisible();
  await expect(review.item(label(far))).toHaveCount(0);
  await expect(review.detail().getByRole("button", { name: "Record decision" })).toBeVisible();

  // A joint the demo inspector accepted (written as a decision writes it).
  const decided = within[3]!;
  const inspector = await k("users").where({ email: "inspector@larkmoor-gas.example" }).first("id");
  await k("joint_revisions").insert({ joint_id: decided.jointId, revision_no: 2, kind: "accepted", by_user_id: inspector.id, at: new Date(), reason: "Bead even all round", review_state: "accepted" });
  await k("joint_states").where({ joint_id: decided.jointId }).update({ review_state: "accepted", revision_no: 2 });
  await review.open(`?joint=${decided.jointId}`);
  await expect(review.detail()).toContainText(`${label(decided)} is no longer waiting for review: accepted by Dana Pellworth on`);
  await expect(review.detail().getByRole("link", { name: `See ${label(decided)} and its history` })).toHaveAttribute("href", `/joints/${decided.jointId}`);

  await review.open("?joint=987654321");
  await expect(review.detail()).toContainText("There is no joint 987654321.");
});

test.describe("on a phone", () => {
  test.use({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });

  test("the Review screen fits 390 px and opening a joint shows it at once", async ({ page }) => {
    await new SignInPage(page).signInAs("inspector");
    const review = new ReviewPage(page);
    await review.open(`?job=${base.jobId}`);
    await expect(review.item(label(within[10]!))).toBeVisible();
    const list = await review.fitsWidth();
    expect(list.scrollWidth).toBeLessThanOrEqual(list.clientWidth);
    await page.getByRole("button", { name: `Open ${label(within[10]!)}`, exact: true }).click();
    const heading = review.detail().getByRole("heading", { name: label(within[10]!), exact: true });
    await expect(heading).toBeInViewport();
    await expect(review.detail()).toBeFocused();
    const open = await review.fitsWidth();
    expect(open.scrollWidth).toBeLessThanOrEqual(open.clientWidth);
    await page.screenshot({ path: "tests/e2e/artifacts/review-phone-joint.png", fullPage: false });
    await page.getByRole("button", { name: "Back to the queue" }).click();
    await expect(review.item(label(within[10]!))).toBeInViewport();

    // A link to a waiting joint opens it in view on the phone too.
    await review.open(`?joint=${within[20]!.jointId}`);
    await expect(review.detail().getByRole("heading", { name: label(within[20]!), exact: true })).toBeInViewport();
    const linked = await review.fitsWidth();
    expect(linked.scrollWidth).toBeLessThanOrEqual(linked.clientWidth);
  });
});

test("every within-limits joint matching the filter is accepted in one go, after a confirmation", async ({ page }) => {
  await new SignInPage(page).signInAs("inspector");
  const review = new ReviewPage(page);
  await review.open(`?job=${base.jobId}`);
  const pending = async (outcome: string) =>
    Number((await k("joint_states as js").join("joints as j", "j.id", "js.joint_id").where("j.job_id", base.jobId).where({ "js.review_state": "pending-review", "js.outcome": outcome }).count({ n: "*" }))[0]!.n);
  const within = await pending("within-limits");
  const out = await pending("out-of-limits");
  expect(within).toBeGreaterThan(0);
  const batch = page.getByRole("region", { name: "Accept joints within limits together" });
  await batch.getByRole("button", { name: `Accept all ${within} within limits matching the filter` }).click();
  await batch.getByRole("group", { name: "Confirm accepting all matching" }).getByRole("button", { name: "Yes, accept them" }).click();
  const result = batch.getByRole("status", { name: "Batch result" });
  await expect(result).toContainText(`${within} joints accepted. ${out} out of limits left for a decision of their own.`);
  expect(await pending("within-limits")).toBe(0);
  expect(await pending("out-of-limits")).toBe(out);
  await expect.poll(() => review.waitingCount()).toBe(out);
});
