import { expect, test } from "@playwright/test";
import { extractLinks, waitForMail } from "../support/mail";
import { ACCOUNTS, SINK_URL, signIn } from "./helpers";

test("sign up, verify through the e-mail at the sink, land verified", async ({ page }) => {
  const email = `new-${Date.now()}@owners.example`;
  await page.goto("/sign-up");
  await page.getByLabel("Your name").fill("Avery Test (invented)");
  await page.getByLabel("Email").fill(email);
  await page.getByLabel("Password").fill("a sentence for a password");
  await page.getByRole("button", { name: "Create account" }).click();
  await expect(page).toHaveURL(/\/verify-email\/sent/);
  await expect(page.getByText(email)).toBeVisible();

  const mail = await waitForMail({ to: email, subject: /confirm/i, sinkUrl: SINK_URL });
  const link = extractLinks(mail.text).find((l) => l.includes("/verify-email?"))!;
  await page.goto(link);
  await expect(page).toHaveURL(/\/pieces\?verified=1/);
  await expect(page.getByText("E-mail confirmed")).toBeVisible();

  // The link is single-use.
  await page.goto(link);
  await expect(page.getByText("That link has expired or was already used")).toBeVisible();
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
  await signIn(page, ACCOUNTS.admin);
  await page.goto("/studio/team");
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
