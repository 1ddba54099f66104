// The Trench screen on a phone-sized browser: the demo fuser (US customary units) records
// a joint with typed values and sees the verdict; then records one with no signal, which
// waits in the device's outbox and arrives exactly once when the signal is back.
//
// Values typed (US customary, the demo fuser's units) and why they are within limits:
// - heater 425 °F inside 400–450 °F // source: ASTM F2620 via the PPI "Melt Procedure" page (CONFIRMED)
// - fusion gauge = interfacial pressure × fusion area ÷ piston area + drag, with 75 psi
//   interfacial (mid of 60–90 psi), OD 2.375 in SDR 11 (t = OD/11), FM-201's 1006.5 mm²
//   // source: PPI generic butt-fusion procedure, gauge method (PPI TR-33, as reproduced in a pipe maker's manual §6.2.5)
// - bead 1/8 in over the 1/16 in minimum, changeover 6 s under 8 s, cooling 300 s over
//   11 min/in × 0.216 in ≈ 143 s // from memory, unconfirmed (ASTM F2620 tables)
import { PNG } from "pngjs";
import { expect, test } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";
import { TrenchPage, type TypedJoint } from "./pages/trench-page";

test.use({ viewport: { width: 390, height: 844 }, hasTouch: true });

const OD_IN = 60.33 / 25.4; // 2" IPS outside diameter 2.375 in (ASTM D2513 / ASME B36.10 IPS), 60.33 mm on the demo coil label
const PISTON_AREA_IN2 = 1006.5 / 25.4 ** 2;
const DRAG_PSI = 10;

function fusionGaugePsi(ifpPsi: number): number {
  const t = 0.216; // 2" IPS DR 11 minimum wall, in (ASTM F2897-23a Table 6)
  return (ifpPsi * Math.PI * (OD_IN - t) * t) / PISTON_AREA_IN2 + DRAG_PSI;
}

// LV-C0001 and LV-C0002 are already joined in the demo joints (the same two coils again
// are questioned, tests/e2e/trench-flow.spec.ts): these joints use LV-C0003 on side B.
const JOINT: TypedJoint = {
  coilA: "LV-C0001",
  coilB: "LV-C0003",
  laidA: "15",
  drag: String(DRAG_PSI),
  heaterTemperature: "425",
  fusionGauge: String(Math.round(fusionGaugePsi(75))),
  bead: "0.125",
  heatSoak: "45",
  changeover: "6",
  cooling: "300",
  ambient: "50",
  shelter: "Windbreak",
  station: "4+20",
};

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

  // The phase timer keeps its start on the device: it runs on through a reload, fills the
  // duration when ended, and turns to the fail colour past a maximum.
  const heatSoak = page.getByRole("timer", { name: "Heat soak timer" });
  await heatSoak.getByRole("button", { name: "Start heat soak" }).click();
  await expect(heatSoak).toContainText("Running");
  await page.reload();
  await expect(trench.recordButton).toBeEnabled();
  await expect(heatSoak).toContainText("Running");
  await page.waitForTimeout(1200);
  await heatSoak.getByRole("button", { name: "End heat soak" }).click();
  await expect(heatSoak).toContainText("Ended at");
  await expect(trench.field("Heat soak time")).not.toHaveValue("");
  await expect(page.getByText("timed", { exact: true })).toBeVisible();

  // The draft is kept from the first keystroke: a reload keeps what was typed.
  await trench.coil("A", JOINT.coilA);
  await trench.field("Drag pressure measured").fill(JOINT.drag);
  await page.reload();
  await expect(trench.recordButton).toBeEnabled();
  await expect(page.getByLabel("Coil on side A")).toHaveValue(JOINT.coilA);
  await expect(trench.field("Drag pressure measured")).toHaveValue(JOINT.drag);

  const changeover = page.getByRole("timer", { name: "Changeover timer" });
  await changeover.getByRole("button", { name: "Start changeover" }).click();
  await expect(changeover).toContainText("left of the 8 s maximum");
  await expect(changeover).toContainText("Over the 8 s maximum", { timeout: 15_000 }); // F2620 maximum for this wall // from memory, unconfirmed
  await expect(changeover).toHaveClass(/border-fail/);
  await trench.shot("2a-timer-over-limit");
  await changeover.getByRole("button", { name: "Clear changeover timer" }).click();

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
