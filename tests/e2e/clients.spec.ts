// The front desk finds a client, opens their page, corrects the phone and reads what happened with
// them — at 1280 px as staff, with axe on the list and the client page. Then a piece recorded with a
// new buyer: the hand-over mail, the clients CSV export of those invited, and the buyer's one tap
// (sign-up with the address the mail went to, at 375 px, with axe) that registers the piece. Last,
// the bulk hand-over mailing of imported pieces: progress, then what was sent and skipped.
import AxeBuilder from "@axe-core/playwright";
import { expect, test } from "@playwright/test";
import { extractLinks, waitForMail } from "../support/mail";
import { ACCOUNTS, SINK_URL, selectsCutShort, signIn, signInTo, urlEndingWith } from "./helpers";

test.use({ viewport: { width: 1280, height: 900 } });

test("staff find a client, edit the phone and see it on the timeline", async ({ page }) => {
  await signInTo(page, ACCOUNTS.staff, "/studio/clients");
  await expect(page.getByRole("heading", { name: "Clients", level: 1 })).toBeVisible();
  // The demo's owners are the studio's clients from the start.
  await expect(page.getByRole("link", { name: "Jonah Reyes" })).toBeVisible();
  // Links in the list, the client's pieces and the timeline read as links before any hover: underlined,
  // as the other lists' links are (app/studio/plans/page.tsx).
  await expect(page.getByRole("link", { name: "Jonah Reyes" })).toHaveCSS("text-decoration-line", "underline");
  const listAxe = await new AxeBuilder({ page }).analyze();
  expect(listAxe.violations, JSON.stringify(listAxe.violations, null, 2)).toEqual([]);

  await page.getByLabel("Search clients").fill("reyes");
  await expect(page).toHaveURL(/q=reyes/);
  await expect(page.getByText(/^1–1 of 1 client$/)).toBeVisible();
  await page.getByRole("link", { name: "Jonah Reyes" }).click();
  await expect(page.getByRole("heading", { name: "Jonah Reyes", level: 1 })).toBeVisible();

  // A number typed the way it is said; shown back in the studio's (US) national format.
  const form = page.getByRole("form", { name: "Contact details" });
  await form.getByLabel("Phone").fill("503.555.0147");
  await form.getByRole("button", { name: "Save contact details" }).click();
  await expect(page.getByText("Contact details saved.")).toBeVisible();
  await expect(form.getByLabel("Phone")).toHaveValue("(503) 555-0147");
  await expect(page.getByRole("heading", { level: 1 }).locator("..").getByText(/\(503\) 555-0147/)).toBeVisible();

  // An unreadable number is refused on the field, and nothing is lost.
  await form.getByLabel("Phone").fill("12");
  await form.getByRole("button", { name: "Save contact details" }).click();
  await expect(form.getByText(/isn't a phone number we can read/)).toBeVisible();
  await page.reload();
  await expect(page.getByRole("form", { name: "Contact details" }).getByLabel("Phone")).toHaveValue("(503) 555-0147");

  const timeline = page.getByRole("list", { name: "Timeline, newest first" });
  await expect(timeline.getByText(/Client record changed by Teo Lindqvist — phone/)).toBeVisible();
  // What happened before, from the studio's records: deliveries and registrations of their pieces.
  await expect(timeline.getByText(/^Delivered “/).first()).toBeVisible();
  await expect(timeline.getByText(/^Registered “.*” in Grainward$/).first()).toBeVisible();
  await expect(timeline.getByRole("link").first()).toHaveCSS("text-decoration-line", "underline");
  const theirPieces = page.getByRole("heading", { name: "Their pieces" }).locator("..");
  await expect(theirPieces.getByRole("link").first()).toHaveCSS("text-decoration-line", "underline");
  // The consent Jonah gave when registering reads as a sentence: the source's label is lower-cased
  // at its first letter only, so the product's name keeps its capital.
  const consents = page.getByRole("list", { name: "Consent history, newest first" });
  await expect(consents.getByText(/^Agreed to service mail — in their Grainward account, /)).toBeVisible();
  // A time on the timeline names its zone, the viewer's own included ("… at 10:23 PST").
  await expect(timeline.locator("time").filter({ hasText: /\d{2}:\d{2}/ }).first()).toHaveText(/\d{2}:\d{2} [A-Z][A-Za-z0-9+\-]*$/);

  // A link with a filter the list does not have opens the whole list; a page past the end goes to the
  // last page (was "Some fields need a second look." and "4901–4900 of 2 clients · No clients yet.").
  await page.goto("/studio/clients?filter=bogus&sort=sideways");
  await expect(page.getByRole("link", { name: "Jonah Reyes" })).toBeVisible();
  await page.goto("/studio/clients?page=99");
  await expect(page.getByRole("link", { name: "Jonah Reyes" })).toBeVisible();
  await expect(page).toHaveURL(/\/studio\/clients$/);
  await expect(page.getByText(/^1–\d+ of \d+ clients?$/)).toBeVisible();
  await expect(page.getByText("No clients yet.")).toHaveCount(0);

  // A search too long to run says why, in the field's words.
  await page.goto(`/studio/clients?q=${"a".repeat(201)}`);
  await expect(page.getByText("Check the search")).toBeVisible();
  await expect(page.getByText("Search for at most 200 characters.", { exact: true })).toBeVisible();
  await expect(page.getByText("Some fields need a second look")).toHaveCount(0);

  // Search by the new number's digits finds them.
  await page.goto("/studio/clients?q=5550147");
  await expect(page.getByRole("link", { name: "Jonah Reyes" })).toBeVisible();

  await page.goto(page.url().replace(/\/studio\/clients.*/, "/studio/clients"));
  await page.getByRole("link", { name: "Jonah Reyes" }).click();
  await expect(timeline.first()).toBeVisible();
  // Every select on the client page shows its chosen words whole, at 1280 px (in the side column) and at
  // 375 px: the studio's zone, the consent form's, and no select cutting a plan's price ("…$151.90 a ye").
  await expect(page.getByRole("group", { name: "Plan" }).first().getByRole("radio").first()).toBeChecked();
  for (const width of [1280, 375]) {
    await page.setViewportSize({ width, height: 900 });
    expect(await selectsCutShort(page.locator("main"), "selected"), `at ${width} px`).toEqual([]);
  }
  await page.setViewportSize({ width: 1280, height: 900 });
  await expect(page.getByRole("form", { name: "Contact details" }).getByText(/^The studio’s is .+\.$/)).toBeVisible();
  // A select's hint is read out with it, as a text field's is (components/ui/field.tsx).
  await expect(page.getByRole("form", { name: "Contact details" }).getByLabel("Time zone")).toHaveAccessibleDescription(/^The studio’s is .+\.$/);
  const pageAxe = await new AxeBuilder({ page }).analyze();
  expect(pageAxe.violations, JSON.stringify(pageAxe.violations, null, 2)).toEqual([]);
});

test("a piece recorded with a new buyer sends the hand-over mail; the export lists them; one tap registers it", async ({ page, browser }) => {
  const word = `Quill${Date.now().toString(36)}`;
  const title = `${word} hall bench (e2e)`;
  const buyer = `Tamsin ${word} (invented)`;
  const email = `${word.toLowerCase()}@buyer.example`;
  await signInTo(page, ACCOUNTS.staff, "/studio/pieces/new");
  await page.getByLabel("Title").fill(title);
  await page.getByLabel("Kind").selectOption("bench");
  // The demo studio works in inches.
  await page.getByLabel("Length").fill("55");
  await page.getByLabel("Width").fill("14");
  await page.getByRole("combobox", { name: "Primary species" }).fill("juglans");
  await page.getByRole("option", { name: /Black walnut/ }).click();
  await page.getByRole("button", { name: "Add a layer" }).click();
  await page.getByRole("radio", { name: /A new client/ }).check();
  // The buyer's name is asked for, beside its field, and nothing typed is lost.
  await page.getByRole("button", { name: "Record piece" }).click();
  await expect(page.getByText("Enter the buyer's name.")).toBeVisible();
  await expect(page.getByLabel("Title")).toHaveValue(title);
  await page.getByLabel("Buyer's name").fill(buyer);
  await page.getByLabel("Buyer's e-mail").fill(email);
  await page.getByLabel("Buyer's phone").fill("(415) 555-0163");
  await page.getByLabel(/They agreed to service mail/).check();
  await expect(page.getByLabel(/Send them the hand-over mail now/)).toBeChecked();
  const formAxe = await new AxeBuilder({ page }).analyze();
  expect(formAxe.violations, JSON.stringify(formAxe.violations, null, 2)).toEqual([]);
  await page.getByRole("button", { name: "Record piece" }).click();
  await expect(page.getByText(/The hand-over mail is on its way to the buyer/)).toBeVisible();
  await expect(page).toHaveURL(/\/studio\/pieces\/[0-9a-f-]{36}$/);
  const pieceId = page.url().split("/").pop()!;

  const card = page.getByRole("heading", { name: "Hand-over mail" }).locator("..");
  await expect(card.getByRole("link", { name: buyer })).toBeVisible();
  await expect(card.getByRole("definition").first()).toContainText(/\d{4}.* \d{2}:\d{2} \S+/); // sent, with its zone
  await expect(card.getByText("Not yet")).toHaveCount(2);
  const pieceAxe = await new AxeBuilder({ page }).analyze();
  expect(pieceAxe.violations, JSON.stringify(pieceAxe.violations, null, 2)).toEqual([]);

  // The clients list: invited, exported as CSV with the filter.
  await page.goto("/studio/clients?filter=invited");
  await expect(page.getByRole("link", { name: buyer })).toBeVisible();
  const download = page.waitForEvent("download");
  await page.getByRole("link", { name: "Export these as CSV" }).click();
  const csv = await (await download).createReadStream().then(async (stream) => {
    const chunks: Buffer[] = [];
    for await (const c of stream) chunks.push(c as Buffer);
    return Buffer.concat(chunks).toString("utf8");
  });
  expect(csv).toContain(buyer);
  expect(csv).toContain(email);
  expect(csv).not.toContain("Jonah Reyes"); // registered owners are not "invited"

  // The buyer, on a phone: the mail's link, sign-up with that address, confirm, one tap.
  const mail = await waitForMail({ to: email, subject: /its care and warranty/, sinkUrl: SINK_URL });
  expect(mail.text).toContain(title);
  const link = extractLinks(mail.text).find((l) => l.includes("/hand-over/"))!;
  const phone = await browser.newContext({ viewport: { width: 375, height: 812 }, baseURL: new URL(page.url()).origin });
  const owner = await phone.newPage();
  const path = new URL(link).pathname;
  await owner.goto(path);
  await expect(owner.getByRole("heading", { name: title })).toBeVisible();
  await expect(owner.getByText(email)).toBeVisible();
  const landingAxe = await new AxeBuilder({ page: owner }).analyze();
  expect(landingAxe.violations, JSON.stringify(landingAxe.violations, null, 2)).toEqual([]);
  await owner.getByRole("link", { name: "Create an account and register" }).click();
  await owner.getByLabel("Your name").fill(buyer);
  await owner.getByLabel("Email").fill(email);
  await owner.getByLabel("Password").fill("a sentence for a password");
  await owner.getByRole("button", { name: "Create account" }).click();
  await expect(owner).toHaveURL(/\/verify-email\/sent/);
  const confirm = await waitForMail({ to: email, subject: /confirm/i, sinkUrl: SINK_URL });
  const confirmLink = extractLinks(confirm.text).find((l) => l.includes("/verify-email?"))!;
  await owner.goto(new URL(confirmLink).pathname + new URL(confirmLink).search);
  await expect(owner).toHaveURL(urlEndingWith(path));
  await owner.getByRole("button", { name: "Register this piece to my account" }).click();
  await expect(owner).toHaveURL(new RegExp(`/pieces/${pieceId}`));
  await expect(owner.getByRole("heading", { level: 1, name: title })).toBeVisible();
  const ownerAxe = await new AxeBuilder({ page: owner }).analyze();
  expect(ownerAxe.violations, JSON.stringify(ownerAxe.violations, null, 2)).toEqual([]);
  await phone.close();

  // The studio sees it registered through the link, and the buyer's client has the account.
  await page.goto(`/studio/pieces/${pieceId}`);
  await expect(page.getByRole("heading", { name: "Hand-over mail" }).locator("..").getByText("Not yet")).toHaveCount(0);
  await page.getByRole("link", { name: buyer }).first().click();
  await expect(page.getByText(/has a Grainward account/)).toBeVisible();
});

test("bulk hand-over mail: staff pick imported pieces, follow the mailing, and read what was sent and skipped", async ({ page }) => {
  const word = `Sorrel${Date.now().toString(36)}`;
  const yes = `${word.toLowerCase()}-yes@buyer.example`;
  const no = `${word.toLowerCase()}-no@buyer.example`;
  await signIn(page, ACCOUNTS.staff);
  // Two past deliveries imported with their buyers, no mail yet: one agreed to service mail, one did not.
  const csv = [
    "title,kind,shape,length_mm,width_mm,primary_species,use,delivered_on,finish_stack,buyer_name,buyer_email,buyer_phone,buyer_service_mail_on",
    `${word} settle (e2e),bench,rectangle,1400,400,black_walnut,moderate,2025-03-01,top:hardwax_oil:2:2025-03-01,Ada ${word} (invented),${yes},,2025-03-01`,
    `${word} stool (e2e),bench,rectangle,500,300,black_walnut,moderate,2025-03-01,top:hardwax_oil:2:2025-03-01,Bo ${word} (invented),${no},,`,
  ].join("\n");
  const imported = await page.request.post("/api/pieces/import", { data: { csv, commit: true, sendHandover: false } });
  expect(imported.status()).toBe(201);

  await page.goto("/studio/clients");
  await page.getByRole("link", { name: "Hand-over mail" }).click();
  await expect(page.getByRole("heading", { name: "Hand-over mail", level: 1 })).toBeVisible();
  await expect(page.getByRole("row", { name: new RegExp(`${word} stool`) })).toContainText("No consent to service mail");
  await expect(page.getByRole("row", { name: new RegExp(`${word} stool`) }).getByRole("link").first()).toHaveCSS("text-decoration-line", "underline");
  const listAxe = await new AxeBuilder({ page }).analyze();
  expect(listAxe.violations, JSON.stringify(listAxe.violations, null, 2)).toEqual([]);

  await page.getByRole("checkbox", { name: `Pick ${word} settle (e2e)` }).check();
  await page.getByRole("checkbox", { name: `Pick ${word} stool (e2e)` }).check();
  await page.getByRole("button", { name: "Send to the 2 picked" }).click();
  await expect(page.getByRole("heading", { name: "Mailing finished" })).toBeVisible({ timeout: 20_000 });
  await expect(page.getByTestId("mailing-count")).toHaveText("2 of 2 done");
  await expect(page.getByRole("progressbar", { name: "Hand-over mail sent so far" })).toBeVisible();
  await expect(page.getByTestId("mailing-sent")).toHaveText("1");
  await expect(page.getByTestId("mailing-skipped")).toContainText("No consent to service mail: 1");
  await expect(page.getByTestId("mailing-failed")).toHaveText("0");
  const doneAxe = await new AxeBuilder({ page }).analyze();
  expect(doneAxe.violations, JSON.stringify(doneAxe.violations, null, 2)).toEqual([]);

  const mail = await waitForMail({ to: yes, subject: /its care and warranty/, sinkUrl: SINK_URL });
  expect(mail.text).toContain(`${word} settle (e2e)`);
  // The sent piece leaves the list; the one without consent stays until it can get the mail.
  await expect(page.getByRole("row", { name: new RegExp(`${word} settle`) })).toHaveCount(0);
  await expect(page.getByRole("row", { name: new RegExp(`${word} stool`) })).toBeVisible();
});

test("a client added at the desk: their page leads to recording a piece with them already picked as the buyer", async ({ page }) => {
  const word = `Rowan${Date.now().toString(36)}`;
  const name = `Ilse ${word} (invented)`;
  const title = `${word} side table (e2e)`;
  await signInTo(page, ACCOUNTS.staff, "/studio/clients/new");
  await page.getByLabel("Name").fill(name);
  await page.getByLabel("E-mail").fill(`${word.toLowerCase()}@desk.example`);
  await page.getByRole("button", { name: "Add client" }).click();
  await expect(page.getByRole("heading", { name, level: 1 })).toBeVisible();
  const theirs = page.getByRole("heading", { name: "Their pieces" }).locator("..");
  await expect(theirs.getByText(/once you record it with them as the buyer/)).toBeVisible();
  await theirs.getByRole("link", { name: "Record a piece they bought" }).click();

  await expect(page).toHaveURL(/\/studio\/pieces\/new\?client=/);
  await expect(page.getByRole("radio", { name: /A client already on record/ })).toBeChecked();
  await expect(page.getByText(`Buyer: ${name}`)).toBeVisible();
  await page.getByLabel("Title").fill(title);
  await page.getByLabel("Length").fill("20");
  await page.getByLabel("Width").fill("20");
  await page.getByRole("combobox", { name: "Primary species" }).fill("juglans");
  await page.getByRole("option", { name: /Black walnut/ }).click();
  await page.getByRole("button", { name: "Record piece" }).click();
  await expect(page).toHaveURL(/\/studio\/pieces\/[0-9a-f-]{36}$/);
  await page.getByRole("heading", { name: "Hand-over mail" }).locator("..").getByRole("link", { name }).click();
  await expect(page.getByRole("heading", { name: "Their pieces" }).locator("..").getByRole("link", { name: title })).toBeVisible();

  // An id of no client of this studio picks nobody: the form opens as for any new piece.
  await page.goto("/studio/pieces/new?client=00000000-0000-4000-8000-000000000000");
  await expect(page.getByRole("radio", { name: /Not recorded yet/ })).toBeChecked();

  // The same address typed again for a "new" client: refused on the field, with the client who has it one tap away.
  await page.goto("/studio/clients/new");
  await page.getByLabel("Name").fill(`Ilse ${word} again (invented)`);
  await page.getByLabel("E-mail").fill(`${word.toLowerCase()}@desk.example`);
  await page.getByRole("button", { name: "Add client" }).click();
  await expect(page.getByText("Another client of this studio has that e-mail address.")).toBeVisible();
  await expect(page.getByLabel("Name")).toHaveValue(`Ilse ${word} again (invented)`);
  await page.getByRole("link", { name: `Open ${name}'s record` }).click();
  await expect(page.getByRole("heading", { name, level: 1 })).toBeVisible();
});
