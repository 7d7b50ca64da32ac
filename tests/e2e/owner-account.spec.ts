// Owner pages found wanting on a walk through them as a customer: a refusal that outlived the mistake it
// was about (the password form), the piece's four actions at 1280 px (the fourth alone on a row),
// signing out without a word that it happened, a handed-on piece's claim and repair offering writes that
// are refused, and a card of one's own piece sending one to "its care plan". Invented data.
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import { waitForMail, extractLinks } from "../support/mail";
import { ACCOUNTS, APP_URL, fixture, PASSWORD, PORTS, SINK_URL, signIn, signInTo, signOutSaysSo } from "./helpers";
import { manifestActions } from "./routes";

test("changing the password: the server's refusal goes at the next press, also when the form's own checks stop that one", async ({ page }) => {
  await signIn(page, ACCOUNTS.otherOwner);
  await page.goto("/account/password");
  await page.getByLabel("Current password").fill("not the password at all");
  await page.getByLabel("New password", { exact: true }).fill("a brand new sentence");
  await page.getByLabel("New password, again").fill("a brand new sentence");
  await page.getByRole("button", { name: "Change password" }).click();
  const refusal = page.getByText("Couldn't change the password");
  await expect(refusal).toBeVisible();

  // The current password is right now; the repeat is mistyped, which the form itself catches.
  await page.getByLabel("Current password").fill(PASSWORD);
  await page.getByLabel("New password, again").fill("a brand new sentencX");
  await page.getByRole("button", { name: "Change password" }).click();
  await expect(page.getByText("The two passwords differ.")).toBeVisible();
  await expect(refusal).toHaveCount(0);
  await expect(page.getByText("That isn't your current password.")).toHaveCount(0);
});

test("a piece's four actions sit two by two at 1280 px, one under another at 375 px", async ({ browser }) => {
  for (const [width, height, columns] of [[1280, 900, 2], [375, 812, 1]] as const) {
    const context = await browser.newContext({ viewport: { width, height } });
    const page = await context.newPage();
    await signIn(page, ACCOUNTS.owner);
    await page.getByRole("link", { name: /Walnut river dining table/ }).click();
    const actions = page.locator('[data-slot="piece-actions"]').locator(":scope > *");
    await expect(actions).toHaveCount(4);
    const boxes = await actions.evaluateAll((els) => els.map((e) => e.getBoundingClientRect()).map((r) => ({ x: Math.round(r.x), y: Math.round(r.y) })));
    const rows = new Set(boxes.map((b) => b.y));
    const cols = new Set(boxes.map((b) => b.x));
    expect(cols.size, `${width} px: columns`).toBe(columns);
    expect(rows.size, `${width} px: rows`).toBe(4 / columns);
    await context.close();
  }
});

test("signing out says so where one signs in again", async ({ page }) => {
  await signIn(page, ACCOUNTS.otherOwner);
  await signOutSaysSo(page);
});

test("a claim on a piece its owner has handed on is theirs to read: no photo picker, no message box, and why", async ({ browser }) => {
  const context = await browser.newContext({ viewport: { width: 375, height: 812 }, isMobile: true, hasTouch: true });
  await context.setExtraHTTPHeaders({ "x-forwarded-for": "203.0.113.141" });
  const page = await context.newPage();
  await signIn(page, ACCOUNTS.otherOwner);
  // A demo piece no other spec registers (owner.spec uses the first three, plans-held the last).
  const card = fixture().unregistered[4]!;
  expect((await page.request.post("/api/registrations", { data: { code: card.code } })).status()).toBe(201);
  const created = await page.request.post("/api/claims", {
    data: {
      pieceId: card.pieceId,
      category: "other",
      noticedOn: new Date(Date.now() - 3 * 86_400_000).toISOString().slice(0, 10),
      description: "A claim filed just before the piece was sold (e2e, invented).",
      answers: { heat: "no", chemicals: "no", impact: "no", usedOutdoors: "no", directSun: "no" },
    },
  });
  expect(created.status()).toBe(201);
  const { claim } = (await created.json()) as { claim: { id: string } };
  await page.goto(`/claims/${claim.id}`);
  await expect(page.getByRole("button", { name: "Send message" })).toBeVisible();
  await expect(page.getByRole("button", { name: /^Add photos — / })).toBeVisible();

  expect((await page.request.post(`/api/me/pieces/${card.pieceId}/release`, { data: { confirm: true } })).status()).toBe(200);
  await page.reload();
  await expect(page.getByText("You handed this piece on")).toBeVisible();
  await expect(page.getByText("A claim filed just before the piece was sold")).toBeVisible();
  // Both were offered and answered 403 at every try.
  await expect(page.getByRole("button", { name: "Send message" })).toHaveCount(0);
  await expect(page.getByRole("button", { name: /^Add photos — / })).toHaveCount(0);
  await context.close();
});

