// The Trench screen on a phone-sized browser: the demo fuser (US customary units) records
// a joint with typed values and sees the verdict; then records one with no signal, which
// waits in the device's outbox and arrives exactly once when the signal is back; and a
// draft recorded in a second tab under a used submission id is refused, kept, and sent as
// a new joint.
//
// Values typed: tests/e2e/pages/demo-joint.ts, each with its published source.
import { PNG } from "pngjs";
import { expect, test } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";
import { TrenchPage } from "./pages/trench-page";
import { demoTypedJoint, fusionGaugePsi } from "./pages/demo-joint";

test.use({ viewport: { width: 390, height: 844 }, hasTouch: true });

const JOINT = demoTypedJoint({ coilA: "LV-C0001", coilB: "LV-C0003", laidA: "15", station: "4+20" });

async function jointsOnJob(page: import("@playwright/test").Page, jobCode: string): Promise<{ id: number; clientId: string }[]> {
  const r = await page.request.get("/api/v1/joints?limit=200");
  expect(r.status()).toBe(200);
  const body = (await r.json()) as { joints: { id: number; clientId: string; job: { code: string } }[] };
  return body.joints.filter((j) => j.job.code === jobCode);
}

function tinyPng(): Buffer {
  const png = new PNG({ width: 8, height: 8 });
  png.data.fill(180);
  return PNG.sync.write(png);
}

test("a fuser records a joint with typed values and sees the verdict", async ({ page }) => {
  await new SignInPage(page).signInAs("fuser");
  const trench = new TrenchPage(page);
  await trench.goto();
  await trench.chooseSetup({ job: "WO-24117 · Fenwick Lane main renewal", machine: "FM-201 · Hydraulic butt-fusion machine, 2–8 in IPS", heater: "HP-31" });
  await expect(page.getByText("Procedure from the job:")).toContainText("LVG-BF-01");
  await expect(page.getByRole("complementary", { name: "Safety" })).toContainText("Heater plates run near 200–230 °C");
  await trench.shot("1-setup");

  // The phase control keeps its start on the device: it runs on through a reload; ending
  // heat soak fills its duration and starts changeover at once. With no plan yet, the
  // control says once what it needs for the time limits.
  const phases = trench.phaseTimer();
  await expect(page.getByText("Choose job, machine and coils to get the time limits")).toHaveCount(1);
  await expect(page.getByText("No time limit in this procedure for this phase")).toHaveCount(0);
  await trench.phaseButton("Start heat soak").click();
  await expect(phases).toContainText("Heat soak running");
  await page.reload();
  await expect(trench.recordButton).toBeEnabled();
  await expect(phases).toContainText("Heat soak running");
  await page.waitForTimeout(1200);
  await trench.phaseButton("Heater out: start changeover").click();
  await expect(phases).toContainText("Changeover: heater out");
  await expect(trench.field("Heat soak time")).not.toHaveValue("");
  await expect(trench.durationMark("Heat soak time")).toHaveText("timed");

  // The draft is kept from the first keystroke: a reload keeps what was typed.
  await trench.coil("A", JOINT.coilA);
  await trench.field("Drag pressure measured").fill(JOINT.drag);
  await page.reload();
  await expect(trench.recordButton).toBeEnabled();
  await expect(page.getByLabel("Coil on side A")).toHaveValue(JOINT.coilA);
  await expect(trench.field("Drag pressure measured")).toHaveValue(JOINT.drag);

  // With coil A chosen the changeover (still running since the heater came out) counts
  // against its maximum, and passes it.
  await expect(phases).toContainText("Over the 8 s maximum", { timeout: 15_000 }); // F2620 maximum for this wall // from memory, unconfirmed
  await expect(phases).toHaveClass(/border-fail/);
  await trench.shot("2a-timer-over-limit");
  await phases.getByRole("button", { name: "Clear the phase times and start again" }).click();
  await phases.getByRole("button", { name: "Tap again to clear the phase times" }).click();
  await expect(trench.phaseButton("Start heat soak")).toBeVisible();
  await expect(trench.field("Heat soak time")).toHaveValue("");

  await trench.fillTypedJoint(JOINT);
  const plan = page.getByRole("region", { name: "Pressure plan" });
  await expect(plan).toContainText("psi");
  // The gauge window shown agrees with the formula worked out here (to the 1 psi shown).
  const shown = /Fusion gauge pressure(\d+)–(\d+) psi/.exec((await plan.textContent()) ?? "");
  expect(shown).not.toBeNull();
  expect(Math.abs(Number(shown![1]) - fusionGaugePsi(60))).toBeLessThanOrEqual(0.5 + 1e-6);
  expect(Math.abs(Number(shown![2]) - fusionGaugePsi(90))).toBeLessThanOrEqual(0.5 + 1e-6);
  await expect(page.getByText("typed", { exact: true }).first()).toBeVisible();
  await page.getByLabel(/Photos of the bead/).setInputFiles({ name: "bead.png", mimeType: "image/png", buffer: tinyPng() });
  await expect(page.getByRole("img", { name: "Bead photo 1" })).toBeVisible();
  await trench.shot("2-filled");

  const before = await jointsOnJob(page, "WO-24117");
  await trench.recordButton.click();
  await expect(trench.result()).toHaveText(/^Joint \d+ on WO-24117: Within limits$/);
  await expect(page.getByText("Checked by Beadline's server")).toBeVisible();
  await trench.shot("3-verdict");
  const after = await jointsOnJob(page, "WO-24117");
  expect(after.length).toBe(before.length + 1);

  // The joint page shows the values, the photo and the plan.
  await page.getByRole("link", { name: /^Open joint \d+$/ }).first().click();
  await expect(page.getByRole("heading", { level: 1 })).toHaveText(/^Joint \d+ on WO-24117$/);
  await expect(page.getByText("425 °F")).toBeVisible();
  await expect(page.getByRole("img", { name: /Bead photo 1/ })).toBeVisible();
  await expect(page.getByRole("heading", { name: "The plan it was checked against" })).toBeVisible();
  await trench.shot("4-joint-page");
});

