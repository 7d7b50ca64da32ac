// The plan template form in a real browser: an admin adds a plan (a missing price is answered on its
// field and what was typed stays), then changes it; the change is saved as new terms. At 375 px the
// page has no axe violations. The new plan is not offered to owners, so other specs never meet it.
import AxeBuilder from "@axe-core/playwright";
import { expect, test } from "@playwright/test";
import { ACCOUNTS, signInTo } from "./helpers";

test("an admin adds a care plan, then changes its terms", async ({ page }) => {
  await page.setViewportSize({ width: 1280, height: 900 });
  await signInTo(page, ACCOUNTS.admin, "/studio/settings/plans");
  const name = `Edge keeping ${Date.now().toString(36)} (invented)`;

  const add = page.getByRole("form", { name: "New care plan" });
  await add.getByLabel("Name").fill(name);
  await add.getByLabel("Re-oil", { exact: true }).check();
  await add.getByLabel("Crack or gap").fill("12");
  await add.getByLabel("Hardwax oil").check();
  await add.getByLabel("Offered to owners").uncheck();
  await add.getByRole("button", { name: "Add the plan" }).click();
  // No price: the field says so, and nothing typed is lost.
  await expect(add.getByText("A price like 120 or 120.00.")).toBeVisible();
  await expect(add.getByLabel("Name")).toHaveValue(name);
  await expect(add.getByLabel("Crack or gap")).toHaveValue("12");

  await add.getByLabel(/^Price/).fill("99.50");
  await add.getByLabel("Discount on paid repairs (%)").fill("10");
  await add.getByRole("button", { name: "Add the plan" }).click();
  const item = page.getByRole("listitem").filter({ hasText: name });
  // Terms are named by the day they were saved, never by a version number.
  await expect(item.getByText(/· terms as of \d{1,2} [A-Z][a-z]+ \d{4}/)).toBeVisible();
  await expect(item.getByText("These terms replaced earlier ones", { exact: false })).toHaveCount(0);
  await expect(item.getByText("10 % off paid repairs", { exact: false })).toBeVisible();

  await item.getByText("Change this plan").click();
  const edit = page.getByRole("form", { name: `Change ${name}` });
  await expect(edit.getByLabel(/^Price/)).toHaveValue("99.50");
  await expect(edit.getByLabel("Crack or gap")).toHaveValue("12");
  await expect(edit.getByLabel("Hardwax oil")).toBeChecked();
  await edit.getByLabel("Discount on paid repairs (%)").fill("150");
  await edit.getByRole("button", { name: "Save as a new version" }).click();
  await expect(edit.getByText("The discount: a whole number from 0 to 100.")).toBeVisible();
  await edit.getByLabel("Discount on paid repairs (%)").fill("20");
  await edit.getByLabel(/^Price/).fill("120");
  await edit.getByRole("button", { name: "Save as a new version" }).click();

  const changed = page.getByRole("listitem").filter({ hasText: name });
  await expect(changed.getByText("These terms replaced earlier ones", { exact: false })).toBeVisible();
  await expect(changed.getByText(/version \d/)).toHaveCount(0);
  await expect(changed.getByText("20 % off paid repairs", { exact: false })).toBeVisible();
  await expect(page.getByRole("listitem").filter({ hasText: name })).toHaveCount(1);

  await page.setViewportSize({ width: 375, height: 812 });
  await page.reload();
  const axe = await new AxeBuilder({ page }).analyze();
  expect(axe.violations, JSON.stringify(axe.violations, null, 2)).toEqual([]);
  await page.screenshot({ path: "test-results/plans-templates-375.png", fullPage: true });
});