test("a repair its owner paid for, then handed the piece on: a record with its receipt, no visit to book, no invitation to write", async ({ browser }) => {
  test.setTimeout(120_000);
  const context = await browser.newContext({ viewport: { width: 375, height: 812 }, isMobile: true, hasTouch: true });
  await context.setExtraHTTPHeaders({ "x-forwarded-for": "203.0.113.142" });
  const page = await context.newPage();
  await signIn(page, ACCOUNTS.otherOwner);
  // A demo piece no other spec registers; a claim on it, made chargeable, quoted, paid.
  const card = fixture().unregistered[5]!;
  expect((await page.request.post("/api/registrations", { data: { code: card.code } })).status()).toBe(201);
  const filed = await page.request.post("/api/claims", {
    data: {
      pieceId: card.pieceId,
      category: "other",
      noticedOn: new Date(Date.now() - 3 * 86_400_000).toISOString().slice(0, 10),
      description: "A scuff to be buffed out and paid for (e2e, invented).",
      answers: { heat: "no", chemicals: "no", impact: "yes", usedOutdoors: "no", directSun: "no" },
    },
  });
  expect(filed.status()).toBe(201);
  const { claim } = (await filed.json()) as { claim: { id: string } };

  const desk = await (await browser.newContext()).newPage();
  await signIn(desk, ACCOUNTS.staff);
  expect((await desk.request.post(`/api/claims/${claim.id}/state`, { data: { to: "in_review" } })).status()).toBe(200);
  expect((await desk.request.post(`/api/claims/${claim.id}/decision`, { data: { decision: "chargeable", reason: "A knock is not covered (invented)." } })).status()).toBe(200);
  const made = await desk.request.post("/api/jobs", { data: { from: "claim", id: claim.id } });
  expect(made.status()).toBe(201);
  const { job } = (await made.json()) as { job: { id: string } };
  const quoted = await desk.request.patch(`/api/jobs/${job.id}`, { data: { title: "Buff out the scuff (e2e)", tasks: ["annual_check"], repairs: [], productIds: [], coats: 1, travel: true, coveredPct: 0, notes: "" } });
  expect(quoted.status(), await quoted.text()).toBe(200);
  expect((await desk.request.post(`/api/jobs/${job.id}/quote`)).status()).toBe(200);
  await desk.context().close();

  await page.goto(`/jobs/${job.id}`);
  await page.getByRole("button", { name: "Approve and pay" }).click();
  await expect(page).toHaveURL(new RegExp(`127\\.0\\.0\\.1:${PORTS.stripe}/pay/cs_test_`));
  await page.getByLabel("Card number").fill("4242 4242 4242 4242");
  await page.getByRole("button", { name: "Pay", exact: true }).click();
  await expect(page.getByText("Paid — thank you")).toBeVisible();
  await expect(page.getByRole("link", { name: "Book your visit" })).toBeVisible();

  expect((await page.request.post(`/api/me/pieces/${card.pieceId}/release`, { data: { confirm: true } })).status()).toBe(200);
  await page.goto(`/jobs/${job.id}`);
  await expect(page.getByText("You handed this piece on")).toBeVisible();
  await expect(page.getByRole("link", { name: "Download your receipt (PDF)" })).toBeVisible();
  // Booking answered "not found" to them; the empty messages no longer invite a question they can't send.
  await expect(page.getByRole("link", { name: "Book your visit" })).toHaveCount(0);
  await expect(page.getByText("No visit booked yet")).toHaveCount(0);
  await expect(page.getByText("Ask the studio anything")).toHaveCount(0);
  await context.close();
});

