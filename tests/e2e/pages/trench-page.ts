// Page object: the Trench screen, found by labels and roles as a fuser would.
import { expect, type Locator, type Page } from "@playwright/test";

export type TypedJoint = {
  coilA: string;
  coilB: string;
  laidA: string;
  drag: string;
  heaterTemperature: string;
  fusionGauge: string;
  bead: string;
  heatSoak: string;
  changeover: string;
  cooling: string;
  ambient: string;
  shelter: string;
  station: string;
};

export class TrenchPage {
  constructor(readonly page: Page) {}

  async goto(): Promise<void> {
    await this.page.goto("/trench");
    await expect(this.page.getByRole("heading", { name: "Trench: record a joint" })).toBeVisible();
    // The draft is restored on the device after the page loads; wait for it.
    await expect(this.recordButton).toBeEnabled();
  }

  /**
   * Taps "Record joint" and, when the two coils were already joined (earlier tests share the
   * demo data), answers the same-coils question with "Record anyway".
   */
  async record(): Promise<void> {
    await this.recordButton.click();
    const question = this.sameCoilsQuestion();
    const asked = await question.waitFor({ state: "visible", timeout: 1500 }).then(
      () => true,
      () => false,
    );
    if (asked) await question.getByRole("button", { name: "Record anyway" }).click();
  }

  get recordButton(): Locator {
    return this.page.getByRole("button", { name: "Record joint", exact: true });
  }

  field(label: string): Locator {
    return this.page.getByRole("textbox", { name: label });
  }

  async chooseSetup({ job, machine, heater }: { job: string; machine: string; heater: string }): Promise<void> {
    await this.page.getByLabel("Job", { exact: true }).selectOption({ label: job });
    await this.page.getByLabel("Fusion machine").selectOption({ label: machine });
    const heaterSelect = this.page.getByLabel("Heater plate");
    const option = heaterSelect.locator("option", { hasText: heater });
    await heaterSelect.selectOption({ label: (await option.first().textContent())!.trim() });
  }

  async coil(side: "A" | "B", code: string): Promise<void> {
    await this.page.getByLabel(`Coil on side ${side}`).fill(code);
    await this.page.getByRole("button", { name: `Look up coil ${side}` }).click();
    await expect(this.page.getByText(new RegExp(`^${code} ·`))).toBeVisible();
  }

  async answer(question: string, yes: boolean): Promise<void> {
    await this.page.getByRole("group", { name: question }).getByLabel(yes ? "Yes" : "No").check();
  }

  async fillTypedJoint(j: TypedJoint): Promise<void> {
    await this.coil("A", j.coilA);
    await this.field("Pipe laid from coil A").fill(j.laidA);
    await this.coil("B", j.coilB);
    await this.field("Drag pressure measured").fill(j.drag);
    await expect(this.page.getByRole("region", { name: "Pressure plan" })).toBeVisible();
    await this.field("Heat soak time").fill(j.heatSoak);
    await this.field("Changeover time").fill(j.changeover);
    await this.field("Cooling time").fill(j.cooling);
    await this.field("Heater temperature measured at the face").fill(j.heaterTemperature);
    await this.field("Fusion gauge pressure").fill(j.fusionGauge);
    await this.field("Bead size").fill(j.bead);
    await this.field("Ambient temperature").fill(j.ambient);
    await this.page.getByLabel("Weather shelter").selectOption({ label: j.shelter });
    await this.answer("Were both ends faced complete and square?", true);
    await this.answer("Did the alignment check pass (high-low within limits)?", true);
    await this.answer("Is the bead a uniform double roll-back all round?", true);
    await this.answer("Is the V-groove between the beads not below the pipe surface?", true);
    await this.field("Station (place along the job)").fill(j.station);
  }

  /** The one phase control (heat soak → changeover → cooling). */
  phaseTimer(): Locator {
    return this.page.getByRole("timer", { name: "Phase timer" });
  }

  /** The phase control's one large button, by what it does now ("Start heat soak", "Heater out: start changeover", …). */
  phaseButton(name: string): Locator {
    return this.phaseTimer().getByRole("button", { name, exact: true });
  }

  /** The "timed"/"typed" mark beside a duration field's label. */
  durationMark(label: string): Locator {
    return this.page.locator("label").filter({ hasText: label }).locator("span").filter({ hasText: /^(timed|typed)$/ }).last();
  }

  /** A foldable step of the form, found by its summary's title ("1. Set up"). */
  section(title: string): Locator {
    return this.page.locator("details").filter({ has: this.page.locator("summary").filter({ hasText: title }) });
  }

  /** The summary line of a step: click it to fold or unfold the step. */
  summary(title: string): Locator {
    return this.page.locator("summary").filter({ hasText: title });
  }

  /** Folds every step (clicks a step's summary only when it is open). */
  async foldSteps(): Promise<void> {
    for (const title of ["1. Set up", "2. Pressure plan", "3. Phase timer", "4. Record the values"]) {
      const section = this.section(title);
      if (await section.evaluate((d) => (d as HTMLDetailsElement).open)) await this.summary(title).click();
      await expect(section).not.toHaveAttribute("open");
    }
  }

  safety(): Locator {
    return this.page.getByRole("complementary", { name: "Safety" });
  }

  /** The one-line plan pinned at the top while scrolling. */
  planAtAGlance(): Locator {
    return this.page.getByRole("region", { name: "Plan at a glance" });
  }

  sameCoilsQuestion(): Locator {
    return this.page.getByRole("alertdialog", { name: /These two coils were already joined/ });
  }

  result(): Locator {
    return this.page.getByRole("heading", { level: 2 }).filter({ hasText: /Within limits|Out of limits/ });
  }

  /** The notice of a joint refused because its submission id had already recorded another joint. */
  reusedIdNotice(): Locator {
    return this.page.getByRole("region", { name: "Not recorded: this draft's submission id was already used" });
  }

  outboxStatus(): Locator {
    return this.page.getByRole("region", { name: "Outbox on this device" }).getByRole("status");
  }

  outboxEntries(): Locator {
    return this.page.getByRole("list", { name: "Joints on this device" }).getByRole("listitem");
  }

  async shot(name: string, fullPage = true): Promise<void> {
    await this.page.screenshot({ path: `tests/e2e/artifacts/trench-${name}.png`, fullPage });
  }
}
