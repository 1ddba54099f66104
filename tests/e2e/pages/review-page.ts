// Page objects: the inspector's review screen, and the admin's mailbox.
import { expect, type Locator, type Page } from "@playwright/test";

export class ReviewPage {
  constructor(private readonly page: Page) {}

  async open(search = ""): Promise<void> {
    await this.page.goto(`/review${search}`);
    await expect(this.page.getByRole("heading", { name: "Review queue" })).toBeVisible();
  }

  /** The region that shows the opened joint (or what became of a linked one). */
  detail(): Locator {
    return this.page.getByRole("region", { name: "Selected joint" });
  }

  queue(): Locator {
    return this.page.getByRole("list", { name: "Joints waiting for review" });
  }

  item(label: string): Locator {
    return this.queue().getByRole("article", { name: label, exact: true });
  }

  /** The "N joints waiting, M out of limits" line. */
  async waitingCount(): Promise<number> {
    const text = (await this.page.getByRole("status").filter({ hasText: "waiting" }).first().textContent()) ?? "";
    const match = /(\d+)\s+joints?\s+waiting/.exec(text);
    if (!match) throw new Error(`no count in "${text}"`);
    return Number(match[1]);
  }

  async openJoint(label: string): Promise<Locator> {
    await this.page.getByRole("button", { name: `Open ${label}`, exact: true }).click();
    const detail = this.page.getByRole("region", { name: "Selected joint" });
    await expect(detail.getByRole("heading", { name: label, exact: true })).toBeVisible();
    return detail;
  }

  async decide(detail: Locator, decision: "Accept the joint" | "Cut it out (the fuser must remake it)", note: string): Promise<void> {
    await detail.getByLabel(decision).check();
    await detail.getByLabel("Note").fill(note);
    await detail.getByRole("button", { name: "Record decision" }).click();
  }

  /** The "N joints waiting, M out of limits (showing K)" line. */
  async shownCount(): Promise<number> {
    const text = (await this.page.getByRole("status").filter({ hasText: "waiting" }).first().textContent()) ?? "";
    const match = /showing (\d+)/.exec(text);
    return match ? Number(match[1]) : this.waitingCount();
  }

  /** Picks a filter choice by its words; the count the screen shows beside it, "(12)", is ignored. */
  async filterBy(label: "Job" | "Fuser" | "Machine" | "Finding" | "Outcome" | "Waiting more than" | "Order", option: string): Promise<void> {
    // On a phone the filters are folded behind a "Filters" button.
    const unfold = this.page.getByRole("button", { name: /^Filters/ });
    if (await unfold.isVisible()) await unfold.click();
    const select = this.page.getByLabel(label, { exact: true });
    const escaped = option.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
    const value = await select.locator("option").filter({ hasText: new RegExp(`^${escaped}( \\(\\d+\\))?$`) }).first().getAttribute("value");
    await select.selectOption(value ?? option);
  }

  /** The count shown beside a filter choice. */
  async choiceCount(label: "Job" | "Fuser" | "Machine" | "Finding" | "Outcome", option: string): Promise<number> {
    const text = (await this.page.getByLabel(label, { exact: true }).locator("option").filter({ hasText: option }).first().textContent()) ?? "";
    const match = /\((\d+)\)$/.exec(text.trim());
    if (!match) throw new Error(`no count in "${text}"`);
    return Number(match[1]);
  }

  async showMore(): Promise<void> {
    await this.page.getByRole("button", { name: /^Show more joints/ }).click();
  }

  async tick(label: string): Promise<void> {
    await this.page.getByLabel(`Tick ${label} to accept`, { exact: true }).check();
  }

  /** Accepts the ticked joints with one note; returns the answer's region. */
  async acceptTicked(note: string): Promise<Locator> {
    const batch = this.page.getByRole("region", { name: "Accept joints within limits together" });
    await batch.getByLabel("Note for every joint accepted").fill(note);
    await batch.getByRole("button", { name: /^Accept \d+ ticked$/ }).click();
    return batch.getByRole("status", { name: "Batch result" });
  }

  /** True when the page does not scroll sideways (the document is no wider than the window). */
  async fitsWidth(): Promise<{ scrollWidth: number; clientWidth: number }> {
    return this.page.evaluate(() => ({ scrollWidth: document.documentElement.scrollWidth, clientWidth: document.documentElement.clientWidth }));
  }
}

export class MailboxPage {
  constructor(private readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.goto("/mailbox");
    await expect(this.page.getByRole("heading", { name: "Mailbox", level: 1 })).toBeVisible();
  }

  received(): Locator {
    return this.page.getByRole("list", { name: "Received messages" });
  }
}
