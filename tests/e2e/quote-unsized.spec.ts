// The quote builder's notice for work on a surface the piece's record has no size for, at 375 and
// 1280 px: a draft re-oil of the oiled base of Jonah's resin coffee table (tests/support/seed-e2e.ts
// unsizedBase; its top is polished resin, so the re-oil is on the base) proposes nothing and says why;
// staff type the base's area in the studio's unit (the demo studio is imperial: ft²) and propose lines,
// and the labour line is priced from that area, not the top's.
import { expect, test, type Page } from "@playwright/test";
import { ACCOUNTS, fixture, signInTo } from "./helpers";

const SHOTS = "test-results/quote-unsized";
const WARNING = "Re-oil: the work is on the base, and the piece's record has no size for the base, so no lines were proposed for it.";

async function noSideScroll(page: Page) {
  return page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth);
}

test("a re-oil of a base with no size says so, and a base area typed in ft² prices its labour line", async ({ page }) => {
  const jobId = fixture().jobs.unsizedBase!;
  await page.setViewportSize({ width: 375, height: 800 });
  await signInTo(page, ACCOUNTS.staff, `/studio/jobs/${jobId}`);
  await expect(page.getByRole("heading", { name: "Re-oil the waterfall legs (invented)", level: 1 })).toBeVisible();

  // The notice names the work and the surface, at both widths, with the base's and the edges' area fields open.
  const notice = page.getByRole("status").filter({ hasText: "Some work has no size to price it from" });
  for (const width of [375, 1280]) {
    await page.setViewportSize({ width, height: width === 375 ? 800 : 900 });
    await expect(notice).toBeVisible();
    await expect(notice.getByRole("listitem")).toHaveText([WARNING]);
    await expect(page.getByLabel("Base area for this quote (ft²)")).toBeVisible();
    await expect(page.getByLabel("Edges area for this quote (ft²)")).toBeVisible();
    await expect(page.getByText("No lines yet. Propose them from the work above, or add a line.")).toBeVisible();
    expect(await noSideScroll(page), `no sideways scroll at ${width} px`).toBe(true);
    await page.screenshot({ path: `${SHOTS}/warning-${width}.png`, fullPage: true });
  }

  // At 375 px staff type the base's area in ft² and propose lines.
  await page.setViewportSize({ width: 375, height: 800 });
  await page.getByLabel("Base area for this quote (ft²)").fill("15");
  await page.getByRole("button", { name: "Propose lines" }).click();
  await expect(page.getByText(/Lines proposed from the tasks/)).toBeVisible();

  // 15 ft² × 0.09290304 m²/ft² (1 ft = 0.3048 m exactly, NIST SP 811 (2008), appendix B.9) = 1.3935 m².
  // Re-oil labour: 0.5 h + 0.5 h/m² × 1.3935 m² = 1.197 h → 1.25 h in quarter hours (lib/care/quote
  // DEFAULT_LABOUR, invented for the demo — common practice, no published source) at the demo's $85.00/h.
  // From the top's 0.95 m² it would be 0.5 + 0.475 = 0.975 → 1 h.
  const labour = page.locator("form ol > li").filter({ hasText: "Labour rate" });
  await expect(labour).toHaveCount(1);
  await expect(labour.getByText("Labour rate · proposed 1.25 h at $85.00")).toBeVisible();
  await expect(labour.getByLabel("Quantity")).toHaveValue("1.25");
  // The notice is gone once the base has a size; the typed size stays in its field, in ft².
  await expect(page.getByText("Some work has no size to price it from")).toHaveCount(0);
  await expect(page.getByLabel("Base area for this quote (ft²)")).toHaveValue("15");
  expect(await noSideScroll(page)).toBe(true);
  await page.screenshot({ path: `${SHOTS}/proposed-375.png`, fullPage: true });
  await page.setViewportSize({ width: 1280, height: 900 });
  await expect(labour.getByText("Labour rate · proposed 1.25 h at $85.00")).toBeVisible();
  await page.screenshot({ path: `${SHOTS}/proposed-1280.png`, fullPage: true });

  // The server kept the size in m² and priced the line from it: 1.25 h × $85.00 = $106.25.
  const res = await page.request.get(`/api/jobs/${jobId}`);
  const { job } = (await res.json()) as { job: { lines: { ref?: string; unit: string; quantity: number; unitPriceMinor: number; amountMinor: number }[] } };
  expect(job.lines.filter((l) => l.unit === "h")).toEqual([expect.objectContaining({ ref: "task:reoil", quantity: 1.25, unitPriceMinor: 8500, amountMinor: 10625 })]);
});
