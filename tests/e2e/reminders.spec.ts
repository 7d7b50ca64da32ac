// Care reminders in the browser: the staff view, and RFC 8058 one-click unsubscribe over real HTTP with
// no cookies (then back on through the page, so other specs see the demo owner as seeded).
import Database from "better-sqlite3";
import { expect, test } from "@playwright/test";
import { ACCOUNTS, APP_URL, DATABASE_FILE, signIn } from "./helpers";
import { oneClickUnsubscribeUrl, preferencesUrl } from "../../lib/reminders/tokens";

function ownerId(email: string): string {
  const db = new Database(DATABASE_FILE, { readonly: true, fileMustExist: true });
  try {
    return (db.prepare("SELECT id FROM users WHERE email = ?").get(email) as { id: string }).id;
  } finally {
    db.close();
  }
}
// The tokens module builds links from APP_URL; the e2e server's is helpers' APP_URL.
const onServer = (url: string) => url.replace(/^https?:\/\/[^/]+/, "");

test("staff see upcoming reminders and the ledger, filter them, and pause and resume a piece", async ({ page }) => {
  await signIn(page, ACCOUNTS.staff);
  const nav = page.getByRole("navigation", { name: "Main" });
  await nav.locator("summary", { hasText: "More" }).click();
  await nav.getByRole("link", { name: "Reminders", exact: true }).click();
  await expect(page.getByRole("heading", { name: "Care reminders" })).toBeVisible();
  await expect(page.getByRole("tab", { name: "Next 30 days" })).toHaveAttribute("aria-selected", "true");
  await page.getByRole("tab", { name: "Sent, failed and skipped" }).click();
  await expect(page.getByLabel("Status")).toBeVisible();
  await page.getByLabel("Status").selectOption("sent");
  await expect(page.getByRole("table").or(page.getByText("No reminders match."))).toBeVisible();
  const pause = page.getByRole("button", { name: "Pause reminders" }).first();
  if (await pause.isVisible()) {
    await pause.click();
    await expect(page.getByText("Reminders paused for this piece.")).toBeVisible();
    await page.getByRole("button", { name: "Resume reminders" }).first().click();
    await expect(page.getByText("Reminders resumed for this piece.")).toBeVisible();
  }
});

test("at 375 px each reminder is a card: nothing scrolls sideways and its pause button is in view", async ({ page }) => {
  await page.setViewportSize({ width: 375, height: 812 });
  await signIn(page, ACCOUNTS.staff);
  await page.goto("/studio/reminders");
  await page.getByRole("tab", { name: "Sent, failed and skipped" }).click();
  const table = page.getByRole("table");
  await expect(table.getByText(/^Updated /).first()).toBeVisible();
  const box = table.locator("xpath=..");
  const { scroll, client } = await box.evaluate((el) => ({ scroll: el.scrollWidth, client: el.clientWidth }));
  expect(scroll, "the reminders scroll sideways").toBeLessThanOrEqual(client);
  const pause = table.getByRole("button", { name: "Pause reminders" }).first();
  const at = (await pause.boundingBox())!;
  expect(at.x + at.width).toBeLessThanOrEqual(375);
});

test("the ledger writes a sent reminder's time once, in its time column, with its zone", async ({ page }) => {
  await signIn(page, ACCOUNTS.staff);
  await page.goto("/studio/reminders");
  await page.getByRole("tab", { name: "Sent, failed and skipped" }).click();
  await page.getByLabel("Status").selectOption("sent");
  // The demo seed's history (db/seed/aftercare-history.ts) holds sent reminders.
  const rows = page.getByRole("table").getByRole("row").filter({ has: page.getByText("Sent", { exact: true }) });
  await expect(rows.first()).toBeVisible();
  for (const row of (await rows.all()).slice(0, 3)) {
    const time = (await row.getByRole("cell").first().innerText()).trim();
    // "3 December 2026, 09:04 PST": the studio's zone (America/Los_Angeles in the demo) named.
    expect(time).toMatch(/\d{2}:\d{2} P[SD]T$/);
    const text = await row.innerText();
    expect(text.split(time).length - 1, `"${time}" appears once in: ${text}`).toBe(1);
  }
});

test("owners are refused the staff reminders API", async ({ page }) => {
  await signIn(page, ACCOUNTS.owner);
  expect((await page.request.get("/api/reminders?view=ledger")).status()).toBe(403);
  // The role is checked before the query is read (lib/http/route.ts): an owner learns nothing about
  // which views exist.
  expect((await page.request.get("/api/reminders?view=nonsense")).status()).toBe(403);
});

test("one-click unsubscribe: POST without cookies → 200, no redirect; the page turns reminders back on", async ({ playwright, page }) => {
  const id = ownerId(ACCOUNTS.otherOwner);
  const api = await playwright.request.newContext({ baseURL: APP_URL });
  try {
    const url = onServer(oneClickUnsubscribeUrl(id));
    expect((await api.post(url, { form: { "List-Unsubscribe": "Nope" } })).status()).toBe(400);
    expect((await api.post(url.replace(/\.[^.]+$/, ".forgedtoken000"), { form: { "List-Unsubscribe": "One-Click" } })).status()).toBe(404);
    const res = await api.post(url, { form: { "List-Unsubscribe": "One-Click" }, maxRedirects: 0, headers: { origin: "https://mail.example" } });
    expect(res.status()).toBe(200);
    expect(await res.text()).toMatch(/Unsubscribed/);
  } finally {
    await api.dispose();
  }
  await page.goto(onServer(preferencesUrl(id)));
  await expect(page.getByText(/Care reminders for .* are off/)).toBeVisible();
  await page.getByRole("button", { name: "Turn care reminders back on" }).click();
  await expect(page.getByText("Reminders are back on")).toBeVisible();
  await expect(page.getByRole("button", { name: "Unsubscribe from care reminders" })).toBeVisible();
  await page.goto("/unsubscribe?t=not-a-real-token-at-all");
  await expect(page.getByText("This link doesn't work")).toBeVisible();
});
