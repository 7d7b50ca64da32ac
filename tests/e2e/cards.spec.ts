// Drawer cards in bulk, in Chromium at 1280 px: staff tick two pieces in the registry (axe on the
// registry with the selection showing) and download one PDF of their cards on a Letter sheet
// (ANSI Letter, 8.5 × 11 in = 612 × 792 pt), which holds both cards on its one page.
import path from "node:path";
import AxeBuilder from "@axe-core/playwright";
import { expect, test } from "@playwright/test";
import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";
import fs from "node:fs";
import { ACCOUNTS, signInTo } from "./helpers";

test.use({ viewport: { width: 1280, height: 900 } });

test("staff choose two pieces in the registry and download their drawer cards as one PDF", async ({ page }) => {
  await signInTo(page, ACCOUNTS.staff, "/studio/pieces");
  const ticks = page.getByRole("checkbox", { name: /^Choose (?!every piece)/ });
  await expect(ticks.first()).toBeVisible();
  const names: string[] = [];
  for (const i of [0, 1]) {
    const tick = ticks.nth(i);
    names.push((await tick.getAttribute("aria-label"))!.replace(/^Choose /, ""));
    await tick.check();
  }
  const bar = page.getByRole("region", { name: "Print drawer cards" });
  await expect(bar.getByText("2 pieces chosen for printing.")).toBeVisible();
  const axe = await new AxeBuilder({ page }).analyze();
  expect(axe.violations, JSON.stringify(axe.violations, null, 2)).toEqual([]);

  await expect(bar.getByLabel("Print drawer cards on")).toHaveValue("letter");
  const [download] = await Promise.all([page.waitForEvent("download"), bar.getByRole("link", { name: "Cards for the 2 chosen pieces (PDF)" }).click()]);
  expect(download.suggestedFilename()).toBe("drawer-cards-2-letter-sheets.pdf");
  const bytes = fs.readFileSync((await download.path())!);
  const doc = await getDocument({ data: new Uint8Array(bytes), isEvalSupported: false, standardFontDataUrl: path.resolve("node_modules/pdfjs-dist/standard_fonts") + "/" }).promise;
  expect(doc.numPages).toBe(1);
  const sheet = await doc.getPage(1);
  expect(sheet.view.map(Math.round)).toEqual([0, 0, 612, 792]);
  const text = (await sheet.getTextContent()).items.map((it) => ("str" in it ? it.str : "")).join(" ");
  for (const name of names) expect(text.replace(/\s+/g, " ")).toContain(name.slice(0, 20));
  expect(text.match(/REGISTRATION CODE/g)).toHaveLength(2);
});
