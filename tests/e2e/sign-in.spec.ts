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

// source: OWASP Unvalidated Redirects and Forwards Cheat Sheet; WHATWG URL Standard (a
// backslash is a slash in http URLs, tabs are removed, "//" starts a host). The two forms the
// attack run used: after a correct sign-in the browser must still be on Beadline.
for (const hostile of ["/%5C127.0.0.1:3199/phish", "/%09/127.0.0.1:3199/phish", "//127.0.0.1:3199/phish", "https://127.0.0.1:3199/phish"]) {
  test(`signing in with next=${hostile} stays on Beadline`, async ({ page, baseURL }) => {
    await page.goto(`/sign-in?next=${hostile}`);
    await page.getByLabel("E-mail").fill("clerk@larkmoor-gas.example");
    await page.getByLabel("Password").fill("beadline-demo-2026");
    await page.getByRole("button", { name: "Sign in" }).click();
    await expect(page.getByRole("button", { name: "Sign out" })).toBeVisible();
    expect(new URL(page.url()).origin).toBe(new URL(baseURL!).origin);
    expect(new URL(page.url()).pathname).toBe("/");
    await new SignInPage(page).signOut();
  });
}

test("a same-origin next is followed after signing in", async ({ page }) => {
  await page.goto("/register");
  await expect(page).toHaveURL(/\/sign-in\?next=%2Fregister/);
  await page.getByLabel("E-mail").fill("clerk@larkmoor-gas.example");
  await page.getByLabel("Password").fill("beadline-demo-2026");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).toHaveURL(/\/register$/);
  await new SignInPage(page).signOut();
});