test("each value is judged as it is typed, and one button runs the phases", async ({ page }) => {
  // The device's clock is Playwright's, so the phases take exact times without waiting;
  // vibrations are recorded instead of felt.
  await page.clock.install();
  await page.addInitScript(() => {
    const cues: string[] = [];
    (window as unknown as { __cues: string[] }).__cues = cues;
    Object.defineProperty(navigator, "vibrate", { configurable: true, value: (pattern: number[]) => (cues.push(JSON.stringify(pattern)), true) });
  });
  const cues = () => page.evaluate(() => (window as unknown as { __cues: string[] }).__cues);
  await new SignInPage(page).signInAs("fuser");
  const trench = new TrenchPage(page);
  await trench.goto();
  await trench.chooseSetup({ job: "WO-24117 · Fenwick Lane main renewal", machine: "FM-201 · Hydraulic butt-fusion machine, 2–8 in IPS", heater: "HP-31" });
  await trench.coil("A", JOINT.coilA);
  await trench.coil("B", JOINT.coilB);
  await trench.field("Drag pressure measured").fill(JOINT.drag);
  await expect(page.getByRole("region", { name: "Pressure plan" })).toBeVisible();

  // Live judgement beside the field, before anything is recorded.
  const heater = trench.field("Heater temperature measured at the face");
  await heater.fill("480");
  await expect(heater).toHaveAccessibleDescription(/Above the window \(400–450 °F\)/); // source: ASTM F2620 heater 400–450 °F (PPI "Melt Procedure" page)
  await trench.shot("7-heater-above-window");
  await heater.fill("425");
  await expect(heater).toHaveAccessibleDescription(/Inside 400–450 °F/); // source: ASTM F2620 heater 400–450 °F (PPI "Melt Procedure" page)
  await heater.fill("399");
  await expect(heater).toHaveAccessibleDescription(/Below the window \(400–450 °F\)/); // source: ASTM F2620 heater 400–450 °F (PPI "Melt Procedure" page)
  await expect(page.getByText("the server's verdict is the one kept")).toHaveCount(1);
  await expect(trench.result()).toHaveCount(0);

  // One button: heat soak 45 s, changeover 9 s (past the 8 s maximum), cooling 5 min.
  await page.clock.pauseAt(Date.now() + 60_000);
  const phases = trench.phaseTimer();
  await trench.phaseButton("Start heat soak").click();
  await expect(phases).toContainText("Heat soak running");
  await page.clock.runFor(45_000);
  await trench.phaseButton("Heater out: start changeover").click();
  await expect(phases).toContainText("Changeover: heater out");
  expect((await cues()).at(-1)).toBe("[200]");
  // A gloved double tap (a second tap at the same instant) does not end the changeover.
  await trench.phaseButton("Pressure reached: start cooling").click();
  await expect(phases).toContainText("Changeover: heater out");
  const countdown = page.getByTestId("changeover-countdown");
  await expect(countdown).toHaveText("8s left"); // F2620 maximum for this wall // from memory, unconfirmed
  await page.clock.runFor(3_000);
  await expect(countdown).toHaveText("5s left");
  await trench.shot("8-changeover-countdown");
  await page.clock.runFor(6_000);
  await expect(countdown).toHaveText("▲+1s over");
  expect((await cues()).at(-1)).toBe("[300,120,300,120,300]");
  await trench.phaseButton("Pressure reached: start cooling").click();
  await expect(phases).toContainText("Cooling under pressure");
  await page.clock.runFor(300_000);
  await trench.phaseButton("Cooling done").click();
  await expect(phases).toContainText("All three phases timed");
  expect((await cues()).at(-1)).toBe("[150,100,150]");

  await expect(trench.field("Heat soak time")).toHaveValue("45");
  await expect(trench.field("Changeover time")).toHaveValue("9");
  await expect(trench.field("Cooling time")).toHaveValue("300");
  for (const label of ["Heat soak time", "Changeover time", "Cooling time"]) await expect(trench.durationMark(label)).toHaveText("timed");
  await expect(trench.field("Changeover time")).toHaveAccessibleDescription(/Longer than the maximum \(8 s\)/); // from memory, unconfirmed: F2620 heater removal 8 s for this wall
  // 11 min per inch of wall × 0.216 in = 142.6 s → 2 min 23 s // from memory, unconfirmed (ASTM F2620 cooling rule)
  await expect(trench.field("Cooling time")).toHaveAccessibleDescription(/Meets the 2 min 23 s minimum/);
  await trench.shot("9-phases-done");

  // A time corrected by hand is marked typed and judged again.
  await trench.field("Changeover time").fill("6");
  await expect(trench.durationMark("Changeover time")).toHaveText("typed");
  await expect(trench.field("Changeover time")).toHaveAccessibleDescription(/Within the 8 s maximum/);
  await expect(trench.durationMark("Heat soak time")).toHaveText("timed");
});

