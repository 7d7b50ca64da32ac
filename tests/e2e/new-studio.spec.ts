// A stranger starts a studio at /start from the landing page (the e2e server runs with
// STUDIO_SIGNUP=open): creates an account through the sign-up flow, confirms it from the mail at the
// sink, comes back to /start, and starts the studio with the time zone guessed from the browser.
// The overview opens with the set-up checklist; then every studio page in the header and in the
// checklist is opened at 1280 px while the studio is empty: no error page, no 4xx/5xx, no console
// error, words on each page, no empty table and no chart without bars. Last, the same account starts a second studio and works in it.
// All names invented.
import { expect, test, type Page } from "@playwright/test";
import { extractLinks, waitForMail } from "../support/mail";
import { SINK_URL } from "./helpers";

test.use({
  viewport: { width: 1280, height: 900 },
  timezoneId: "Pacific/Auckland",
});

const stamp = Date.now().toString(36);
const email = `founder-${stamp}@new-studio.example`;
const studioName = `Kettle Creek Woodworks ${stamp} (invented)`;

/** Starts a studio from the /start form and waits for its overview. */
async function startStudio(page: Page, name: string, currency: string, units: string) {
  await page.getByLabel("Studio name").fill(name);
  await page.getByLabel("Currency").selectOption(currency);
  await page.getByLabel("Measurements").selectOption(units);
  await page.getByRole("button", { name: "Start the studio" }).click();
  await expect(page).toHaveURL(/\/studio$/);
  await expect(page.getByRole("heading", { level: 1, name })).toBeVisible();
}

test("a new account starts a studio at /start; every studio page works while it is empty; a second studio only adds", async ({ page }) => {
  test.setTimeout(180_000);
  const problems: string[] = [];
  page.on("console", (m) => {
    if (m.type() === "error") problems.push(`console on ${page.url()}: ${m.text()}`);
  });
  page.on("pageerror", (e) => problems.push(`script error on ${page.url()}: ${e.message}`));

  await page.goto("/");
  await page.getByRole("link", { name: "Start a studio" }).click();
  await expect(page).toHaveURL(/\/start$/);
  await page.getByRole("link", { name: "Create an account" }).click();
  await expect(page).toHaveURL(/\/sign-up\?next=%2Fstart/);
  // The sign-up speaks to someone starting a studio, not to an owner with a drawer card.
  await expect(page.getByText(/as the studio's admin/)).toBeVisible();
  await expect(page.getByText(/For owners of a piece/)).toHaveCount(0);
  await page.getByLabel("Your name").fill("Ottilie Marsh (invented)");
  await page.getByLabel("Email").fill(email);
  await page.getByLabel("Password").fill("a sentence for a password");
  await page.getByRole("button", { name: "Create account" }).click();
  await expect(page).toHaveURL(/\/verify-email\/sent/);

  const mail = await waitForMail({
    to: email,
    subject: /confirm/i,
    sinkUrl: SINK_URL,
  });
  await page.goto(extractLinks(mail.text).find((l) => l.includes("/verify-email?"))!);
  await expect(page).toHaveURL(/\/start$/);

  // The time zone comes from the browser (this context's is Pacific/Auckland) and stays editable.
  await expect(page.getByLabel("Time zone")).toHaveValue("Pacific/Auckland");
  await expect(page.getByLabel("Time zone")).toBeEditable();
  await startStudio(page, studioName, "CAD", "imperial");

  const checklist = page.getByRole("region", {
    name: "Finish setting up your studio",
  });
  await expect(checklist.getByText("0 of 9 done.", { exact: false })).toBeVisible();
  // An empty studio's reminders panel says what it will show, not "0 of 0 owners … 0 of 0 reminders (—)".
  await expect(page.getByText(/^No care reminders sent since .+\. Owners get them before, on and after each care task's due date/)).toBeVisible();
  await expect(page.getByText(/0 of 0 owners reminded/)).toHaveCount(0);
  // Nor does any panel offer its figures as a table when all of them are 0 (components/overview/panel.tsx);
  // tests/e2e/overview.spec.ts opens one where the demo studio has claims.
  await expect(page.getByRole("region", { name: "Claims by state" })).toBeVisible();
  await expect(page.locator("main").getByText("Show as a table")).toHaveCount(0);
  const steps = ["Studio details", "Logo and colour", "Warranty terms", "Finish catalog", "Reminder timing", "Visits and technicians' hours", "Team invitations", "Online payments", "E-mail sender"];
  for (const s of steps) await expect(checklist.getByRole("link", { name: s })).toBeVisible();
  const checklistPages = await checklist.getByRole("link").evaluateAll((links) => links.map((l) => l.getAttribute("href")!));

  // Every link of the header that stays in the studio area (those under "More" too), and the checklist's pages.
  const headerPages = await page.locator("header a[href^='/studio']").evaluateAll((links) => links.map((l) => new URL((l as HTMLAnchorElement).href).pathname));
  const pages = [...new Set([...headerPages, ...checklistPages])];
  expect(pages.length, pages.join(" ")).toBeGreaterThanOrEqual(14);

  for (const path of pages) {
    const res = await page.goto(path);
    expect(res?.status(), `${path} answers`).toBeLessThan(400);
    await expect(page, `${path} stays in the studio`).toHaveURL(new RegExp(`${path.replace(/\//g, "\\/")}(\\?.*)?$`));
    const main = page.locator("main");
    await expect(main.getByRole("heading").first(), `${path} has a heading`).toBeVisible();
    const text = await main.innerText();
    expect(text, `${path} shows the error page`).not.toMatch(/Something went wrong|We couldn.t find that page/);
    expect(text, `${path} shows a raw value`).not.toMatch(/\bundefined\b|\bNaN\b|\[object Object\]|Invalid Date/);
    expect(text.split(/\s+/).filter((w) => /[a-z]{2,}/i.test(w)).length, `${path} says what will appear there`).toBeGreaterThanOrEqual(12);
    // A table shown with no rows says nothing: an empty page says so in words instead.
    const emptyTables = await main.locator("table:visible").evaluateAll((tables) => tables.filter((t) => t.querySelectorAll("tbody tr").length === 0).length);
    expect(emptyTables, `${path} shows a table with no rows`).toBe(0);
    // Nor a chart of nothing but zeros (components/overview/bar-chart.tsx says so in words).
    await expect(main.locator(".recharts-surface"), `${path} draws an empty chart`).toHaveCount(0);
    await page.screenshot({ path: `test-results/new-studio/${path.slice(1).replace(/\//g, "-")}.png`, fullPage: true });
  }
  expect(problems, problems.join("\n")).toEqual([]);

  // Without technicians the visits calendar can only stay empty: both pages say why and lead to the team page.
  for (const [path, link] of [
    ["/studio/visits", "Invite a technician"],
    ["/studio/technicians", "Invite one on the Team page."],
  ] as const) {
    await page.goto(path);
    await expect(page.locator("main").getByText(/No technicians (yet|in this studio yet)/).first()).toBeVisible();
    await expect(page.locator("main").getByRole("link", { name: link })).toHaveAttribute("href", "/studio/team");
  }

  // The same account (STUDIO_SIGNUP=open) starts a second studio; it becomes the one it works in.
  await page.goto("/start");
  await expect(page.getByText(`You're already in ${studioName}`)).toBeVisible();
  await startStudio(page, `Second Bench ${stamp} (invented)`, "EUR", "metric");
  await expect(page.getByRole("region", { name: "Finish setting up your studio" }).getByText("0 of 9 done.")).toBeVisible();
  expect(problems, problems.join("\n")).toEqual([]);
});
