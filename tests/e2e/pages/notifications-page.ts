// Page object: the Notifications screen every signed-in person has (their own mail).
import { expect, type Locator, type Page } from "@playwright/test";

export class NotificationsPage {
  constructor(private readonly page: Page) {}

  async open(): Promise<void> {
    await this.page.goto("/notifications");
    await expect(this.page.getByRole("heading", { name: "Notifications", level: 1 })).toBeVisible();
  }

  /** The mail made for me, newest first. */
  mail(): Locator {
    return this.page.getByRole("list", { name: "Mail to you, newest first" });
  }

  /** One mail by its subject. */
  message(subject: string): Locator {
    return this.mail().getByRole("listitem").filter({ hasText: subject });
  }

  /** Opens a mail and gives back its text. */
  async read(subject: string): Promise<Locator> {
    const item = this.message(subject);
    await item.getByText(subject).click();
    return item;
  }

  grouping(): Locator {
    return this.page.getByRole("group", { name: "Alert mail for me" });
  }
}
