// Page object: the sign-in page, used by every browser test.
import { expect, type Page } from "@playwright/test";

export const DEMO_PASSWORD = "beadline-demo-2026";
export const DEMO_ACCOUNTS = {
  fuser: "fuser@larkmoor-gas.example",
  inspector: "inspector@larkmoor-gas.example",
  clerk: "clerk@larkmoor-gas.example",
  admin: "admin@larkmoor-gas.example",
} as const;

export class SignInPage {
  constructor(private readonly page: Page) {}

  async signIn(email: string, password = DEMO_PASSWORD): Promise<void> {
    await this.page.goto("/sign-in");
    await this.page.getByLabel("E-mail").fill(email);
    await this.page.getByLabel("Password").fill(password);
    await this.page.getByRole("button", { name: "Sign in" }).click();
    await expect(this.page.getByRole("button", { name: "Sign out" })).toBeVisible();
  }

  async signInAs(role: keyof typeof DEMO_ACCOUNTS): Promise<void> {
    await this.signIn(DEMO_ACCOUNTS[role]);
  }

  async signOut(): Promise<void> {
    await this.page.getByRole("button", { name: "Sign out" }).click();
    await expect(this.page.getByRole("button", { name: "Sign in" })).toBeVisible();
  }
}
