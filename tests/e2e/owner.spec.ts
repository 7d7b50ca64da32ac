// The owner's side in Chromium at 375×812: scan a drawer card, sign up, confirm through the SMTP sink,
// register, see the care schedule, log care, download the certificate; hand a piece on; the API's
// status codes over HTTP; axe on every owner page. Uses fixture().unregistered[0..2] only.
import fs from "node:fs";
import path from "node:path";
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import { extractLinks, waitForMail } from "../support/mail";
import { ACCOUNTS, APP_URL, SINK_URL, fixture, signIn, signInTo, urlEndingWith } from "./helpers";

test.use({ viewport: { width: 375, height: 812 }, isMobile: true, hasTouch: true });

const SHOTS = "test-results/owner-shots";
fs.mkdirSync(SHOTS, { recursive: true });

let ipSeq = 0;
/** Each test comes from its own address, so the per-IP rate limits other specs rely on stay untouched. */
function ownIp(): string {
  return `198.18.${(process.pid % 200) + 1}.${(Date.now() + ++ipSeq) % 250}`;
}

async function shot(page: Page, name: string) {
  await page.screenshot({ path: path.join(SHOTS, `${name}.png`), fullPage: true });
}

/** No horizontal scroll, and every control a thumb needs is at least 44 px in both directions (inline text links excepted). */
async function checkPhoneLayout(page: Page, label: string) {
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
  expect(overflow, `${label}: horizontal scroll`).toBeLessThanOrEqual(0);
  const small = await page.evaluate(() => {
    const out: string[] = [];
    const els = document.querySelectorAll<HTMLElement>("main a, main button, main select, main textarea, main input:not([type=hidden]):not([type=checkbox]):not([type=radio]), main summary, header a, header button");
    for (const el of els) {
      if (el.closest("p, li p, dd") && el.tagName === "A" && !el.className.includes("min-h-11")) continue; // a link inside a sentence
      if (el.classList.contains("sr-only")) continue;
      const r = el.getBoundingClientRect();
      const style = getComputedStyle(el);
      if (r.width === 0 || r.height === 0 || style.visibility === "hidden") continue;
      if (el.closest("dialog:not([open])")) continue;
      if (r.height < 44 || r.width < 44) out.push(`${el.tagName} "${(el.textContent ?? "").trim().slice(0, 40)}" ${Math.round(r.width)}×${Math.round(r.height)}`);
    }
    return out;
  });
  expect(small, `${label}: tap targets under 44 px`).toEqual([]);
}

/** No words in the page's main part are cut short with an ellipsis or hidden overflow at this width. */
async function noClippedText(page: Page, label: string) {
  const clipped = await page.evaluate(() =>
    [...document.querySelectorAll<HTMLElement>("main span, main p, main label, main h1, main h2, main h3")]
      .filter((el) => el.children.length === 0 && (el.textContent ?? "").trim() !== "" && !el.closest(".sr-only"))
      .filter((el) => {
        const style = getComputedStyle(el);
        return (style.textOverflow === "ellipsis" || style.overflowX === "hidden") && el.scrollWidth > el.clientWidth + 1;
      })
      .map((el) => (el.textContent ?? "").trim()),
  );
  expect(clipped, `${label}: text cut short`).toEqual([]);
}

