// Every e-mail an owner or staff member gets fits a phone: each template, rendered as lib/mail renders
// real mail (the settings' previews), is laid out in Chromium at 320 px and must not be wider. A link
// spelled out in the text (a care record's or a receipt's address) is one long word; unless it may break
// anywhere it pushes the message past the screen's edge, and the mail scrolls sideways.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { chromium, type Browser } from "@playwright/test";
import { listEmailTemplates, renderEmailPreview } from "@/lib/settings/email-previews";
import { createStudio, memberContext } from "../support/fixtures";

const WIDTH = 320;
let browser: Browser;

beforeAll(async () => {
  browser = await chromium.launch({ executablePath: "/usr/bin/chromium", args: ["--no-sandbox", "--disable-gpu"] });
});
afterAll(async () => {
  await browser?.close();
});

describe("e-mails on a phone", () => {
  it(`every template fits ${WIDTH} px`, async () => {
    const admin = await memberContext(createStudio(), "admin");
    const page = await browser.newPage({ viewport: { width: WIDTH, height: 800 } });
    const wide: string[] = [];
    for (const t of listEmailTemplates(admin)) {
      const { html } = await renderEmailPreview(admin, t.slug);
      await page.setContent(html);
      const scroll = await page.evaluate(() => document.documentElement.scrollWidth);
      if (scroll > WIDTH) wide.push(`${t.slug}: ${scroll} px`);
    }
    await page.close();
    expect(wide).toEqual([]);
  });
});
