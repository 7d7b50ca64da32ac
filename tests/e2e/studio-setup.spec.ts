// A studio from nothing, all through the UI in Chromium: a stranger signs up and starts a studio, goes
// through every set-up step (details with the browser's time zone, logo and colour, warranty template,
// starter catalog, reminders, visit rules, a technician invited, a Stripe key checked with the Stripe
// fake, the mail sender and a test message read from the SMTP sink), the technician joins from the
// invitation mail; then every studio page is opened while the studio is empty. Staff add a client,
// record a piece with its buyer and print its drawer card (a PDF); the buyer registers from the
// hand-over mail and sees the studio's name on the piece's page; every studio page is opened again,
// populated. On each page: no console error, no serious or critical axe finding.
//
// Runs only on an empty database (no seed; STUDIO_SIGNUP closed, so only the first-studio rule lets the
// stranger in): E2E_EMPTY_DATABASE=1 npx playwright test tests/e2e/studio-setup.spec.ts. The seeded run
// skips it: there the install already has studios, so the walk from an empty install can't happen.
// All names invented.
import AxeBuilder from "@axe-core/playwright";
import Database from "better-sqlite3";
import sharp from "sharp";
import { expect, test, type Browser, type Page } from "@playwright/test";
import { extractLinks, waitForMail } from "../support/mail";
import { DATABASE_FILE, SINK_URL, urlEndingWith } from "./helpers";

test.use({ viewport: { width: 1280, height: 900 }, timezoneId: "America/Halifax" });

const emptyDatabase = process.env.E2E_EMPTY_DATABASE === "1";
test.skip(!emptyDatabase, "Starts from an empty install: run it with E2E_EMPTY_DATABASE=1 (the e2e server then migrates without seeding).");
const stamp = Date.now().toString(36);
const founder = { name: "Odile Farrant (invented)", email: `founder-${stamp}@setup.example` };
const tech = { name: "Piet Calloway (invented)", email: `tech-${stamp}@setup.example` };
const client = { name: `Rosalind Ure ${stamp} (invented)`, email: `client-${stamp}@setup.example` };
const buyer = { name: `Hamish Dory ${stamp} (invented)`, email: `buyer-${stamp}@setup.example` };
const studioName = `Saltmarsh Joinery ${stamp} (invented)`;
const pieceTitle = `Saltmarsh ${stamp} hall bench (e2e)`;
const password = "a sentence for a password";