async function axe(page: Page, label: string) {
  const results = await new AxeBuilder({ page }).analyze();
  const bad = results.violations.filter((v) => v.impact === "serious" || v.impact === "critical").map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`);
  expect(bad, `${label}: serious or critical axe violations`).toEqual([]);
}

async function pdfText(file: string): Promise<string> {
  const pdfjs = await import("pdfjs-dist/legacy/build/pdf.mjs");
  const doc = await pdfjs.getDocument({ data: new Uint8Array(fs.readFileSync(file)), standardFontDataUrl: `${process.cwd()}/node_modules/pdfjs-dist/standard_fonts/` }).promise;
  let text = "";
  for (let i = 1; i <= doc.numPages; i++) {
    const content = await (await doc.getPage(i)).getTextContent();
    text += content.items.map((it) => ("str" in it ? it.str : "")).join(" ") + " ";
  }
  return text.replace(/\s+/g, " ");
}

test("scan a drawer card, sign up, confirm by e-mail, register, log care and download the certificate", async ({ page, context }) => {
  await context.setExtraHTTPHeaders({ "x-forwarded-for": ownIp() });
  const card = fixture().unregistered[0]!;
  // A long address: it must wrap, not run off a 375 px screen, on the inbox and card pages.
  const email = `card-${Date.now()}-a-rather-long-mailbox-name-to-wrap@owners.example`;

  await page.goto(`/r/${card.code}`);
  await expect(page.getByRole("heading", { name: card.title })).toBeVisible();
  await expect(page.getByText("Larchmere Slab & Resin")).toBeVisible();
  await shot(page, "01-card-landing");
  await checkPhoneLayout(page, "card landing");
  await axe(page, "card landing");

  await page.getByRole("link", { name: "Create an account and register" }).click();
  await expect(page).toHaveURL(/\/sign-up\?next=/);
  await page.getByLabel("Your name").fill("Rowan Ash (invented)");
  await page.getByLabel("Email").fill(email);
  await page.getByLabel("Password").fill("a sentence for a password");
  await shot(page, "02-sign-up");
  await page.getByRole("button", { name: "Create account" }).click();
  await expect(page).toHaveURL(/\/verify-email\/sent/);
  await shot(page, "03-check-inbox");
  await checkPhoneLayout(page, "check your inbox");

  const mail = await waitForMail({ to: email, subject: /confirm/i, sinkUrl: SINK_URL });
  const link = extractLinks(mail.text).find((l) => l.includes("/verify-email?"))!;
  // The code's check symbol may be "=" or "$", which the address carries as %3D or %24.
  expect(decodeURIComponent(new URL(link).searchParams.get("next") ?? "")).toBe(`/r/${card.code}`);
  await page.goto(link);
  await expect(page).toHaveURL(urlEndingWith(`/r/${card.code}`));
  await shot(page, "04-back-on-card");
  await checkPhoneLayout(page, "card landing, signed in");
  await page.getByRole("button", { name: "Register this piece to my account" }).click();

  await expect(page).toHaveURL(new RegExp(`/pieces/${card.pieceId}`));
  await expect(page.getByText("Registered — this piece is now on your account.")).toBeVisible();
  await expect(page.getByRole("heading", { level: 1, name: card.title })).toBeVisible();
  const timeline = page.getByRole("list", { name: "Care schedule" });
  await expect(timeline.getByRole("listitem").first()).toBeVisible();
  await expect(page.getByText("Why this date").first()).toBeVisible();
  await expect(page.getByRole("note", { name: "Cautions" })).toContainText("safety data sheet");
  await shot(page, "05-piece-page");
  await checkPhoneLayout(page, "piece page");
  await axe(page, "piece page");

  // Log the first task on the timeline.
  const firstTask = (await timeline.getByRole("heading", { level: 3 }).first().textContent())!.trim();
  await timeline.getByRole("link", { name: /I did this/ }).first().click();
  await expect(page).toHaveURL(new RegExp(`/pieces/${card.pieceId}/log\\?task=`));
  await expect(page.getByRole("heading", { name: "I did this" })).toBeVisible();
  await page.getByLabel("Product used (optional)").fill("Resin polishing compound");
  await page.getByLabel("What was done (optional)").fill("Polished the top in small circles and wiped it clean.");
  await shot(page, "06-log-form");
  await checkPhoneLayout(page, "log form");
  await noClippedText(page, "log form");
  await axe(page, "log form");
  // The date field is wide enough on a phone for its whole value and picker (Chromium's "mm/dd/yyyy"
  // at 16 px and the calendar button take about 140 px; the year was clipped once in a narrow column).
  expect((await page.getByLabel("When").boundingBox())!.width).toBeGreaterThanOrEqual(150);
  await page.getByRole("button", { name: "Log it" }).click();
  await expect(page.getByText("Logged — thank you.")).toBeVisible();
  // The success toast sits at the bottom, clear of the header and its menu.
  const toast = page.locator("[data-sonner-toast]").first();
  await expect(toast).toBeInViewport({ ratio: 1 }); // once it has slid in
  const toastBox = (await toast.boundingBox())!;
  const headerBox = (await page.locator("header").first().boundingBox())!;
  expect(toastBox.y, "toast below the header").toBeGreaterThanOrEqual(headerBox.y + headerBox.height);
  await expect(page).toHaveURL(new RegExp(`/pieces/${card.pieceId}#schedule`));
  const logged = page.locator("#care-log");
  await expect(logged).toContainText(firstTask);
  await expect(logged).toContainText("Polished the top in small circles");
  const item = timeline.getByRole("listitem").filter({ has: page.getByRole("heading", { level: 3, name: firstTask, exact: true }) });
  await expect(item.first()).toContainText("Nothing to do yet");
  await shot(page, "07-after-logging");

  const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: /Warranty certificate/ }).click()]);
  expect(download.suggestedFilename()).toMatch(/^warranty-certificate-.*\.pdf$/);
  const file = path.join(SHOTS, "certificate.pdf");
  await download.saveAs(file);
  const text = await pdfText(file);
  expect(text).toContain("Warranty certificate");
  expect(text).toContain(card.title);
  expect(text).toContain("Rowan Ash (invented)");
  expect(text).toContain("Larchmere Slab & Resin");
  // The terms are named in words, never by their stored label.
  expect(text).toMatch(/Warranty terms for deliveries from \d{1,2} [A-Z][a-z]+ \d{4}/);
  expect(text).not.toMatch(/Version \d|demo-\d{4}/);
});

