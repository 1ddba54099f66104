// Honest evidence, on a phone: the demo inspector opens a joint in Review at 390 × 844 and
// sees the procedure the joint was made under by its own code and version, bead-up
// pressure left empty as "not recorded (optional)" in a neutral style (bead-up at fusion
// pressure is the procedure's own step, PPI "Melt Procedure" page), the panel without
// sideways scrolling, and a pressure-trace file refused on a second joint, naming the
// joint it belongs to. The spec makes its own procedure, job and joints (fixtures), so
// it is independent of what other specs leave in the shared demo database.
import "../support/server-only-outside-next";
import { expect, test } from "@playwright/test";
import type { Knex } from "knex";
import { ownerKnex } from "@/database/migrate";
import { makeReviewBase, makeReviewJoint, type MadeJoint, type ReviewBase } from "@/fixtures/review-joints";
import { pressureTraceToCsv } from "@/domain/pressure-trace/parse";
import { synthesizePressureTrace } from "@/domain/pressure-trace/synthesize";
import { EvidencePanel } from "./pages/evidence-panel";
import { ReviewPage } from "./pages/review-page";
import { SignInPage } from "./pages/sign-in-page";

test.use({ viewport: { width: 390, height: 844 }, hasTouch: true });

let k: Knex;
let base: ReviewBase;
let jobLabel: string;
let procedure: { code: string; versionNo: number };
const made: MadeJoint[] = [];

test.beforeAll(async () => {
  k = ownerKnex(process.env.MIGRATION_DATABASE_URL);
  base = await makeReviewBase(k, { code: `EV${Date.now() % 1_000_000}` });
  const job = await k("jobs").where({ id: base.jobId }).first("code", "name");
  jobLabel = `${job.code} ${job.name}`;
  const row = await k("procedure_versions as pv").join("procedures as p", "p.id", "pv.procedure_id").where("pv.id", base.procedureVersionId).first("p.code", "pv.version_no");
  procedure = { code: row.code, versionNo: Number(row.version_no) };
  const fuser = await k("users").where({ email: "fuser@larkmoor-gas.example" }).first("id");
  // Two joints out of limits (heater under the window), bead-up left empty at the trench.
  for (const hoursAgo of [60, 59]) {
    made.push(await makeReviewJoint(k, base, { fuserId: fuser.id, madeAt: new Date(Date.now() - hoursAgo * 3_600_000), fault: "heater-cold", values: { beadUpGaugePressureMpa: null }, station: "7+10" }));
  }
});

test.afterAll(async () => {
  await k?.destroy();
});

/** A trace of the first joint's cycle; the comment line makes the file this run's own. */
function traceFile(joint: MadeJoint): { name: string; buffer: Buffer } {
  const v = joint.values;
  const trace = synthesizePressureTrace({
    sampleIntervalS: 1,
    beadUpS: 20,
    heatSoakS: v.heatSoakS ?? 60,
    changeoverS: v.changeoverS!,
    pressureBuildUpS: 3,
    coolingS: v.coolingS!,
    beadUpGaugePressureMpa: v.fusionGaugePressureMpa!,
    dragPressureMpa: v.dragPressureMpa!,
    fusionGaugePressureMpa: v.fusionGaugePressureMpa!,
    noiseMpa: 0.004,
    seed: 11,
  });
  return { name: "joint-trace.csv", buffer: Buffer.from(`# browser test ${base.jobCode}\n${pressureTraceToCsv(trace.samples)}`) };
}

test("the evidence panel names the procedure, keeps optional values neutral, fits a phone, and refuses a trace already attached elsewhere", async ({ page }) => {
  const [first, second] = made as [MadeJoint, MadeJoint];
  const firstLabel = `${base.jobCode} joint ${first.jointNo}`;
  const secondLabel = `${base.jobCode} joint ${second.jointNo}`;
  await new SignInPage(page).signInAs("inspector");
  const review = new ReviewPage(page);
  await review.open();
  await review.filterBy("Job", jobLabel);
  const panel = new EvidencePanel(await review.openJoint(firstLabel));

  // The procedure row the joint references, by code and version (not only the standard).
  await expect(panel.fact("Procedure")).toContainText(`${procedure.code} v${procedure.versionNo}`);

  // Bead-up left empty: optional, neutral — no red row, no "Out of limits"/"Not recorded (required)".
  const beadUp = panel.valueRow("Bead-up gauge pressure");
  await expect(beadUp).toContainText("not recorded (optional)");
  await expect(beadUp).toContainText("Optional");
  await expect(beadUp).not.toHaveClass(/bg-fail/);
  await expect(beadUp.locator(".text-fail")).toHaveCount(0);
  // The out-of-limits heater row stays red beside it.
  await expect(panel.valueRow("Heater temperature")).toHaveClass(/bg-fail-light/);
  // Heat soak, ambient temperature and shelter are in the comparison; the fixture's 12 °C shows as 54 °F (US inspector; °F = 1.8 °C + 32, NIST SP 811).
  await expect(panel.valueRow("Heat soak")).toBeVisible();
  await expect(panel.valueRow("Ambient temperature")).toContainText("54 °F");
  await expect(panel.valueRow("Shelter")).toContainText("Windbreak");

  // 390 px wide: nothing in the panel scrolls sideways.
  expect(await panel.fitsItsWidth()).toBe(true);
  await page.screenshot({ path: "tests/e2e/artifacts/review-evidence-phone.png", fullPage: true });

  // The trace attaches to the first joint (a new revision: the panel shows the trace) …
  const file = traceFile(first);
  await panel.attachTrace(file);
  await expect(panel.traceRegion()).toContainText("samples, attached");

  // … and the same file is refused on the second, naming the first with a link to it.
  const other = new EvidencePanel(await review.openJoint(secondLabel));
  await other.attachTrace(file);
  await expect(other.traceMessage()).toContainText(`already attached to ${firstLabel}`);
  await expect(page.getByRole("link", { name: "Open the joint this trace belongs to" })).toHaveAttribute("href", `/joints/${first.jointId}`);
  await expect(other.traceRegion()).toContainText("No pressure trace is attached.");
  expect(await other.fitsItsWidth()).toBe(true);
  await page.screenshot({ path: "tests/e2e/artifacts/review-evidence-duplicate-trace.png", fullPage: true });
});
