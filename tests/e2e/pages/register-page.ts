// Page object: the Register screen (filter form, count line, grid, export buttons), found
// by role and label as a clerk finds them.
import { expect, type Download, type Locator, type Page } from "@playwright/test";

export class RegisterPage {
  constructor(private readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.getByRole("navigation", { name: "Screens" }).getByRole("link", { name: "Register", exact: true }).click();
    await expect(this.page.getByRole("heading", { name: "Register", level: 1 })).toBeVisible();
  }

  grid(): Locator {
    return this.page.getByRole("region", { name: "Joint register" });
  }

  /** Data rows the grid has drawn (the header row excluded). */
  dataRows(): Locator {
    return this.grid().locator('[role="row"][row-index]');
  }

  count(): Locator {
    return this.page.getByTestId("register-count");
  }

  field(label: string | RegExp): Locator {
    return this.page.getByRole("search", { name: "Filter the register" }).getByLabel(label);
  }

  async applyFilter(): Promise<void> {
    await this.page.getByRole("button", { name: "Apply filter" }).click();
  }

  columnHeader(name: string | RegExp): Locator {
    return this.grid().getByRole("columnheader", { name });
  }

  /** Opens the Register with a filter already in its address (a bookmarked view). */
  async openView(query: string): Promise<void> {
    await this.page.goto(`/register?${query}`);
    await expect(this.page.getByRole("heading", { name: "Register", level: 1 })).toBeVisible();
  }

  exportButton(kind: "xlsx" | "csv"): Locator {
    return this.page.getByRole("button", { name: kind === "xlsx" ? "Export spreadsheet (.xlsx)" : "Export CSV" });
  }

  /** The export's words while it runs and when it ends (an aria-live status). */
  exportStatus(): Locator {
    return this.page.getByTestId("export-status");
  }

  exportProgress(): Locator {
    return this.page.getByRole("progressbar", { name: "Export progress" });
  }

  stopExportButton(): Locator {
    return this.page.getByRole("button", { name: "Stop export" });
  }

  async export(kind: "xlsx" | "csv"): Promise<Download> {
    const downloading = this.page.waitForEvent("download");
    await this.page.getByRole("button", { name: kind === "xlsx" ? "Export spreadsheet (.xlsx)" : "Export CSV" }).click();
    const download = await downloading;
    await expect(this.page.getByTestId("export-status")).toContainText("Downloaded");
    return download;
  }
}