test("the demo owner sees their pieces with schedules, a lived-in care log and the care guide", async ({ page, context }) => {
  await context.setExtraHTTPHeaders({ "x-forwarded-for": ownIp() });
  await signInTo(page, ACCOUNTS.owner, "/pieces");
  const walnut = page.getByRole("link", { name: /Walnut river dining table/ });
  await expect(walnut).toContainText("Next:");
  await expect(page.getByRole("link", { name: /Charred cedar garden bench/ })).toBeVisible();
  await shot(page, "10-demo-pieces");
  await checkPhoneLayout(page, "pieces list");
  await axe(page, "pieces list");

  await walnut.click();
  await expect(page.getByRole("list", { name: /Top finish layers/ })).toContainText("Ceramic-type topcoat");
  await expect(page.getByRole("note", { name: "Cautions" })).toContainText("metal can, cover them with water and a squirt of washing-up detergent");
  await expect(page.getByRole("note", { name: "Cautions" })).toContainText("Keep heat off the resin");
  await expect(page.getByRole("note", { name: "Cautions" })).toContainText("laptop");
  await expect(page.locator("#guide")).toContainText("How much:");
  await expect(page.locator("#guide")).toContainText("US fl oz");
  await expect(page.locator("#warranty")).toContainText("left");
  await expect(page.locator("#care-log")).toContainText("Annual clean and check");
  await shot(page, "11-demo-piece");
  await checkPhoneLayout(page, "demo piece page");
  await axe(page, "demo piece page");
  // Its icons are drawn from the sprite (components/ui/sprite-icon.tsx): the file is served as SVG and
  // holds every symbol the page names.
  const refs = await page.locator("svg > use").evaluateAll((uses) => uses.map((u) => u.getAttribute("href") ?? ""));
  expect(refs.length).toBeGreaterThan(10);
  const sprite = await page.request.get(refs[0]!.split("#")[0]!);
  expect(sprite.status()).toBe(200);
  expect(sprite.headers()["content-type"]).toContain("image/svg+xml");
  const symbols = await sprite.text();
  for (const ref of new Set(refs)) expect(symbols, ref).toContain(`<symbol id="${ref.split("#")[1]}"`);

  await page.goto("/account");
  await expect(page.getByLabel("Time zone")).toHaveValue("America/Los_Angeles");
  await shot(page, "12-account");
  await checkPhoneLayout(page, "account");
  await axe(page, "account");

  await page.goto("/register");
  await page.getByLabel("Registration code").fill("ABCD-EFGH-JKMN-0");
  await page.getByRole("button", { name: "Find the piece" }).click();
  await expect(page.getByText(/that code has a typo — check the card/i)).toBeVisible();
  await expect(page.getByLabel("Registration code")).toHaveValue("ABCD-EFGH-JKMN-0");
  await shot(page, "13-register-typo");
  await checkPhoneLayout(page, "register");
  await axe(page, "register");
});

