// Page objects: the Coils screens (list, receive form, coil page), the label print page
// and the Trace screen — found by role and label, as a person finds them.
import { expect, type Locator, type Page } from "@playwright/test";

export class ReceiveCoilPage {
  constructor(private readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.getByRole("navigation", { name: "Screens" }).getByRole("link", { name: "Coils", exact: true }).click();
    await expect(this.page.getByRole("heading", { name: "Coils", level: 1 })).toBeVisible();
    await this.page.getByRole("link", { name: "Receive a coil" }).click();
    await expect(this.page.getByRole("heading", { name: "Receive a coil" })).toBeVisible();
  }

  field(label: string | RegExp): Locator {
    return this.page.getByLabel(label);
  }

  async typeTraceCode(code: string): Promise<void> {
    await this.field("ASTM F2897 code (16 characters)").pressSequentially(code);
  }

  /** Correct the code in one go (select all, type the new one), as a clerk fixing a typo. */
  async replaceTraceCode(code: string): Promise<void> {
    await this.field("ASTM F2897 code (16 characters)").fill(code);
  }

  filledNote(): Locator {
    return this.page.getByRole("status").filter({ hasText: "Filled from the code" });
  }

  disagreement(): Locator {
    return this.page.getByRole("alert").filter({ hasText: "The code disagrees with the typed fields" });
  }

  async receive(): Promise<void> {
    await this.page.getByRole("button", { name: "Receive coil" }).click();
  }
}

export class CoilPage {
  constructor(private readonly page: Page) {}

  heading(code: string): Locator {
    return this.page.getByRole("heading", { name: `Coil ${code}`, level: 1 });
  }

  async printLabel(): Promise<void> {
    await this.page.getByRole("link", { name: "Print label" }).click();
    await expect(this.page.getByRole("heading", { name: "Coil labels" })).toBeVisible();
  }

  /** Downloads the label file (the button records the download, then fetches the file); the file's suggested name. */
  async downloadLabel(format: "PNG" | "SVG"): Promise<string> {
    const download = this.page.waitForEvent("download");
    await this.page.getByRole("button", { name: `Download label as ${format}` }).click();
    return (await download).suggestedFilename();
  }
}

export class LabelSheetPage {
  constructor(private readonly page: Page) {}

  label(name: string): Locator {
    return this.page.getByLabel(`Label ${name}`, { exact: true });
  }

  async print(): Promise<void> {
    await this.page.getByRole("button", { name: /^Print (label|\d+ labels)$/ }).click();
  }
}

export class TracePage {
  constructor(private readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.getByRole("navigation", { name: "Screens" }).getByRole("link", { name: "Trace", exact: true }).click();
    await expect(this.page.getByRole("heading", { name: "Trace", level: 1 })).toBeVisible();
  }

  async traceByCode(code: string): Promise<void> {
    await this.page.getByLabel("Or a traceability code, coil id or label address").fill(code);
    await this.page.getByRole("button", { name: "Trace lot" }).click();
  }

  async traceByLot(manufacturer: string, lot: string): Promise<void> {
    await this.page.getByLabel("Pipe maker").fill(manufacturer);
    await this.page.getByLabel("Lot", { exact: true }).fill(lot);
    await this.page.getByLabel("Or a traceability code, coil id or label address").fill("");
    await this.page.getByRole("button", { name: "Trace lot" }).click();
  }

  /** The "Found by" cell of a coil's row in the coils of the lot (the one cell of the row that speaks of a lot). */
  foundBy(coilCode: string): Locator {
    const row = this.page.getByRole("table", { name: "Coils of the lot" }).getByRole("row").filter({ has: this.page.getByRole("link", { name: coilCode, exact: true }) });
    return row.getByRole("cell").filter({ hasText: /\blot\b/i });
  }

  result(): Locator {
    return this.page.getByRole("heading", { level: 2, name: /^(No lot matches|.+ lot .+: \d+ coils?)/ });
  }
}