test("a joint recorded with no signal waits on the device and arrives exactly once", async ({ page, context }) => {
  await new SignInPage(page).signInAs("fuser");
  const trench = new TrenchPage(page);
  await trench.goto();
  await trench.chooseSetup({ job: "WO-24117 · Fenwick Lane main renewal", machine: "FM-201 · Hydraulic butt-fusion machine, 2–8 in IPS", heater: "HP-31" });
  await trench.fillTypedJoint({ ...JOINT, coilA: "LV-C0002", station: "4+60" });
  await page.getByLabel(/Photos of the bead/).setInputFiles({ name: "bead-offline.png", mimeType: "image/png", buffer: tinyPng() });
  await expect(page.getByRole("img", { name: "Bead photo 1" })).toBeVisible();
  const before = await jointsOnJob(page, "WO-24117");

  await context.setOffline(true);
  await trench.recordButton.click();
  await expect(trench.result()).toHaveText("This joint: Within limits");
  await expect(page.getByText("It is waiting to be sent")).toBeVisible();
  await expect(trench.outboxStatus()).toContainText("No signal");
  await expect(trench.outboxStatus()).toContainText("1 joint is waiting to be sent");
  await expect(trench.outboxEntries().first()).toContainText("Waiting to send");
  await trench.shot("5-offline-waiting");
  const clientId = await page.evaluate(() => {
    const key = Object.keys(localStorage).find((k) => k.startsWith("beadline.trench.outbox."))!;
    const entries = JSON.parse(localStorage.getItem(key)!) as { clientId: string; state: string }[];
    return entries.find((e) => e.state === "waiting")!.clientId;
  });

  await context.setOffline(false);
  await expect(trench.outboxStatus()).toContainText("Nothing is waiting to be sent");
  await expect(trench.result()).toHaveText(/^Joint \d+ on WO-24117: Within limits$/);
  await expect(trench.outboxEntries().first()).toContainText(/Sent: joint \d+ on WO-24117/);
  await trench.shot("6-back-online-sent");

  const after = await jointsOnJob(page, "WO-24117");
  expect(after.length).toBe(before.length + 1);
  const arrived = after.filter((j) => j.clientId === clientId);
  expect(arrived).toHaveLength(1);
  // The photo kept on the device went up with it.
  const one = (await (await page.request.get(`/api/v1/joints/${arrived[0]!.id}`)).json()) as { joint: { photos: { contentType: string }[]; place: { station: string } } };
  expect(one.joint.photos.map((p) => p.contentType)).toEqual(["image/png"]);
  expect(one.joint.place.station).toBe("4+60");
  // A reload does not send it again.
  await page.reload();
  await expect(trench.recordButton).toBeEnabled();
  await page.waitForTimeout(1000);
  expect((await jointsOnJob(page, "WO-24117")).length).toBe(before.length + 1);
});