test("an owner hands a piece on: release with a fresh code, and a second owner registers it", async ({ page, browser, context }) => {
  const ip = ownIp();
  await context.setExtraHTTPHeaders({ "x-forwarded-for": ip });
  const card = fixture().unregistered[1]!;
  await signIn(page, ACCOUNTS.otherOwner);
  const reg = await page.request.post("/api/registrations", { data: { code: card.code } });
  expect(reg.status()).toBe(201);
  expect(await reg.json()).toEqual({ pieceId: card.pieceId });

  await page.goto(`/pieces/${card.pieceId}/transfer`);
  await checkPhoneLayout(page, "transfer");
  await axe(page, "transfer");
  await page.getByRole("button", { name: "Release this piece" }).click();
  await expect(page.getByText("Tick the box to confirm")).toBeVisible();
  await page.getByRole("checkbox").check();
  // The error line goes once the box is ticked; wait for it so the button has stopped moving.
  await expect(page.getByText("Tick the box to confirm")).toBeHidden();
  await page.getByRole("button", { name: "Release this piece" }).click();
  const dialog = page.getByRole("dialog", { name: "Release this piece?" });
  await expect(dialog).toBeVisible();
  await shot(page, "20-release-confirm");
  const since = new Date();
  await dialog.getByRole("button", { name: "Yes, release it" }).click();
  const codeBox = page.getByLabel("New registration code");
  await expect(codeBox).toBeVisible();
  const fresh = (await codeBox.textContent())!.trim();
  expect(fresh).not.toBe(card.code);
  await shot(page, "21-released-code");
  await checkPhoneLayout(page, "released");
  const mail = await waitForMail({ to: ACCOUNTS.otherOwner, subject: /new registration code/i, sinkUrl: SINK_URL, since });
  expect(mail.text).toContain(fresh);
  await waitForMail({ to: "studio@larchmere.example", subject: /changed hands/i, sinkUrl: SINK_URL, since });
  expect((await page.request.get(`/api/me/pieces/${card.pieceId}`)).status()).toBe(404);

  const next = await (await browser.newContext({ viewport: { width: 375, height: 812 }, extraHTTPHeaders: { "x-forwarded-for": ip } })).newPage();
  await signInTo(next, ACCOUNTS.owner, "/register");
  await next.getByLabel("Registration code").fill(fresh.toLowerCase().replace(/-/g, " "));
  await next.getByRole("button", { name: "Find the piece" }).click();
  // A typed code shows which piece it is, and asks, as the card's QR code does.
  await expect(next.getByRole("heading", { name: card.title })).toBeVisible();
  await next.getByRole("button", { name: "Register this piece to my account" }).click();
  await expect(next).toHaveURL(new RegExp(`/pieces/${card.pieceId}`));
  await expect(next.locator("#warranty")).toContainText("Stayed with the first owner");
  await shot(next, "22-second-owner");
  // The old card's code no longer works.
  const old = await next.request.post("/api/registrations", { data: { code: card.code } });
  expect(old.status()).toBe(404);
  await next.context().close();
});

