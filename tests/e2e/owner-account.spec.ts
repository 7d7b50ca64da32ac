// Owner pages found wanting on a walk through them as a customer: a refusal that outlived the mistake it
// was about (the password form), the piece's four actions at 1280 px (the fourth alone on a row), and
// signing out without a word that it happened. Invented data.
import { expect, test } from "@playwright/test";
import { ACCOUNTS, PASSWORD, signIn } from "./helpers";

test("changing the password: the server's refusal goes at the next press, also when the form's own checks stop that one", async ({ page }) => {
  await signIn(page, ACCOUNTS.otherOwner);
  await page.goto("/account/password");
  await page.getByLabel("Current password").fill("not the password at all");
  await page.getByLabel("New password", { exact: true }).fill("a brand new sentence");
  await page.getByLabel("New password, again").fill("a brand new sentence");
  await page.getByRole("button", { name: "Change password" }).click();
  const refusal = page.getByText("Couldn't change the password");
  await expect(refusal).toBeVisible();

  // The current password is right now; the repeat is mistyped, which the form itself catches.
  await page.getByLabel("Current password").fill(PASSWORD);
  await page.getByLabel("New password, again").fill("a brand new sentencX");
  await page.getByRole("button", { name: "Change password" }).click();
  await expect(page.getByText("The two passwords differ.")).toBeVisible();
  await expect(refusal).toHaveCount(0);
  await expect(page.getByText("That isn't your current password.")).toHaveCount(0);
});

test("a piece's four actions sit two by two at 1280 px, one under another at 375 px", async ({ browser }) => {
  for (const [width, height, columns] of [[1280, 900, 2], [375, 812, 1]] as const) {
    const context = await browser.newContext({ viewport: { width, height } });
    const page = await context.newPage();
    await signIn(page, ACCOUNTS.owner);
    await page.getByRole("link", { name: /Walnut river dining table/ }).click();
    const actions = page.locator('[data-slot="piece-actions"]').locator(":scope > *");
    await expect(actions).toHaveCount(4);
    const boxes = await actions.evaluateAll((els) => els.map((e) => e.getBoundingClientRect()).map((r) => ({ x: Math.round(r.x), y: Math.round(r.y) })));
    const rows = new Set(boxes.map((b) => b.y));
    const cols = new Set(boxes.map((b) => b.x));
    expect(cols.size, `${width} px: columns`).toBe(columns);
    expect(rows.size, `${width} px: rows`).toBe(4 / columns);
    await context.close();
  }
});

test("signing out says so where one signs in again", async ({ page }) => {
  await signIn(page, ACCOUNTS.otherOwner);
  await page.getByRole("button", { name: "Sign out" }).click();
  await expect(page).toHaveURL(/\/sign-in\?signed-out=1$/);
  await expect(page.getByText("You are signed out on this device.")).toBeVisible();
  await page.goto("/pieces");
  await expect(page).toHaveURL(/\/sign-in\?next=%2Fpieces/);
});
