// An owner's photos on a 375 px phone when some can't be taken: a file that isn't an image on a new claim
// (refused for good: no retry, no broken picture, the notice says so), more photos than a sent claim has
// room for (said before any upload, and still said once the claim is full), and a care-log photo that is
// not an image (said as it is picked, and a picked photo can be taken off again). Invented data.
import { expect, test, type Browser, type BrowserContext, type Page } from "@playwright/test";
import sharp from "sharp";
import { ACCOUNTS, signIn } from "./helpers";

const PHONE = { viewport: { width: 375, height: 812 }, isMobile: true, hasTouch: true };
const PIECE = "Cherry writing desk"; // owned by the demo owner Jonah

async function phone(browser: Browser): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext(PHONE);
  const page = await context.newPage();
  await signIn(page, ACCOUNTS.otherOwner);
  return { context, page };
}

const jpeg = (seed: number) => sharp({ create: { width: 320, height: 240, channels: 3, background: { r: 120 + seed * 5, g: 90, b: 60 } } }).jpeg().toBuffer();
const notAPicture = { name: "receipt-scan.jpg", mimeType: "image/jpeg", buffer: Buffer.from("just some words, not a picture\n".repeat(10)) };

async function pieceId(page: Page): Promise<string> {
  await page.goto("/claims");
  const href = await page.locator('a[href*="/claim/new"]', { hasText: PIECE }).getAttribute("href");
  return href!.split("/")[2]!;
}

test("a claim with a file that isn't a picture: sent with the photo that is, the other refused for good and said so; the claim's room is kept", async ({ browser }) => {
  test.setTimeout(120_000);
  const { context, page } = await phone(browser);
  const id = await pieceId(page);
  await page.goto(`/pieces/${id}/claim/new`);
  await page.getByLabel("Kind of damage").selectOption("other");
  await page.getByLabel("Describe it").fill(`A pale mark on the desk top, photo check (e2e ${Date.now()}, invented).`);
  for (const q of ["hot near the damage", "spill, cleaner", "knocked, dropped", "used or stored outdoors", "direct sun"]) {
    await page.getByRole("group", { name: new RegExp(q) }).getByText("No", { exact: true }).click();
  }
  await page.getByLabel("Add photos").setInputFiles([{ name: "desk.jpg", mimeType: "image/jpeg", buffer: await jpeg(1) }, notAPicture]);
  const photos = page.getByRole("list", { name: "Photos" });
  // The file the browser can't draw shows a plain square, not a broken-image sign with its name spilling out.
  await expect(photos.getByTestId("no-preview")).toHaveCount(1);
  await page.getByRole("button", { name: "Send the claim" }).click();

  await expect(page.getByText("One file couldn't be added: see why below.")).toBeVisible();
  const refused = photos.getByRole("listitem").filter({ hasText: notAPicture.name });
  await expect(refused).toContainText("isn't an image we can read");
  // Sending it again can't help: no retry for it, and no "upload the remaining photos".
  await expect(refused.getByRole("button", { name: `Retry ${notAPicture.name}` })).toHaveCount(0);
  await expect(page.getByRole("button", { name: "Upload the remaining photos" })).toHaveCount(0);
  await expect(page.getByText(/still to upload/)).toHaveCount(0);
  // The refused file takes none of the claim's room.
  await expect(page.getByRole("button", { name: "Add photos — 1 added, up to 10" })).toBeVisible();
  await page.getByRole("link", { name: "Go to the claim" }).click();
  await expect(page).toHaveURL(/\/claims\/[0-9a-f-]{36}$/);

  // The claim holds one photo; ten more are picked: nine fit, and the page says so before sending any.
  await expect(page.getByRole("button", { name: "Add photos — 1 added, up to 10" })).toBeVisible();
  const ten = await Promise.all(Array.from({ length: 10 }, async (_, i) => ({ name: `more-${i + 1}.jpg`, mimeType: "image/jpeg", buffer: await jpeg(i + 2) })));
  await page.getByLabel("Add photos").setInputFiles(ten);
  const full = page.getByRole("button", { name: "10 photos added — the most a claim takes" });
  await expect(full).toBeVisible({ timeout: 60_000 });
  await expect(full).toBeDisabled();
  // Once full, why the last one was left out is still on screen (it went away with the picker).
  await expect(page.getByText("A claim holds at most 10 photos; only the first 9 were added.")).toBeVisible();
  await context.close();
});

test("a care-log photo that isn't a picture is refused as it is picked, and a picked photo can be taken off before logging", async ({ browser }) => {
  const { context, page } = await phone(browser);
  const id = await pieceId(page);
  await page.goto(`/pieces/${id}`);
  await page.getByRole("link", { name: "Log care" }).click();
  await expect(page.getByRole("heading", { name: "I did this" })).toBeVisible();
  const input = page.getByLabel("Photo (optional)");
  await input.setInputFiles({ name: "notes.txt", mimeType: "text/plain", buffer: Buffer.from("not a photo") });
  await expect(page.getByRole("alert").filter({ hasText: "notes.txt isn't a JPEG, PNG or WebP photo." })).toBeVisible();
  await expect(page.getByText("Take or choose a photo (JPEG, PNG or WebP, up to 15 MB)")).toBeVisible();

  await input.setInputFiles({ name: "waxed-top.jpg", mimeType: "image/jpeg", buffer: await jpeg(9) });
  await expect(page.getByText("notes.txt isn't a JPEG")).toHaveCount(0);
  await expect(page.getByText("waxed-top.jpg")).toBeVisible();
  await page.getByRole("button", { name: "Remove the photo" }).click();
  await expect(page.getByText("Take or choose a photo (JPEG, PNG or WebP, up to 15 MB)")).toBeVisible();
  await expect(page.getByRole("button", { name: "Remove the photo" })).toHaveCount(0);

  await page.getByLabel("What was done (optional)").fill("Wiped the top, no photo after all (e2e, invented).");
  await page.getByRole("button", { name: "Log it" }).click();
  await expect(page.getByText("Logged — thank you.")).toBeVisible();
  await context.close();
});