test("the API answers with the documented status codes; simultaneous registrations of one code make one owner", async ({ browser }) => {
  const ip = ownIp();
  const a = await browser.newContext({ extraHTTPHeaders: { "x-forwarded-for": ip } });
  const b = await browser.newContext({ extraHTTPHeaders: { "x-forwarded-for": ip } });
  const pa = await a.newPage();
  const pb = await b.newPage();
  await signIn(pa, ACCOUNTS.owner);
  await signIn(pb, ACCOUNTS.otherOwner);
  const card = fixture().unregistered[2]!;

  const anon = await (await browser.newContext()).request.post(`${APP_URL}/api/registrations`, { data: { code: card.code } });
  expect(anon.status()).toBe(401);
  const typo = await pa.request.post("/api/registrations", { data: { code: card.code.slice(0, -1) + (card.code.endsWith("0") ? "1" : "0") } });
  expect(typo.status()).toBe(400);
  expect((await typo.json()).error.fieldErrors.code[0]).toBe("That code has a typo — check the card.");
  const unknown = await pa.request.post("/api/registrations", { data: { code: "0000-0000-0000-0" } });
  expect(unknown.status()).toBe(404);
  const notJson = await pa.request.post("/api/registrations", { data: "nope", headers: { "content-type": "application/json" } });
  expect(notJson.status()).toBe(400);

  const [r1, r2] = await Promise.all([pa.request.post("/api/registrations", { data: { code: card.code } }), pb.request.post("/api/registrations", { data: { code: card.code } })]);
  expect([r1.status(), r2.status()].sort()).toEqual([201, 409]);
  const [winner, loser] = r1.status() === 201 ? [pa, pb] : [pb, pa];
  const loserBody = await (r1.status() === 201 ? r2 : r1).json();
  expect(loserBody.error.message).toMatch(/release it/);

  expect((await winner.request.get(`/api/me/pieces/${card.pieceId}`)).status()).toBe(200);
  expect((await loser.request.get(`/api/me/pieces/${card.pieceId}`)).status()).toBe(404);
  expect((await loser.request.get(`/api/me/pieces/${card.pieceId}/certificate`)).status()).toBe(404);
  const list = await (await winner.request.get("/api/me/pieces")).json();
  expect(list.pieces.map((p: { id: string }) => p.id)).toContain(card.pieceId);

  const detail = (await (await winner.request.get(`/api/me/pieces/${card.pieceId}`)).json()).piece;
  const task = detail.schedule.tasks[0];
  const badDate = await winner.request.post(`/api/me/pieces/${card.pieceId}/care-log`, { data: { taskKind: task.kind, surface: task.surface, doneOn: "2999-01-01" } });
  expect(badDate.status()).toBe(400);
  expect((await badDate.json()).error.fieldErrors.doneOn).toBeTruthy();
  const added = await winner.request.post(`/api/me/pieces/${card.pieceId}/care-log`, { data: { taskKind: task.kind, surface: task.surface, doneOn: detail.schedule.today } });
  expect(added.status()).toBe(201);
  const entry = (await added.json()).entry;
  expect((await loser.request.patch(`/api/me/pieces/${card.pieceId}/care-log/${entry.id}`, { data: { notes: "not mine" } })).status()).toBe(404);
  expect((await winner.request.patch(`/api/me/pieces/${card.pieceId}/care-log/${entry.id}`, { data: { notes: "corrected" } })).status()).toBe(200);
  expect((await winner.request.delete(`/api/me/pieces/${card.pieceId}/care-log/${entry.id}`)).status()).toBe(200);
  expect((await winner.request.patch("/api/me/preferences", { data: { timeZone: "Nowhere/Else" } })).status()).toBe(400);
  expect((await loser.request.post(`/api/me/pieces/${card.pieceId}/release`, { data: { confirm: true } })).status()).toBe(404);
  expect((await winner.request.post(`/api/me/pieces/${card.pieceId}/release`, { data: {} })).status()).toBe(400);
  await a.close();
  await b.close();
});