/** Console errors and script errors on a page, collected for the end of the test. */
function watch(page: Page, problems: string[]) {
  page.on("console", (m) => {
    // Mail previews (outbox, e-mail previews) sit in frames sandboxed without scripts on purpose; Chromium
    // reports the block of a script it was asked to run there as an error in the page around them.
    if (m.type() === "error" && !/^Blocked script execution in 'about:srcdoc' because the document's frame is sandboxed/.test(m.text())) problems.push(`console on ${page.url()}: ${m.text()}`);
  });
  page.on("pageerror", (e) => problems.push(`script error on ${page.url()}: ${e.message}`));
}

async function seriousAxe(page: Page): Promise<string[]> {
  // The outbox and e-mail previews show each mail in a sandboxed frame without scripts, which axe can't
  // enter (it waits for it until the test times out); the page around the frames is checked.
  const axe = await new AxeBuilder({ page }).exclude("iframe").analyze();
  return axe.violations.filter((v) => v.impact === "serious" || v.impact === "critical").map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(" ")).join(", ")}`);
}

/** Signs up with the sign-up form (already open) and confirms the address from the mail; lands where `next` says. */
async function signUpAndConfirm(page: Page, who: { name: string; email: string }) {
  await page.getByLabel("Your name").fill(who.name);
  await page.getByLabel("Email").fill(who.email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Create account" }).click();
  await expect(page).toHaveURL(/\/verify-email\/sent/);
  const mail = await waitForMail({ to: who.email, subject: /confirm/i, sinkUrl: SINK_URL });
  const link = new URL(extractLinks(mail.text).find((l) => l.includes("/verify-email?"))!);
  await page.goto(link.pathname + link.search);
}

/** Saves a step with its button, waits for the toast, and moves on to the named next step. */
async function saveAndNext(page: Page, button: string, saved: RegExp, next: string) {
  await page.getByRole("button", { name: button }).click();
  await expect(page.getByText(saved).first()).toBeVisible();
  await page.getByRole("link", { name: new RegExp(`^(Next|Skip for now): ${next.replace(/[()']/g, ".")}$`) }).click();
  await expect(page.getByRole("heading", { level: 2, name: new RegExp(`Step \\d of 9: ${next.replace(/[()']/g, ".")}`) })).toBeVisible();
}

/** Every page of the studio area the header links to (those under "More" too). */
async function studioPages(page: Page): Promise<string[]> {
  await page.goto("/studio");
  const paths = await page.locator("header a[href^='/studio']").evaluateAll((links) => links.map((l) => new URL((l as HTMLAnchorElement).href).pathname));
  return [...new Set([...paths, "/studio/setup/details", "/studio/settings"])];
}

async function visitAll(page: Page, paths: string[], label: string, problems: string[]) {
  for (const path of paths) {
    const res = await page.goto(path);
    expect(res?.status(), `${label}: ${path} answers`).toBeLessThan(400);
    const main = page.locator("main");
    await expect(main.getByRole("heading").first(), `${label}: ${path} has a heading`).toBeVisible();
    const text = await main.innerText();
    expect(text, `${label}: ${path} shows the error page`).not.toMatch(/Something went wrong|We couldn.t find that page/);
    expect(text, `${label}: ${path} shows a raw value`).not.toMatch(/\bundefined\b|\bNaN\b|\[object Object\]|Invalid Date/);
    expect(await seriousAxe(page), `${label}: ${path} axe`).toEqual([]);
  }
  expect(problems, problems.join("\n")).toEqual([]);
}

async function joinAsTechnician(browser: Browser, origin: string, problems: string[]) {
  const mail = await waitForMail({ to: tech.email, subject: new RegExp(`invited you to ${studioName.replace(/[()]/g, ".")}`), sinkUrl: SINK_URL });
  const link = new URL(extractLinks(mail.text).find((l) => l.includes("/invite/"))!);
  const context = await browser.newContext({ baseURL: origin });
  const page = await context.newPage();
  watch(page, problems);
  await page.goto(link.pathname);
  await page.getByLabel("Your name").fill(tech.name);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Join the studio" }).click();
  await expect(page).toHaveURL(/\/studio/);
  await context.close();
}

test("a stranger starts a studio, sets it up step by step, records a piece whose buyer registers; every studio page works empty and populated", async ({ page, browser, baseURL }) => {
  test.setTimeout(900_000);
  const problems: string[] = [];
  watch(page, problems);

  const db = new Database(DATABASE_FILE, { readonly: true, fileMustExist: true });
  const studios = (db.prepare("SELECT count(*) AS n FROM studios").get() as { n: number }).n;
  db.close();
  expect(studios, "the e2e database starts with no studio at all").toBe(0);

  // ---- a stranger starts a studio
  await page.goto("/");
  await page.getByRole("link", { name: "Start a studio" }).click();
  await page.getByRole("link", { name: "Create an account" }).click();
  await signUpAndConfirm(page, founder);
  await expect(page).toHaveURL(/\/start$/);
  await expect(page.getByLabel("Time zone")).toHaveValue("America/Halifax");
  await page.getByLabel("Studio name").fill(studioName);
  await page.getByLabel("Currency").selectOption("CAD");
  await page.getByLabel("Measurements").selectOption("imperial");
  await page.getByRole("button", { name: "Start the studio" }).click();
  await expect(page).toHaveURL(/\/studio$/);

  // ---- the overview's checklist: every step left, each linking to its page
  const checklist = page.getByRole("region", { name: "Finish setting up your studio" });
  await expect(checklist.getByText("0 of 9 done.")).toBeVisible();
  await expect(checklist.getByRole("link", { name: "Online payments" })).toHaveAttribute("href", "/studio/setup/payments");
  await checklist.getByRole("link", { name: "Start the set-up" }).click();
  await expect(page).toHaveURL(/\/studio\/setup\/details$/);

  // 1. details: the time zone came from the browser and stays editable
  await expect(page.getByLabel("Time zone")).toHaveValue("America/Halifax");
  await page.getByLabel("Address").fill("12 Invented Quay, Harbourtown");
  await page.getByLabel("Phone").fill("+1 902 555 0100");
  await page.getByLabel("Tax rate (%)").fill("15");
  await saveAndNext(page, "Save studio details", /Studio profile and rates saved/, "Logo and colour");

  // 2. logo (re-encoded on the server) and colour
  const logo = await sharp({ create: { width: 900, height: 300, channels: 4, background: { r: 107, g: 66, b: 38, alpha: 0.8 } } }).png().toBuffer();
  await page.locator("input[type=file]").setInputFiles({ name: "logo.png", mimeType: "image/png", buffer: logo });
  await expect(page.getByRole("img", { name: `${studioName} logo` })).toBeVisible();
  await page.getByRole("radio", { name: "Walnut brown" }).check();
  expect(await seriousAxe(page), "brand step axe").toEqual([]);
  await saveAndNext(page, "Save the colour", /Walnut brown saved as your colour/, "Warranty terms");

  // 3. warranty from our template, marked for review
  await expect(page.getByText("A template: review before use")).toBeVisible();
  await saveAndNext(page, "Save the warranty terms", /Warranty terms for deliveries from .+ saved/, "Finish catalog");

  // 4. the catalog from one starter per finish class
  await page.getByRole("button", { name: "Start from our starting values" }).click();
  await expect(page.getByText(/6 starting entries added/)).toBeVisible();
  await expect(page.getByText("Hardwax oil (starting values)")).toBeVisible();
  await page.getByRole("link", { name: /^(Next|Skip for now): Reminder timing$/ }).click();

  // 5. reminders, 6. visit rules (no technicians yet)
  await saveAndNext(page, "Save reminder timing", /Reminder timing saved/, "Visits and technicians' hours");
  await expect(page.getByText(/No technicians yet/)).toBeVisible();
  await saveAndNext(page, "Save visit rules", /Visit booking rules saved/, "Team invitations");

  // 7. a technician invited
  await page.getByLabel("Email").fill(tech.email);
  await page.getByLabel("Role").selectOption("technician");
  await saveAndNext(page, "Send invitation", new RegExp(`Invitation sent to ${tech.email}`), "Online payments");

  // 8. payments: a key Stripe refuses is not kept; the right one is checked and kept
  await page.getByLabel("Stripe secret key").fill("sk_test_not_this_studios_key");
  await page.getByRole("button", { name: "Check and save the key" }).click();
  await expect(page.getByText("Stripe did not accept that key", { exact: false }).first()).toBeVisible();
  await page.getByLabel("Stripe secret key").fill("sk_test_grainward_demo");
  await saveAndNext(page, "Check and save the key", /Stripe accepted the key/, "E-mail sender");

  // 9. mail: sender and Reply-To, and a test message that reaches the sink
  await page.getByLabel("Sender name").fill("Saltmarsh workshop");
  await page.getByLabel("Reply-To address").fill(`desk-${stamp}@saltmarsh.example`);
  await page.getByRole("button", { name: "Save sender and reply address" }).click();
  await expect(page.getByText("Sender name and reply address saved.")).toBeVisible();
  await page.getByRole("button", { name: "Send a test message" }).click();
  await expect(page.getByText(`Test message sent to ${founder.email}.`)).toBeVisible();
  const test1 = await waitForMail({ to: founder.email, subject: /Test message from Saltmarsh workshop/, sinkUrl: SINK_URL });
  expect(test1.from).toMatch(/^Saltmarsh workshop </);
  expect(test1.headers["reply-to"]).toContain(`desk-${stamp}@saltmarsh.example`);
  expect(test1.html).toContain("#6b4226");
  expect(test1.html).toMatch(/\/api\/studio-logo\/[^"?]+\?v=/);
  expect(test1.text).toContain("care records by Grainward");
  await page.getByRole("link", { name: /^(Finish|Skip for now): go to the overview$/ }).click();
  await expect(page).toHaveURL(/\/studio$/);
  await expect(page.getByRole("region", { name: "Finish setting up your studio" })).toHaveCount(0);
  await page.goto("/studio/setup");
  await expect(page.getByRole("heading", { name: "Every step is done" })).toBeVisible();

  // ---- the technician joins from the invitation mail
  await joinAsTechnician(browser, baseURL!, problems);

  // ---- every studio page, empty
  const paths = await studioPages(page);
  expect(paths.length, paths.join(" ")).toBeGreaterThanOrEqual(14);
  await visitAll(page, paths, "empty", problems);

  // ---- a client, then a piece with its buyer, and its drawer card
  await page.goto("/studio/clients/new");
  const clientForm = page.getByRole("form", { name: "New client" });
  await clientForm.getByLabel("Name").fill(client.name);
  await clientForm.getByLabel("E-mail").fill(client.email);
  await clientForm.getByRole("button", { name: "Add client" }).click();
  await expect(page.getByRole("heading", { level: 1, name: client.name })).toBeVisible();

  await page.goto("/studio/pieces/new");
  await page.getByLabel("Title").fill(pieceTitle);
  await page.getByLabel("Kind").selectOption("bench");
  await page.getByLabel("Length").fill("55");
  await page.getByLabel("Width").fill("14");
  await page.getByRole("combobox", { name: "Primary species" }).fill("juglans");
  await page.getByRole("option", { name: /Black walnut/ }).click();
  await page.getByRole("button", { name: "Add a layer" }).click();
  await page.getByRole("radio", { name: /A new client/ }).check();
  await page.getByLabel("Buyer's name").fill(buyer.name);
  await page.getByLabel("Buyer's e-mail").fill(buyer.email);
  await page.getByLabel(/They agreed to service mail/).check();
  await expect(page.getByLabel(/Send them the hand-over mail now/)).toBeChecked();
  await page.getByRole("button", { name: "Record piece" }).click();
  await expect(page).toHaveURL(/\/studio\/pieces\/[0-9a-f-]{36}$/);
  const pieceId = page.url().split("/").pop()!;
  const cardHref = await page.locator(`a[href^="/api/pieces/${pieceId}/card"]`).first().getAttribute("href");
  const card = await page.request.get(cardHref!);
  expect(card.status()).toBe(200);
  expect(card.headers()["content-type"]).toBe("application/pdf");
  expect((await card.body()).subarray(0, 5).toString()).toBe("%PDF-");

  // ---- the buyer registers from the hand-over mail, which carries the studio's brand
  const handover = await waitForMail({ to: buyer.email, subject: /its care and warranty/, sinkUrl: SINK_URL });
  expect(handover.html).toContain(studioName);
  expect(handover.from).toMatch(/^Saltmarsh workshop </);
  const link = new URL(extractLinks(handover.text).find((l) => l.includes("/hand-over/"))!);
  const phone = await browser.newContext({ viewport: { width: 375, height: 812 }, baseURL: baseURL! });
  const owner = await phone.newPage();
  watch(owner, problems);
  await owner.goto(link.pathname);
  await expect(owner.getByRole("heading", { name: pieceTitle })).toBeVisible();
  await owner.getByRole("link", { name: "Create an account and register" }).click();
  await signUpAndConfirm(owner, buyer);
  await expect(owner).toHaveURL(urlEndingWith(link.pathname));
  await owner.getByRole("button", { name: "Register this piece to my account" }).click();
  await expect(owner).toHaveURL(new RegExp(`/pieces/${pieceId}`));
  await expect(owner.getByRole("heading", { level: 1, name: pieceTitle })).toBeVisible();
  // The studio's brand above the piece: its name in its colour, its logo, Grainward's name small.
  await expect(owner.getByText(studioName, { exact: true }).first()).toHaveCSS("color", "rgb(107, 66, 38)");
  await expect(owner.getByText("care records by Grainward")).toBeVisible();
  expect(await seriousAxe(owner), "owner piece page axe").toEqual([]);
  await phone.close();

  // ---- every studio page, populated
  await visitAll(page, [...paths, `/studio/pieces/${pieceId}`], "populated", problems);
});
