// The Trench screen without signal, on a phone-sized browser: after one signed-in visit the
// service worker keeps the screen; with the network off a reload still shows it with its data
// and says how old the data is; a joint recorded then waits on the device, sign-out warns
// about it, and it arrives exactly once when the signal is back. Another page says plainly
// that it needs a connection. Signing out empties the caches and the stored data.
//
// Values typed: tests/e2e/pages/demo-joint.ts, each with its published source.
import { expect, test, type Page } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";
import { TrenchPage } from "./pages/trench-page";
import { demoTypedJoint } from "./pages/demo-joint";

test.use({ viewport: { width: 390, height: 844 }, hasTouch: true, serviceWorkers: "allow" });

const JOINT = demoTypedJoint({ coilA: "LV-C0001", coilB: "LV-C0002", laidA: "12", station: "7+15" });

async function jointsWithClientId(page: Page, clientId: string): Promise<{ id: number; clientId: string }[]> {
  const r = await page.request.get("/api/v1/joints?limit=200");
  expect(r.status()).toBe(200);
  const body = (await r.json()) as { joints: { id: number; clientId: string }[] };
  return body.joints.filter((j) => j.clientId === clientId);
}

const freshness = (page: Page) => page.getByRole("status", { name: "Data on this screen" });

test("the Trench screen reloads without signal with its data, and a joint recorded then arrives once", async ({ page, context }) => {
  test.setTimeout(120_000);
  await new SignInPage(page).signInAs("fuser");
  const trench = new TrenchPage(page);
  await trench.goto();
  // The service worker has saved the screen for use without signal, and says so.
  await expect(freshness(page)).toContainText("Kept on this device for use without signal.", { timeout: 30_000 });
  await expect(freshness(page)).toHaveText(/^Data from \d{2}:\d{2} UTC, just now\./);
  // What the worker keeps: the build's files, the offline page and the Trench page; no API answer.
  const kept = await page.evaluate(async () => {
    const out: Record<string, string[]> = {};
    for (const name of await caches.keys()) out[name] = (await (await caches.open(name)).keys()).map((r) => new URL(r.url).pathname);
    return out;
  });
  expect(kept["beadline-trench"]).toEqual(["/trench"]);
  const everyPath = Object.values(kept).flat();
  expect(everyPath.filter((p) => p.startsWith("/api/"))).toEqual([]);
  expect(everyPath.filter((p) => !p.startsWith("/_next/static/") && p !== "/trench" && p !== "/~offline")).toEqual([]);

  await context.setOffline(true);
  await page.reload();
  await expect(page.getByRole("heading", { name: "Trench: record a joint" })).toBeVisible();
  await expect(trench.recordButton).toBeEnabled();
  // The time shown is the server's reading of the data, in UTC, with its age and the signal.
  await expect(freshness(page)).toHaveText(/^Data from \d{2}:\d{2} UTC, (just now|\d+ min ago); no signal\./);
  await trench.shot("offline-1-reloaded");

  // The data came with the saved page: jobs, machines, heater plates, the job's procedure, coils.
  await trench.chooseSetup({ job: "WO-24117 · Fenwick Lane main renewal", machine: "FM-201 · Hydraulic butt-fusion machine, 2–8 in IPS", heater: "HP-31" });
  await expect(page.getByText("Procedure from the job:")).toContainText("LVG-BF-01");
  await trench.fillTypedJoint(JOINT);
  await trench.record();
  await expect(trench.result()).toHaveText("This joint: Within limits");
  await expect(trench.outboxStatus()).toContainText("1 joint is waiting to be sent");
  const clientId = await page.evaluate(() => {
    const key = Object.keys(localStorage).find((k) => k.startsWith("beadline.trench.outbox."))!;
    const entries = JSON.parse(localStorage.getItem(key)!) as { clientId: string; state: string }[];
    return entries.find((e) => e.state === "waiting")!.clientId;
  });

  // Sign-out warns about the joint that has not reached Beadline; the person stays.
  await page.getByRole("button", { name: "Sign out" }).click();
  const warning = page.getByRole("dialog", { name: "1 joint has not reached Beadline yet" });
  await expect(warning).toBeVisible();
  await expect(warning).toContainText("LV-C0001 + LV-C0002");
  await trench.shot("offline-2-sign-out-warning");
  await warning.getByRole("button", { name: "Stay signed in" }).click();
  await expect(warning).toBeHidden();
  // Signing out anyway without signal cannot reach the server: nothing is cleared.
  await page.getByRole("button", { name: "Sign out" }).click();
  await warning.getByRole("button", { name: "Sign out anyway" }).click();
  await expect(page.getByRole("alert").filter({ hasText: "No signal: signing out needs a connection. Nothing was cleared." })).toBeVisible();
  expect(await page.evaluate(async () => (await caches.keys()).includes("beadline-trench"))).toBe(true);

  // A page that is not kept for offline use says so, and leads back to the Trench screen.
  await page.goto("/");
  await expect(page.getByRole("heading", { name: "No signal: this page needs a connection." })).toBeVisible();
  await expect(page.getByText("The Trench screen works offline")).toBeVisible();
  await trench.shot("offline-3-needs-connection");
  await page.getByRole("link", { name: "Open the Trench screen" }).click();
  await expect(trench.recordButton).toBeEnabled();
  await expect(trench.outboxStatus()).toContainText("1 joint is waiting to be sent");

  // Signal back: the joint goes, once.
  await context.setOffline(false);
  await expect(trench.outboxStatus()).toContainText("Nothing is waiting to be sent", { timeout: 30_000 });
  await expect(freshness(page)).toHaveText(/^Data from \d{2}:\d{2} UTC, just now\./);
  expect(await jointsWithClientId(page, clientId)).toHaveLength(1);
  await page.reload();
  await expect(trench.recordButton).toBeEnabled();
  await page.waitForTimeout(1000);
  expect(await jointsWithClientId(page, clientId)).toHaveLength(1);

  // Sign-out with nothing unsent: no warning, and the device keeps nothing of this person.
  await new SignInPage(page).signOut();
  const left = await page.evaluate(async () => ({
    caches: await caches.keys(),
    stored: Object.keys(localStorage).filter((k) => k.startsWith("beadline.")),
  }));
  expect(left).toEqual({ caches: [], stored: [] });
  // The worker was unregistered: once the page is loaded again nothing controls it.
  await page.reload();
  await expect(page.getByRole("button", { name: "Sign in" })).toBeVisible();
  expect(await page.evaluate(async () => ({ workers: (await navigator.serviceWorker.getRegistrations()).length, caches: await caches.keys() }))).toEqual({ workers: 0, caches: [] });
});