test("scanning the card of a piece already on one's account opens the piece, in words that don't promise a care plan", async ({ browser }) => {
  const context = await browser.newContext({ viewport: { width: 375, height: 812 }, isMobile: true, hasTouch: true });
  await context.setExtraHTTPHeaders({ "x-forwarded-for": "203.0.113.143" });
  const page = await context.newPage();
  await signIn(page, ACCOUNTS.otherOwner);
  const card = fixture().unregistered[3]!;
  expect((await page.request.post("/api/registrations", { data: { code: card.code } })).status()).toBe(201);
  await page.goto(`/r/${encodeURIComponent(card.code)}`);
  await expect(page.getByText("It is already registered to your account.")).toBeVisible();
  await expect(page.getByText(/care plan/i)).toHaveCount(0);
  await page.getByRole("link", { name: "Open the piece" }).click();
  await expect(page).toHaveURL(new RegExp(`/pieces/${card.pieceId}$`));
  await context.close();
});

test("a hand-over link opened while signed in with another address: one button signs out and comes back to the link", async ({ page, browser }) => {
  const word = `Wren${Date.now().toString(36)}`;
  const title = `${word} side table (e2e)`;
  const email = `${word.toLowerCase()}@buyer.example`;
  await signInTo(page, ACCOUNTS.staff, "/studio/pieces/new");
  await page.getByLabel("Title").fill(title);
  await page.getByLabel("Kind").selectOption("bench");
  await page.getByLabel("Length").fill("40");
  await page.getByLabel("Width").fill("16");
  await page.getByRole("combobox", { name: "Primary species" }).fill("juglans");
  await page.getByRole("option", { name: /Black walnut/ }).click();
  await page.getByRole("button", { name: "Add a layer" }).click();
  await page.getByRole("radio", { name: /A new client/ }).check();
  await page.getByLabel("Buyer's name").fill(`Robin ${word} (invented)`);
  await page.getByLabel("Buyer's e-mail").fill(email);
  await page.getByLabel(/They agreed to service mail/).check();
  await page.getByRole("button", { name: "Record piece" }).click();
  await expect(page.getByText(/The hand-over mail is on its way to the buyer/)).toBeVisible();
  const mail = await waitForMail({ to: email, subject: /its care and warranty/, sinkUrl: SINK_URL });
  const path = new URL(extractLinks(mail.text).find((l) => l.includes("/hand-over/"))!).pathname;

  // Someone signed in as another owner opens it (a shared computer).
  const phone = await browser.newContext({ viewport: { width: 375, height: 812 }, isMobile: true, hasTouch: true });
  const owner = await phone.newPage();
  await signIn(owner, ACCOUNTS.otherOwner);
  await owner.goto(path);
  await expect(owner.getByText("Signed in with another address")).toBeVisible();
  await owner.getByRole("button", { name: "Sign out, then use this link" }).click();
  await expect(owner.getByText("You are signed out on this device.")).toBeVisible();
  // Signing up (or in) from here comes back to the link.
  await expect(owner.getByRole("link", { name: "Create an account" })).toHaveAttribute("href", `/sign-up?next=${encodeURIComponent(path)}`);
  expect(new URL(owner.url()).searchParams.get("next")).toBe(path);
  await phone.close();
});

