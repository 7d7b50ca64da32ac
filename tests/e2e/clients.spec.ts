// The front desk finds a client, opens their page, corrects the phone and reads what happened with
// them — at 1280 px as staff, with axe on the list and the client page.
import AxeBuilder from "@axe-core/playwright";
import { expect, test } from "@playwright/test";
import { ACCOUNTS, signIn } from "./helpers";

test.use({ viewport: { width: 1280, height: 900 } });

test("staff find a client, edit the phone and see it on the timeline", async ({ page }) => {
  await signIn(page, ACCOUNTS.staff);
  await page.goto("/studio/clients");
  await expect(page.getByRole("heading", { name: "Clients", level: 1 })).toBeVisible();
  // The demo's owners are the studio's clients from the start.
  await expect(page.getByRole("link", { name: "Jonah Reyes" })).toBeVisible();
  const listAxe = await new AxeBuilder({ page }).analyze();
  expect(listAxe.violations, JSON.stringify(listAxe.violations, null, 2)).toEqual([]);

  await page.getByLabel("Search clients").fill("reyes");
  await expect(page).toHaveURL(/q=reyes/);
  await expect(page.getByText(/^1–1 of 1 client$/)).toBeVisible();
  await page.getByRole("link", { name: "Jonah Reyes" }).click();
  await expect(page.getByRole("heading", { name: "Jonah Reyes", level: 1 })).toBeVisible();

  // A number typed the way it is said; shown back in the studio's (US) national format.
  const form = page.getByRole("form", { name: "Contact details" });
  await form.getByLabel("Phone").fill("503.555.0147");
  await form.getByRole("button", { name: "Save contact details" }).click();
  await expect(page.getByText("Contact details saved.")).toBeVisible();
  await expect(form.getByLabel("Phone")).toHaveValue("(503) 555-0147");
  await expect(page.getByRole("heading", { level: 1 }).locator("..").getByText(/\(503\) 555-0147/)).toBeVisible();

  // An unreadable number is refused on the field, and nothing is lost.
  await form.getByLabel("Phone").fill("12");
  await form.getByRole("button", { name: "Save contact details" }).click();
  await expect(form.getByText(/isn't a phone number we can read/)).toBeVisible();
  await page.reload();
  await expect(page.getByRole("form", { name: "Contact details" }).getByLabel("Phone")).toHaveValue("(503) 555-0147");

  const timeline = page.getByRole("list", { name: "Timeline, newest first" });
  await expect(timeline.getByText(/Client record changed by Teo Lindqvist — phone/)).toBeVisible();
  // What happened before, from the studio's records: deliveries and registrations of their pieces.
  await expect(timeline.getByText(/^Delivered “/).first()).toBeVisible();
  await expect(timeline.getByText(/^Registered “.*” in Grainward$/).first()).toBeVisible();

  // Search by the new number's digits finds them.
  await page.goto("/studio/clients?q=5550147");
  await expect(page.getByRole("link", { name: "Jonah Reyes" })).toBeVisible();

  await page.goto(page.url().replace(/\/studio\/clients.*/, "/studio/clients"));
  await page.getByRole("link", { name: "Jonah Reyes" }).click();
  await expect(timeline.first()).toBeVisible();
  const pageAxe = await new AxeBuilder({ page }).analyze();
  expect(pageAxe.violations, JSON.stringify(pageAxe.violations, null, 2)).toEqual([]);
});
