// Each demo role signs in and sees its own navigation (screens per domain/roles SCREENS).
import { expect, test } from "@playwright/test";
import { SignInPage } from "./pages/sign-in-page";

const EXPECTED: Record<string, { sees: string[]; doesNotSee: string[] }> = {
  fuser: { sees: ["Today", "Trench", "Procedures"], doesNotSee: ["Register", "Review", "Crew", "Coils"] },
  inspector: { sees: ["Today", "Register", "Review", "Trace", "Insights"], doesNotSee: ["Trench", "Crew", "Coils"] },
  clerk: { sees: ["Today", "Register", "Coils", "Trace"], doesNotSee: ["Trench", "Review", "Crew"] },
  admin: { sees: ["Today", "Register", "Coils", "Trace", "Jobs", "Crew", "Equipment", "Procedures", "Insights"], doesNotSee: ["Trench", "Review"] },
};

for (const [role, { sees, doesNotSee }] of Object.entries(EXPECTED)) {
  test(`${role} signs in and sees the ${role} navigation`, async ({ page }) => {
    await new SignInPage(page).signInAs(role as "fuser");
    const nav = page.getByRole("navigation", { name: "Screens" });
    for (const label of sees) await expect(nav.getByRole("link", { name: label, exact: true })).toBeVisible();
    for (const label of doesNotSee) await expect(nav.getByRole("link", { name: label, exact: true })).toHaveCount(0);
    await page.screenshot({ path: `tests/e2e/artifacts/sign-in-${role}.png`, fullPage: true });
    await new SignInPage(page).signOut();
  });
}

test("a wrong password gets one generic message and no session", async ({ page }) => {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill("fuser@larkmoor-gas.example");
  await page.getByLabel("Password").fill("not-the-password-at-all");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByRole("status")).toContainText("do not match an active account");
  await page.goto("/");
  await expect(page).toHaveURL(/\/sign-in/);
});