test("changing one's name on the account page: saved for this account, greeted by it in pages and mail; a blank or overlong name gets a word beside the field", async ({ browser }) => {
  const context = await browser.newContext({ viewport: { width: 1600, height: 900 } });
  await context.setExtraHTTPHeaders({ "x-forwarded-for": "203.0.113.144" });
  const page = await context.newPage();
  await signInTo(page, ACCOUNTS.otherOwner, "/account");
  const field = page.getByLabel("Your name");
  const before = await field.inputValue();
  const lead = page.getByText(`· ${ACCOUNTS.otherOwner}`);
  await expect(lead).toHaveText(`${before} · ${ACCOUNTS.otherOwner}`);

  // Blank (spaces only) and 201 characters: the form says why, nothing is saved.
  for (const [typed, message] of [["   ", "Tell us your name."], ["x".repeat(201), "Use at most 120 characters."]] as const) {
    await field.fill(typed);
    await page.getByRole("button", { name: "Save name" }).click();
    await expect(page.getByText(message)).toBeVisible();
  }
  // The server answers the same without the form's own checks: a field message, not a 500.
  const saveName = manifestActions().find((a) => a.file === "app/(owner)/account/actions.ts" && a.name === "saveNameAction")!;
  for (const [name, message] of [["   ", "Tell us your name."], ["x".repeat(201), "Use at most 120 characters."]] as const) {
    const res = await page.request.post("/account", {
      headers: { "Next-Action": saveName.id, Accept: "text/x-component", Origin: new URL(APP_URL).origin, "Content-Type": "text/plain;charset=UTF-8" },
      data: JSON.stringify([{ name }]),
    });
    expect(res.status()).toBe(200);
    const body = await res.text();
    expect(body).toContain(message);
    expect(body).toContain('"fieldErrors"');
  }
  await page.reload();
  await expect(field).toHaveValue(before);

  // Surrounding spaces go; the page, its header and the next mail use the new name.
  const renamed = `Marlo Quince ${Date.now().toString(36)} (invented)`;
  await field.fill(`  ${renamed}  `);
  await page.getByRole("button", { name: "Save name" }).click();
  await expect(page.getByText("Name saved.")).toBeVisible();
  await expect(lead).toHaveText(`${renamed} · ${ACCOUNTS.otherOwner}`);
  await page.reload();
  await expect(field).toHaveValue(renamed);
  await expect(page.locator("header").getByText(renamed)).toBeVisible();

  const asked = await browser.newContext();
  await asked.setExtraHTTPHeaders({ "x-forwarded-for": "203.0.113.144" });
  const forgot = await asked.newPage();
  await forgot.goto("/forgot-password");
  await forgot.getByLabel("Email").fill(ACCOUNTS.otherOwner);
  const since = new Date().toISOString();
  await forgot.getByRole("button", { name: "Send me a reset link" }).click();
  await expect(forgot.getByText("Check your inbox")).toBeVisible();
  const mail = await waitForMail({ to: ACCOUNTS.otherOwner, subject: /reset/i, sinkUrl: SINK_URL, since });
  expect(mail.text).toContain(`Hi ${renamed},`);
  await asked.close();

  // Back to the name the other specs know.
  await field.fill(before);
  await page.getByRole("button", { name: "Save name" }).click();
  await expect(lead).toHaveText(`${before} · ${ACCOUNTS.otherOwner}`);
  await context.close();
});

/** A new owner (invented), signed up and confirmed through the sink, signed in on `page`. */
async function newOwner(page: Page, word: string) {
  const email = `${word}-${Date.now().toString(36)}@owners.example`;
  await page.goto("/sign-up");
  await page.getByLabel("Your name").fill(`Sasha ${word} (invented)`);
  await page.getByLabel("Email").fill(email);
  await page.getByLabel("Password").fill("a sentence for a password");
  await page.getByRole("button", { name: "Create account" }).click();
  await expect(page).toHaveURL(/\/verify-email\/sent/);
  const mail = await waitForMail({ to: email, subject: /confirm/i, sinkUrl: SINK_URL });
  await page.goto(extractLinks(mail.text).find((l) => l.includes("/verify-email?"))!);
  await expect(page).toHaveURL(/\/pieces\?verified=1/);
  return email;
}