test("sign-out keeps a joint that has not been sent, and it goes when the same fuser signs in again", async ({ page, context }) => {
  test.setTimeout(120_000);
  await new SignInPage(page).signInAs("fuser");
  const trench = new TrenchPage(page);
  await trench.goto();
  await expect(freshness(page)).toContainText("Kept on this device for use without signal.", { timeout: 30_000 });
  await trench.chooseSetup({ job: "WO-24117 · Fenwick Lane main renewal", machine: "FM-201 · Hydraulic butt-fusion machine, 2–8 in IPS", heater: "HP-31" });
  await trench.fillTypedJoint({ ...JOINT, station: "7+40" });
  await context.setOffline(true);
  await trench.record();
  await expect(trench.outboxStatus()).toContainText("1 joint is waiting to be sent");
  const clientId = await page.evaluate(() => {
    const key = Object.keys(localStorage).find((k) => k.startsWith("beadline.trench.outbox."))!;
    return (JSON.parse(localStorage.getItem(key)!) as { clientId: string }[])[0]!.clientId;
  });
  // Signal back, but the joint cannot go yet (its route fails as on a dropped line): sign out now.
  await context.route("**/api/v1/joints", (route) => route.abort("internetdisconnected"));
  await context.setOffline(false);
  await page.getByRole("button", { name: "Sign out" }).click();
  const warning = page.getByRole("dialog", { name: "1 joint has not reached Beadline yet" });
  await warning.getByRole("button", { name: "Sign out anyway" }).click();
  await expect(page.getByRole("button", { name: "Sign in" })).toBeVisible();
  const left = await page.evaluate(async () => ({
    caches: await caches.keys(),
    outbox: Object.keys(localStorage).filter((k) => k.startsWith("beadline.trench.outbox.")).map((k) => (JSON.parse(localStorage.getItem(k)!) as { clientId: string }[]).map((e) => e.clientId)),
    other: Object.keys(localStorage).filter((k) => k.startsWith("beadline.") && !k.startsWith("beadline.trench.outbox.")),
  }));
  expect(left).toEqual({ caches: [], outbox: [[clientId]], other: [] });

  await context.unroute("**/api/v1/joints");
  await new SignInPage(page).signInAs("fuser");
  await trench.goto();
  await expect(trench.outboxStatus()).toContainText("Nothing is waiting to be sent", { timeout: 30_000 });
  expect(await jointsWithClientId(page, clientId)).toHaveLength(1);
});
