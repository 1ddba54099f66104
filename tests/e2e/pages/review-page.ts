// Page objects: the inspector's review screen, and the admin's mailbox.
import { expect, type Locator, type Page } from "@playwright/test";

export class ReviewPage {
  constructor(private readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.goto("/review");
    await expect(this.page.getByRole("heading", { name: "Review queue" })).toBeVisible();
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

  async filterBy(label: "Job" | "Fuser" | "Machine" | "Finding", option: string): Promise<void> {
    await this.page.getByLabel(label, { exact: true }).selectOption({ label: option });
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