// Same idempotency key with another payload → refused, not answered with the first joint
// (IETF draft-ietf-httpapi-idempotency-key-header-07, "Error Handling"; Beadline answers 409).
test("a second tab recording the same draft with other values is told so, and its joint is kept and sent as a new one", async ({ page, context }) => {
  await new SignInPage(page).signInAs("fuser");
  const first = new TrenchPage(page);
  await first.goto();
  await first.chooseSetup({ job: "WO-24117 · Fenwick Lane main renewal", machine: "FM-201 · Hydraulic butt-fusion machine, 2–8 in IPS", heater: "HP-31" });
  await first.fillTypedJoint({ ...JOINT, station: "5+10" });

  // A second tab opens the Trench: it restores the same draft, with the same submission id.
  const page2 = await context.newPage();
  const second = new TrenchPage(page2);
  await second.goto();
  await expect(second.field("Station (place along the job)")).toHaveValue("5+10");
  const draftId = await page2.evaluate(() => {
    const key = Object.keys(localStorage).find((k) => k.startsWith("beadline.trench.draft."))!;
    return (JSON.parse(localStorage.getItem(key)!) as { values: { clientId: string } }).values.clientId;
  });

  // The first tab records it.
  await first.record();
  await expect(first.result()).toHaveText(/^Joint \d+ on WO-24117: Within limits$/);
  const jointNo = Number(/Joint (\d+)/.exec((await first.result().textContent()) ?? "")![1]);

  // The second tab changes two values and records under the used id: refused, in words.
  // 440 °F is still inside 400–450 °F (ASTM F2620 via the PPI "Melt Procedure" page).
  await second.field("Heater temperature measured at the face").fill("440");
  await second.field("Station (place along the job)").fill("5+30");
  await second.record();
  const notice = second.reusedIdNotice();
  await expect(notice).toBeVisible();
  await expect(notice.getByRole("alert")).toContainText(`already used for joint ${jointNo} on WO-24117 with other values (heater temperature, when the joint was made, station)`);
  await expect(notice.getByRole("list", { name: "Values that differ from the joint already recorded" })).toContainText(`Heater temperature: 425 °F recorded as joint ${jointNo} on WO-24117, 440 °F in this submission.`);
  await expect(notice).not.toContainText("Within limits"); // no verdict of the other joint shown as this one's
  await second.shot("7-reused-id-refused");
  // Both joints stay on the device: the first tab's sent one and this refused one.
  await expect(second.outboxEntries().filter({ hasText: `Sent: joint ${jointNo} on WO-24117` })).toHaveCount(1);
  await expect(second.outboxEntries().filter({ hasText: "Refused" })).toHaveCount(1);
  const joints = await jointsOnJob(page2, "WO-24117");
  expect(joints.filter((j) => j.clientId === draftId)).toHaveLength(1);
  const recorded = (await (await page2.request.get(`/api/v1/joints/${joints.find((j) => j.clientId === draftId)!.id}`)).json()) as { joint: { place: { station: string } } };
  expect(recorded.joint.place.station).toBe("5+10");

  // Sent as a new joint: a fresh submission id, the second tab's values.
  await notice.getByRole("button", { name: "Send as a new joint" }).click();
  await expect(second.result()).toHaveText(`Joint ${jointNo + 1} on WO-24117: Within limits`);
  const list = (await (await page2.request.get("/api/v1/joints?limit=200")).json()) as { joints: { id: number; clientId: string; jointNo: number; job: { code: string } }[] };
  const asNew = list.joints.filter((j) => j.job.code === "WO-24117" && j.jointNo === jointNo + 1);
  expect(asNew).toHaveLength(1);
  expect(asNew[0]!.clientId).not.toBe(draftId);
  const sent = (await (await page2.request.get(`/api/v1/joints/${asNew[0]!.id}`)).json()) as { joint: { place: { station: string } } };
  expect(sent.joint.place.station).toBe("5+30");
  await second.shot("8-sent-as-new");
  // The first tab still shows its own joint's verdict.
  await expect(first.result()).toHaveText(`Joint ${jointNo} on WO-24117: Within limits`);
});