const phoneSize = { viewport: { width: 375, height: 812 }, isMobile: true, hasTouch: true } as const;
const shot = (page: Page, name: string) => page.screenshot({ path: `tests/.tmp/screens/owner-account-${name}.png`, fullPage: true });

/** No serious or critical axe findings, and no sideways scrolling, on the page as it is. */
async function looksRight(page: Page, label: string) {
  const results = await new AxeBuilder({ page }).analyze();
  expect(results.violations.filter((v) => v.impact === "serious" || v.impact === "critical").map((v) => v.id), `${label}: axe`).toEqual([]);
  expect(await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth), `${label}: horizontal scroll`).toBeLessThanOrEqual(0);
}

test("changing one's e-mail address at 375 px: a link to the new address, a note to the old, the change only when the link is opened by the same account", async ({ browser }) => {
  test.setTimeout(90_000);
  const context = await browser.newContext(phoneSize);
  await context.setExtraHTTPHeaders({ "x-forwarded-for": "203.0.113.151" });
  const page = await context.newPage();
  const oldEmail = await newOwner(page, "mover");
  const newEmail = oldEmail.replace("mover-", "moved-");
  // A second device, signed in before the change.
  const second = await browser.newContext(phoneSize);
  const secondPage = await second.newPage();
  await signIn(secondPage, oldEmail, "a sentence for a password");

  await page.goto("/account");
  await page.getByRole("link", { name: "Change e-mail address" }).click();
  await expect(page).toHaveURL(/\/account\/email$/);
  await page.getByLabel("New e-mail address").fill(newEmail);
  await page.getByLabel("Current password").fill("not my password");
  await page.getByRole("button", { name: "Send the link" }).click();
  await expect(page.getByText("That isn't your current password.").first()).toBeVisible();
  const since = new Date().toISOString();
  await page.getByLabel("Current password").fill("a sentence for a password");
  await page.getByRole("button", { name: "Send the link" }).click();
  await expect(page.getByText("A change is waiting for its link")).toBeVisible();
  await expect(page.getByText(`Your account uses ${oldEmail}.`)).toBeVisible();
  await shot(page, "email-waiting-375");
  await looksRight(page, "e-mail page with a change waiting");

  const notice = await waitForMail({ to: oldEmail, subject: /asked to change your Grainward e-mail address/, sinkUrl: SINK_URL, since });
  expect(notice.text).toContain(newEmail);
  const mail = await waitForMail({ to: newEmail, subject: /Confirm your new e-mail address/, sinkUrl: SINK_URL, since });
  const link = extractLinks(mail.text).find((l) => l.includes("/account/email/confirm?token="))!;

  // Someone else signed in opens it (a shared computer): nothing changes, and they're told why.
  const stranger = await browser.newContext(phoneSize);
  const strangerPage = await stranger.newPage();
  await signIn(strangerPage, ACCOUNTS.otherOwner);
  await strangerPage.goto(link);
  await expect(strangerPage.getByText("This link is for another account")).toBeVisible();
  await stranger.close();

  await page.goto(link);
  await expect(page).toHaveURL(/\/account\?email=changed$/);
  await expect(page.getByText("E-mail address changed")).toBeVisible();
  await expect(page.getByText(`· ${newEmail}`)).toBeVisible();
  await shot(page, "email-changed-375");
  await looksRight(page, "account page");
  // The same pages on a wide screen.
  await page.setViewportSize({ width: 1280, height: 900 });
  await shot(page, "account-1280");
  await page.goto("/account/email");
  await shot(page, "email-1280");
  await page.goto("/account/delete");
  await shot(page, "delete-1280");
  await looksRight(page, "delete page at 1280 px");
  await page.setViewportSize({ width: 375, height: 812 });
  // Opened again: spent.
  await page.goto(link);
  await expect(page.getByText("This link doesn't work any more")).toBeVisible();
  // The other device was signed out by the change.
  await secondPage.goto("/account");
  await expect(secondPage).toHaveURL(/\/sign-in/);
  await second.close();
  await context.close();
});

