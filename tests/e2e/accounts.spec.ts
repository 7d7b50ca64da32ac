import { expect, test, type Page } from "@playwright/test";
import { extractLinks, waitForMail } from "../support/mail";
import { ACCOUNTS, SINK_URL, signIn, signInTo } from "./helpers";

async function signUp(page: Page, email: string, name = "Avery Test (invented)") {
  await page.goto("/sign-up");
  await page.getByLabel("Your name").fill(name);
  await page.getByLabel("Email").fill(email);
  await page.getByLabel("Password").fill("a sentence for a password");
  await page.getByRole("button", { name: "Create account" }).click();
  await expect(page).toHaveURL(/\/verify-email\/sent/);
  await expect(page.getByText(email)).toBeVisible();
}

test("sign up, verify through the e-mail at the sink, land verified; a plain GET of the link (a mail scanner) uses nothing up", async ({ page, playwright }) => {
  const email = `new-${Date.now()}@owners.example`;
  await signUp(page, email);

  const mail = await waitForMail({ to: email, subject: /confirm/i, sinkUrl: SINK_URL });
  const link = extractLinks(mail.text).find((l) => l.includes("/verify-email?"))!;

  // A scanner fetches the link, follows what it is sent to, and runs no script.
  const scanner = await playwright.request.newContext();
  for (let i = 0; i < 2; i++) {
    const res = await scanner.get(link);
    expect(res.status()).toBe(200);
    expect(await res.text()).toContain("Confirm my e-mail address");
  }
  await scanner.dispose();

  await page.goto(link);
  await expect(page).toHaveURL(/\/pieces\?verified=1/);
  await expect(page.getByText("E-mail confirmed")).toBeVisible();

  // The link is single-use.
  await page.goto(link);
  await expect(page.getByText("That link has expired or was already used")).toBeVisible();
});

test("without JavaScript, the button on the link's page confirms the address", async ({ page, browser }) => {
  const email = `nojs-${Date.now()}@owners.example`;
  await signUp(page, email);
  const mail = await waitForMail({ to: email, subject: /confirm/i, sinkUrl: SINK_URL });
  const link = extractLinks(mail.text).find((l) => l.includes("/verify-email?"))!;

  const context = await browser.newContext({ javaScriptEnabled: false });
  const noScript = await context.newPage();
  await noScript.goto(link);
  await expect(noScript).toHaveURL(/\/verify-email\?/);
  await noScript.getByRole("button", { name: "Confirm my e-mail address" }).click();
  await expect(noScript).toHaveURL(/\/pieces\?verified=1/);
  await expect(noScript.getByText("E-mail confirmed")).toBeVisible();
  await context.close();
});

test("signing up with an address that has an account answers exactly as for a new one; the owner is told by mail", async ({ page }) => {
  const fresh = `fresh-${Date.now()}@owners.example`;
  await signUp(page, fresh);
  const newAnswer = (await page.getByRole("main").innerText()).replace(fresh, "<address>");
  const newUrl = page.url().replace(encodeURIComponent(fresh), "<address>");
  await page.context().clearCookies();

  const since = new Date().toISOString();
  await signUp(page, ACCOUNTS.otherOwner, "Someone Else (invented)");
  expect((await page.getByRole("main").innerText()).replace(ACCOUNTS.otherOwner, "<address>")).toBe(newAnswer);
  expect(page.url().replace(encodeURIComponent(ACCOUNTS.otherOwner), "<address>")).toBe(newUrl);

  const mail = await waitForMail({ to: ACCOUNTS.otherOwner, subject: /tried to create/i, sinkUrl: SINK_URL, since });
  expect(mail.text).toMatch(/already has an account/);
  // Nothing changed: the owner still signs in with their own password.
  await signIn(page, ACCOUNTS.otherOwner);
  await expect(page).toHaveURL(/\/pieces$/);
});

test("sign-up form errors show next to their fields and keep what was typed", async ({ page }) => {
  await page.goto("/sign-up");
  await page.getByLabel("Your name").fill("Short Password");
  await page.getByLabel("Email").fill("not-an-email");
  await page.getByLabel("Password").fill("short");
  await page.getByRole("button", { name: "Create account" }).click();
  await expect(page.getByText("Enter an e-mail address like name@example.com.")).toBeVisible();
  await expect(page.getByText("Use at least 10 characters.")).toBeVisible();
  await expect(page.getByLabel("Your name")).toHaveValue("Short Password");
});

