// Studio pages at 375 px that once scrolled sideways: the registry's card-print bar (its layout select
// was as wide as its longest option), the reminders board (the table's visually hidden "Actions" header
// escaped its scrolling box), the technicians' weekly hours (three time fields and a button in fixed
// columns). And the claims list, whose rows cut the piece's name and the photo count short with an
// ellipsis; the registry's pager, whose Next wrapped under Previous. Each page is read as seeded; nothing here changes the demo studio's data.
import { expect, test, type Page } from "@playwright/test";
import { ACCOUNTS, selectsCutShort, signIn } from "./helpers";

test.use({ viewport: { width: 375, height: 812 } });

async function noSideways(page: Page, label: string) {
  const { scroll, width } = await page.evaluate(() => ({ scroll: document.documentElement.scrollWidth, width: window.innerWidth }));
  expect(scroll, `${label}: the page scrolls sideways at 375 px`).toBeLessThanOrEqual(width);
}

test("registry, reminders, working hours and audit fit a 375 px phone", async ({ page }) => {
  await signIn(page, ACCOUNTS.admin);

  await page.goto("/studio/pieces");
  await expect(page.getByLabel("Print drawer cards on")).toBeVisible();
  await noSideways(page, "/studio/pieces");
  // Every layout's name reads whole in the select ('Letter sheets — 2 cards a sheet, with cut marks' was cut
  // to '…with cu'); what the chosen one prints is said under it.
  const bar = page.getByRole("region", { name: "Print drawer cards" });
  expect(await selectsCutShort(bar, "widest")).toEqual([]);
  await expect(bar.getByLabel("Print drawer cards on")).toHaveAccessibleDescription("Two cards on each Letter sheet, with cut marks.");
  await bar.getByLabel("Print drawer cards on").selectOption("a6");
  await expect(bar.getByText("One A6 card a page, for a card printer.")).toBeVisible();
  // A piece's card reads its next care in the same size as its other details, not larger.
  const card = page.getByRole("link", { name: /Annual clean and check · / }).first();
  const sizes = await Promise.all([card.getByText(/ · delivered /), card.getByText(/^Annual clean and check · /)].map((l) => l.evaluate((el) => getComputedStyle(el).fontSize)));
  expect(sizes[1]).toBe(sizes[0]);

  // Previous, the page and Next share one row (Next had wrapped under Previous beside the page-size select).
  await page.goto("/studio/pieces?pageSize=10");
  const pager = page.getByRole("navigation", { name: "Pages" });
  const tops = await Promise.all([pager.getByRole("button", { name: "Previous" }), pager.getByText(/^Page 1 of \d+$/), pager.getByRole("button", { name: "Next" })].map(async (l) => Math.round((await l.boundingBox())!.y + (await l.boundingBox())!.height / 2)));
  expect(Math.max(...tops) - Math.min(...tops), "Previous, the page and Next on one row").toBeLessThanOrEqual(2);
  await noSideways(page, "/studio/pieces?pageSize=10");

  // The species picker's hint reads whole in its field ('Type to search, e.g. walnut or Juglans' was cut to '…Juglar').
  await page.goto("/studio/pieces/new");
  const picker = page.getByRole("combobox", { name: "Primary species" });
  const spare = await picker.evaluate((el: HTMLInputElement) => {
    const cs = getComputedStyle(el);
    const pen = document.createElement("canvas").getContext("2d")!;
    pen.font = `${cs.fontWeight} ${cs.fontSize} ${cs.fontFamily}`;
    return el.clientWidth - parseFloat(cs.paddingLeft) - parseFloat(cs.paddingRight) - pen.measureText(el.placeholder).width;
  });
  expect(spare, "px to spare beside the species picker's placeholder").toBeGreaterThanOrEqual(0);

  await page.goto("/studio/reminders");
  await expect(page.getByRole("table").or(page.getByText("Nothing goes out in the next 30 days."))).toBeVisible();
  await noSideways(page, "/studio/reminders");

  await page.goto("/studio/technicians");
  await expect(page.getByRole("group", { name: "Weekly hours" }).first()).toBeVisible();
  await noSideways(page, "/studio/technicians");

  await page.goto("/studio/audit");
  await expect(page.getByRole("heading", { level: 1, name: "Audit log" })).toBeVisible();
  await noSideways(page, "/studio/audit");
});

test("the claims list on a phone shows each claim's whole line: piece, owner, age and photos", async ({ page }) => {
  await signIn(page, ACCOUNTS.staff);
  await page.goto("/studio/claims");
  const rows = page.getByRole("list", { name: "Claims" }).getByRole("link");
  await expect(rows.first()).toBeVisible();
  // No line of a row is cut short with an ellipsis: everything it holds is laid out inside it.
  const clipped = await rows.evaluateAll((links) =>
    links.flatMap((a) => [...a.querySelectorAll("span")].filter((s) => s.scrollWidth > s.clientWidth + 1).map((s) => s.textContent ?? "")),
  );
  expect(clipped).toEqual([]);
  await expect(rows.first()).toContainText(/\d+ photos?/);
  await noSideways(page, "/studio/claims");
  // A link with a state the queue does not have opens the open claims (was "The queue didn't load — Some
  // fields need a second look."); a page past the end goes to the last page (was "4901–2 of 2 claims").
  await page.goto("/studio/claims?state=bogus&sort=sideways");
  await expect(rows.first()).toBeVisible();
  await expect(page.getByText("The queue didn't load")).toHaveCount(0);
  await page.goto("/studio/claims?page=99");
  await expect(rows.first()).toBeVisible();
  await expect(page).toHaveURL(/\/studio\/claims$/);
  await expect(page.getByText("No claims match these filters.")).toHaveCount(0);
});

test("a claim's coverage suggestion on a phone: the covered share wraps under the words, not in a column of its own", async ({ page }) => {
  await signIn(page, ACCOUNTS.staff);
  await page.goto("/studio/claims");
  // The seeded crack in the cherry desk is suggested as partly covered.
  await page.getByRole("list", { name: "Claims" }).getByRole("link", { name: /Cherry writing desk/ }).first().click();
  const suggestion = page.getByTestId("coverage-suggestion");
  await expect(suggestion).toContainText(/^Suggests: Partly covered \(\d+ % covered\)$/);
  const share = suggestion.getByText(/% covered\)$/);
  const [a, b] = [(await suggestion.boundingBox())!, (await share.boundingBox())!];
  expect(Math.abs(b.x - a.x), "the share starts at the words' left edge, on its own line").toBeLessThan(2);
  await noSideways(page, "claim page");
});
