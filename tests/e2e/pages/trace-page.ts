// Page object: the Trace screen as a clerk answers a recall with it — Lot → ground (the
// search, the joints table, the exports) and Joint → origins (the search and the joint's
// page), found by role and label.
import { expect, type Download, type Locator, type Page } from "@playwright/test";

export class LotTracePage {
  constructor(private readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.getByRole("navigation", { name: "Screens" }).getByRole("link", { name: "Trace", exact: true }).click();
    await expect(this.page.getByRole("heading", { name: "Trace", level: 1 })).toBeVisible();
  }

  async traceLot(manufacturer: string, lot: string): Promise<void> {
    await this.page.getByLabel("Pipe maker").fill(manufacturer);
    await this.page.getByLabel("Lot", { exact: true }).fill(lot);
    await this.page.getByRole("button", { name: "Trace lot" }).click();
  }

  result(): Locator {
    return this.page.getByRole("heading", { level: 2, name: /^(No lot matches|.+ lot .+: \d+ coils?)/ });
  }

  jointsTable(): Locator {
    return this.page.getByRole("table", { name: "Joints made with the lot" });
  }

  /** Rows of the joints table holding the text. */
  jointRows(text: string | RegExp): Locator {
    return this.jointsTable().getByRole("row").filter({ hasText: text });
  }

  async download(name: "Export to spreadsheet (.xlsx)" | "Export joints as CSV"): Promise<Download> {
    const downloading = this.page.waitForEvent("download");
    await this.page.getByRole("link", { name }).click();
    return downloading;
  }

  jointField(): Locator {
    return this.page.getByLabel("Joint: job code and number, joint tag address, or joint id");
  }

  async traceJoint(text: string): Promise<void> {
    await this.jointField().fill(text);
    await this.page.getByRole("button", { name: "Trace joint" }).click();
  }

  /** A fact of the joint's origins page ("Review", "In the ground", "Remakes"). */
  fact(term: string): Locator {
    return this.page.locator("dt", { hasText: new RegExp(`^${term}$`) }).locator("xpath=following-sibling::dd[1]");
  }
}
