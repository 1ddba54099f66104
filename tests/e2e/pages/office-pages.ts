// Page objects for the office screens: Procedures, Equipment, Crew and Today.
import { expect, type Locator, type Page } from "@playwright/test";

export class ProceduresPage {
  constructor(private readonly page: Page) {}

  async addProcedure({ code, name, basedOn }: { code: string; name: string; basedOn: string }): Promise<void> {
    await this.page.goto("/procedures");
    const form = this.page.getByRole("form", { name: "Add a procedure" });
    await form.getByLabel("Procedure code").fill(code);
    await form.getByLabel("Procedure name").fill(name);
    await form.getByLabel("Based on").selectOption({ label: basedOn });
    await form.getByRole("button", { name: "Add procedure" }).click();
    await expect(form.getByRole("status")).toContainText(`Procedure ${code} added with version 1`);
  }

  async open(code: string): Promise<void> {
    await this.page.goto("/procedures");
    await this.page.getByRole("link", { name: code, exact: true }).click();
    await expect(this.page.getByRole("heading", { level: 1 })).toContainText(code);
  }

  async publishTightened(code: string, values: Record<string, string>, note: string, choices: Record<string, string> = {}): Promise<void> {
    const form = this.page.getByRole("form", { name: `Publish a tightened version of ${code}` });
    for (const [label, value] of Object.entries(values)) await form.getByLabel(label).fill(value);
    for (const [label, option] of Object.entries(choices)) await form.getByLabel(label).selectOption({ label: option });
    await form.getByLabel("Note on the change").fill(note);
    await form.getByRole("button", { name: "Publish new version" }).click();
  }

  windows(versionNo: number): Locator {
    return this.page.getByRole("table", { name: `Windows of version ${versionNo}` });
  }
}

export class EquipmentPage {
  constructor(private readonly page: Page) {}

  async goto(): Promise<void> {
    await this.page.goto("/equipment");
    await expect(this.page.getByRole("heading", { name: "Equipment", level: 1 })).toBeVisible();
  }

  async addMachine({ assetTag, description, pistonArea }: { assetTag: string; description: string; pistonArea: string }): Promise<void> {
    const form = this.page.getByRole("form", { name: "Add a machine" });
    await form.getByLabel("Asset tag").fill(assetTag);
    await form.getByLabel("Description").fill(description);
    await form.getByLabel("Total effective piston area").fill(pistonArea);
    await form.getByRole("button", { name: "Add machine" }).click();
    await expect(form.getByRole("status")).toContainText(`Machine ${assetTag} added`);
  }

  async addHeater({ assetTag, description }: { assetTag: string; description: string }): Promise<void> {
    const form = this.page.getByRole("form", { name: "Add a heater plate" });
    await form.getByLabel("Asset tag").fill(assetTag);
    await form.getByLabel("Description").fill(description);
    await form.getByLabel("Check interval").fill("1");
    await form.getByRole("button", { name: "Add heater plate" }).click();
    await expect(form.getByRole("status")).toContainText(`Heater plate ${assetTag} added`);
  }

  row(name: string): Locator {
    return this.page.getByRole("row").filter({ has: this.page.getByRole("link", { name, exact: true }) });
  }

  async recordCheck(assetTag: string, { procedure, instrument, faceA, faceB }: { procedure: string; instrument: string; faceA: string[]; faceB: string[] }): Promise<Locator> {
    await this.page.getByRole("link", { name: assetTag, exact: true }).click();
    const form = this.page.getByRole("form", { name: `Record a surface-temperature check of ${assetTag}` });
    await form.getByLabel("Procedure whose heater window applies").selectOption({ label: procedure });
    await form.getByLabel("Instrument").fill(instrument);
    for (const [i, v] of faceA.entries()) await form.getByLabel(`Face A point ${i + 1}`).fill(v);
    for (const [i, v] of faceB.entries()) await form.getByLabel(`Face B point ${i + 1}`).fill(v);
    await form.getByRole("button", { name: "Record heater check" }).click();
    return form.getByRole("status");
  }
}

export class CrewPage {
  constructor(private readonly page: Page) {}

  async addPerson({ name, email, password, roles }: { name: string; email: string; password: string; roles: string[] }): Promise<void> {
    await this.page.goto("/crew");
    const form = this.page.getByRole("form", { name: "Add a person" });
    await form.getByLabel("Name").fill(name);
    await form.getByLabel("E-mail").fill(email);
    await form.getByLabel("First password").fill(password);
    for (const r of roles) await form.getByLabel(r, { exact: true }).check();
    await form.getByRole("button", { name: "Add person" }).click();
    await expect(form.getByRole("status")).toContainText(`${name} added`);
  }

  async openPerson(name: string): Promise<void> {
    await this.page.goto("/crew");
    await this.page.getByRole("table").getByRole("link", { name, exact: true }).click();
    await expect(this.page.getByRole("heading", { name, level: 1 })).toBeVisible();
  }

  async recordQualification(name: string, { procedure, date, method, result, evaluator }: { procedure: string; date: string; method: string; result: string; evaluator: string }): Promise<Locator> {
    const form = this.page.getByRole("form", { name: `Record a qualification of ${name}` });
    await form.getByLabel("Procedure").selectOption({ label: procedure });
    await form.getByLabel("Qualification date").fill(date);
    await form.getByLabel(method).check();
    await form.getByLabel("Specimen joint's result").fill(result);
    await form.getByLabel("Evaluator").fill(evaluator);
    await form.getByRole("button", { name: "Record qualification" }).click();
    return form.getByRole("status");
  }

  /** The Organisation section: the organisation's time zone. */
  async setTimeZone(zone: string): Promise<Locator> {
    await this.page.goto("/crew");
    const form = this.page.getByRole("form", { name: "Organisation time zone" });
    await form.getByLabel("Time zone").selectOption(zone);
    await form.getByRole("button", { name: "Save time zone" }).click();
    return form.getByRole("status");
  }
}

export class TodayPage {
  constructor(private readonly page: Page) {}

  async goto(): Promise<void> {
    await this.page.goto("/");
    await expect(this.page.getByRole("heading", { name: "Today", level: 1 })).toBeVisible();
  }

  panel(title: string): Locator {
    return this.page.getByRole("region", { name: title });
  }
}
