// The claim form's room section at 375 px: the largest temperature change within a day, in the unit the
// owner picks (their preference by default), checked in the browser with the unit named. Nothing is
// sent (the form is refused before any request), so the demo data is unchanged. All data is invented.
import { expect, test } from "@playwright/test";
import { ACCOUNTS, signInTo } from "./helpers";

const PHONE = { viewport: { width: 375, height: 812 }, deviceScaleFactor: 2, isMobile: true, hasTouch: true };
const PIECE = "Charred cedar garden bench"; // owned by the demo Holloway household

test("owner gives the daily temperature change in °F or °C; out of range is refused naming the unit", async ({ browser }) => {
  const context = await browser.newContext(PHONE);
  const page = await context.newPage();
  await signInTo(page, ACCOUNTS.owner, "/claims");
  await page.getByRole("link", { name: new RegExp(PIECE) }).click();
  await expect(page.getByRole("heading", { name: "Report damage" })).toBeVisible();

  // One of the two units is chosen from the start (the owner's preference).
  const f = page.getByRole("radio", { name: "°F" });
  const c = page.getByRole("radio", { name: "°C" });
  expect((await f.isChecked()) !== (await c.isChecked())).toBe(true);

  await f.check();
  const changeF = page.getByLabel("Largest temperature change within one day, °F (optional)");
  await expect(changeF).toBeVisible();
  await expect(page.getByLabel("Driest: temp. (°F)")).toBeVisible();
  await changeF.fill("80");
  await page.getByRole("button", { name: "Send the claim" }).click();
  await expect(page.getByText("Enter a change within a day between 0 and 72 °F.")).toBeVisible();
  const box = await changeF.boundingBox();
  expect(box!.x + box!.width).toBeLessThanOrEqual(375);

  await c.check();
  const changeC = page.getByLabel("Largest temperature change within one day, °C (optional)");
  await changeC.fill("41");
  await page.getByRole("button", { name: "Send the claim" }).click();
  await expect(page.getByText("Enter a change within a day between 0 and 40 °C.")).toBeVisible();
  await changeC.fill("3");
  await expect(page.getByText(/Enter a change within a day/)).toHaveCount(0);
  await context.close();
});

test("the claim form's back link returns where the owner came from: the piece, or the claims list", async ({ browser }) => {
  const context = await browser.newContext(PHONE);
  const page = await context.newPage();
  await signInTo(page, ACCOUNTS.owner, "/claims");
  await page.getByRole("link", { name: new RegExp(PIECE) }).click();
  await expect(page.getByRole("heading", { name: "Report damage" })).toBeVisible();
  await expect(page.getByRole("link", { name: "← My claims" })).toHaveAttribute("href", "/claims");
  const pieceId = new URL(page.url()).pathname.split("/")[2]!;

  // From the piece's own page, "Report damage" leads to a form whose back link names the piece and goes to it.
  await page.goto(`/pieces/${pieceId}`);
  await page.getByRole("link", { name: "Report damage" }).click();
  await expect(page.getByRole("heading", { name: "Report damage" })).toBeVisible();
  await expect(page.getByRole("link", { name: "← My claims" })).toHaveCount(0);
  await page.getByRole("link", { name: `← ${PIECE}` }).click();
  await expect(page).toHaveURL(new RegExp(`/pieces/${pieceId}$`));
  await context.close();
});