test("password reset end to end through the sink; the link works once", async ({ page, browser }) => {
  // A second device signed in before the reset loses its session.
  const other = await browser.newContext();
  const otherPage = await other.newPage();
  await signIn(otherPage, ACCOUNTS.otherOwner);

  await page.goto("/forgot-password");
  await page.getByLabel("Email").fill(ACCOUNTS.otherOwner);
  const since = new Date().toISOString();
  await page.getByRole("button", { name: "Send me a reset link" }).click();
  await expect(page.getByText("Check your inbox")).toBeVisible();

  const mail = await waitForMail({ to: ACCOUNTS.otherOwner, subject: /reset/i, sinkUrl: SINK_URL, since });
  const link = extractLinks(mail.text).find((l) => l.includes("/reset-password?"))!;
  await page.goto(link);
  await page.getByLabel("New password", { exact: true }).fill("grainward-demo");
  await page.getByLabel("New password, again").fill("grainward-demo");
  await page.getByRole("button", { name: "Save the new password" }).click();
  await expect(page).toHaveURL(/\/pieces$/);

  await otherPage.goto("/pieces");
  await expect(otherPage).toHaveURL(/\/sign-in/);
  await other.close();

  await page.goto(link);
  await page.getByLabel("New password", { exact: true }).fill("another-password-1");
  await page.getByLabel("New password, again").fill("another-password-1");
  await page.getByRole("button", { name: "Save the new password" }).click();
  await expect(page.getByText("This reset link has expired or was already used.").first()).toBeVisible();
});

test("an admin invites a technician, who joins from the e-mail", async ({ page, browser }) => {
  const email = `tech-${Date.now()}@larchmere.example`;
  await signInTo(page, ACCOUNTS.admin, "/studio/team");
  // The only admin's own buttons cannot be pressed and look it: faded, where another member's are not.
  const members = page.getByRole("main").getByRole("listitem");
  const ownRemove = members.filter({ hasText: "(you)" }).getByRole("button", { name: "Remove" });
  await expect(ownRemove).toBeDisabled();
  await expect(ownRemove).toHaveCSS("opacity", "0.5");
  await expect(members.filter({ hasText: "Teo Lindqvist" }).getByRole("button", { name: "Remove" })).toHaveCSS("opacity", "1");
  await page.getByLabel("Email", { exact: true }).fill(email);
  await page.getByLabel("Role", { exact: true }).selectOption("technician");
  await page.getByRole("button", { name: "Send invitation" }).click();
  await expect(page.getByText(`Invitation sent to ${email}.`)).toBeVisible();
  await expect(page.getByRole("main").getByRole("listitem").filter({ hasText: email })).toBeVisible();

  const mail = await waitForMail({ to: email, subject: /invited you/i, sinkUrl: SINK_URL });
  const link = extractLinks(mail.text).find((l) => l.includes("/invite/"))!;
  const invitee = await (await browser.newContext()).newPage();
  await invitee.goto(link);
  await invitee.getByLabel("Your name").fill("Sam Birch (invented)");
  await invitee.getByLabel("Password").fill("a long technician password");
  await invitee.getByRole("button", { name: "Join the studio" }).click();
  await expect(invitee).toHaveURL(/\/studio\/today$/);
});

test("an admin withdraws a pending invitation; its link no longer works", async ({ page, browser }) => {
  const email = `withdrawn-${Date.now()}@larchmere.example`;
  await signInTo(page, ACCOUNTS.admin, "/studio/team");
  await page.getByLabel("Email", { exact: true }).fill(email);
  await page.getByLabel("Role", { exact: true }).selectOption("admin");
  await page.getByRole("button", { name: "Send invitation" }).click();
  await expect(page.getByText(`Invitation sent to ${email}.`)).toBeVisible();
  const mail = await waitForMail({ to: email, subject: /invited you/i, sinkUrl: SINK_URL });
  const link = extractLinks(mail.text).find((l) => l.includes("/invite/"))!;

  const waiting = page.getByRole("list", { name: "Invitations waiting" }).getByRole("listitem").filter({ hasText: email });
  await expect(waiting).toContainText("Admin");
  await waiting.getByRole("button", { name: /Withdraw/ }).click();
  await page.getByRole("dialog").getByRole("button", { name: "Withdraw the invitation" }).click();
  await expect(page.getByText(`The invitation for ${email} was withdrawn.`)).toBeVisible();
  await expect(waiting).toHaveCount(0);

  const invitee = await (await browser.newContext()).newPage();
  await invitee.goto(link);
  await expect(invitee.getByText("Expired, withdrawn or already used")).toBeVisible();
  await expect(invitee.getByRole("button", { name: "Join the studio" })).toHaveCount(0);
});