test("deleting one's account at 375 px: what happens is said first, the password confirms it, pieces go back to the studio and the claim is withdrawn", async ({ browser }) => {
  test.setTimeout(120_000);
  const desk = await browser.newContext();
  const deskPage = await desk.newPage();
  await signIn(deskPage, ACCOUNTS.staff);
  const title = `Leaving owner's stool ${Date.now().toString(36)} (e2e, invented)`;
  const created = await deskPage.request.post("/api/pieces", {
    data: { kind: "bench", title, shapeKind: "rectangle", lengthMm: 400, widthMm: 400, primarySpeciesId: "red_oak", use: "light", deliveredOn: "2026-02-01", layers: [{ surface: "top", finishClass: "paste_wax", coats: 1, appliedOn: "2026-02-01" }] },
  });
  expect(created.status()).toBe(201);
  const { piece, registrationCode } = (await created.json()) as { piece: { id: string }; registrationCode: string };

  const context = await browser.newContext(phoneSize);
  await context.setExtraHTTPHeaders({ "x-forwarded-for": "203.0.113.152" });
  const page = await context.newPage();
  const email = await newOwner(page, "leaver");
  expect((await page.request.post("/api/registrations", { data: { code: registrationCode } })).status()).toBe(201);
  const filed = await page.request.post("/api/claims", {
    data: { pieceId: piece.id, category: "other", noticedOn: new Date(Date.now() - 86_400_000).toISOString().slice(0, 10), description: "A wobble in one leg (e2e, invented).", answers: { heat: "no", chemicals: "no", impact: "no", usedOutdoors: "no", directSun: "no" } },
  });
  expect(filed.status()).toBe(201);
  const { claim } = (await filed.json()) as { claim: { id: string } };

  await page.goto("/account");
  await page.getByRole("link", { name: "Delete my account…" }).click();
  await expect(page).toHaveURL(/\/account\/delete$/);
  await expect(page.getByText("Your pieces are released")).toBeVisible();
  await expect(page.getByText(title)).toBeVisible();
  await expect(page.getByText(/Open claims are withdrawn and the studio is told \(1 now\)\. Quotes waiting for your answer are declined \(none now\)/)).toBeVisible();
  await shot(page, "delete-375");
  await looksRight(page, "delete page");
  await page.getByLabel("Your password").fill("not my password");
  await page.getByRole("button", { name: "Delete my account" }).click();
  await expect(page.getByText("That isn't your current password.").first()).toBeVisible();
  await page.getByLabel("Your password").fill("a sentence for a password");
  await page.getByRole("button", { name: "Delete my account" }).click();
  await expect(page).toHaveURL(/\/account-deleted$/);
  await expect(page.getByRole("heading", { name: "Your account is deleted" })).toBeVisible();
  // The page's title arrives with the navigation's metadata, a beat after its heading.
  await expect(page).toHaveTitle(/Account deleted/);
  await shot(page, "deleted-375");
  await looksRight(page, "account deleted page");
  await page.goto("/account");
  await expect(page).toHaveURL(/\/sign-in/);
  await page.getByLabel("Email").fill(email);
  await page.getByLabel("Password").fill("a sentence for a password");
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByText("That e-mail and password don't match an account.")).toBeVisible();
  await context.close();

  // The studio: the piece is theirs to hand on, the claim withdrawn with a note from the nameless former owner.
  const detail = (await (await deskPage.request.get(`/api/pieces/${piece.id}`)).json()) as { owner: unknown };
  expect(detail.owner).toBeNull();
  await deskPage.goto(`/studio/claims/${claim.id}`);
  await expect(deskPage.getByText("I deleted my Grainward account, so this claim is withdrawn.", { exact: false })).toBeVisible();
  await expect(deskPage.getByText("Former owner (account deleted)").first()).toBeVisible();
  await desk.close();
});
