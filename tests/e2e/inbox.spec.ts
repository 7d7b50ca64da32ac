// Conversations end to end: the owner at 375 px writes to the studio on their repair job; the front
// desk at 1280 px finds it unread in the inbox, assigns it, answers on the same thread; the owner's
// answer by e-mail (sent over SMTP to the inbound listener, to the Reply-To of the mail they got)
// lands in the thread; the owner reads the studio's reply on the job page. Axe on every page.
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import nodemailer from "nodemailer";
import { ACCOUNTS, fixture, PORTS, SINK_URL, signInTo } from "./helpers";

const INBOUND_PORT = PORTS.inbound; // scripts/e2e-config.mjs
const STUDIO = "Larchmere Slab & Resin";

async function axe(page: Page, what: string) {
  const result = await new AxeBuilder({ page }).analyze();
  expect(result.violations, `${what}: ${JSON.stringify(result.violations, null, 2)}`).toEqual([]);
}

type Summary = { id: string; subject: string; receivedAt: string; headers: Record<string, string>; text: string };

async function mailTo(address: string, subject: RegExp, since: number): Promise<Summary> {
  let found: Summary | undefined;
  await expect
    .poll(async () => {
      const list = (await (await fetch(`${SINK_URL}/messages?to=${encodeURIComponent(address)}`)).json()) as Summary[];
      found = list.find((m) => subject.test(m.subject) && Date.parse(m.receivedAt) >= since);
      return !!found;
    })
    .toBe(true);
  return found!;
}

test("an owner's message reaches the inbox; the answer goes back on the same thread, and a reply by e-mail lands in it", async ({ browser }) => {
  const jobId = fixture().jobs.paid!;
  const stamp = Date.now().toString(36);
  const question = `Can the top take a hot mug yet? (e2e ${stamp})`;
  const answer = `Use a coaster for another two weeks, then it is fine. (e2e ${stamp})`;
  const emailed = `Thank you, coasters it is. (e2e ${stamp})`;

  // The owner on a phone writes on the job page.
  const ownerCtx = await browser.newContext({ viewport: { width: 375, height: 812 } });
  const owner = await ownerCtx.newPage();
  await signInTo(owner, ACCOUNTS.owner, `/jobs/${jobId}`);
  await expect(owner.getByRole("heading", { name: `Messages with ${STUDIO}` })).toBeVisible();
  await owner.getByLabel(`Message to ${STUDIO}`).fill(question);
  await owner.getByRole("button", { name: "Send message" }).click();
  await expect(owner.getByText(`Message sent to ${STUDIO}.`)).toBeVisible();
  await expect(owner.getByText(question)).toBeVisible();
  const { scroll, width } = await owner.evaluate(() => ({ scroll: document.documentElement.scrollWidth, width: window.innerWidth }));
  expect(scroll, "the job page scrolls sideways at 375 px").toBeLessThanOrEqual(width);
  await axe(owner, "owner's job page");

  // The front desk sees it unread, with who, which piece and how long it has waited.
  const deskCtx = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  const desk = await deskCtx.newPage();
  await signInTo(desk, ACCOUNTS.staff, "/studio/inbox");
  await expect(desk.getByRole("heading", { name: "Inbox", level: 1 })).toBeVisible();
  await expect(desk.getByRole("link", { name: /^Inbox \d+ unread$/ })).toBeVisible();
  const row = desk.getByRole("list", { name: "Conversations" }).getByRole("listitem").filter({ hasText: question });
  await expect(row.getByText("Unread")).toBeVisible();
  await expect(row.getByText(/Repair job · waiting (under a minute|\d+ (min|h)), since .*(GMT|UTC|PST|PDT)/)).toBeVisible();
  await axe(desk, "inbox");

  // Opening it takes it out of unread, and the header's count follows.
  const header = desk.getByRole("banner").getByRole("link", { name: /^Inbox/ });
  const unreadBefore = Number((await header.textContent())?.match(/\d+/)?.[0] ?? "0");
  expect(unreadBefore).toBeGreaterThan(0);
  await row.getByRole("link").click();
  await expect(desk.getByRole("heading", { level: 1 })).toContainText("The Holloway household");
  await expect(desk.getByText("Open", { exact: true })).toBeVisible();
  await expect(header).toHaveText(unreadBefore === 1 ? "Inbox" : `Inbox${unreadBefore - 1} unread`);
  await desk.getByLabel("Assigned to").selectOption({ label: "Teo Lindqvist" });
  await expect(desk.getByText("Assigned to Teo Lindqvist.")).toBeVisible();
  const since = Date.now() - 1000;
  await desk.getByLabel("Reply to The Holloway household").fill(answer);
  await desk.getByRole("button", { name: "Send reply" }).click();
  await expect(desk.getByText("Reply sent to The Holloway household.")).toBeVisible();
  await expect(desk.getByText(answer)).toBeVisible();
  await axe(desk, "conversation");

  // The owner answers the mail from their mail program: to the thread's own Reply-To.
  const mail = await mailTo(ACCOUNTS.owner, /^New message from/, since);
  expect(mail.text).toContain(answer);
  const replyTo = mail.headers["reply-to"]!.match(/reply\+[^\s<>,"]+/)![0];
  const smtp = nodemailer.createTransport({ host: "127.0.0.1", port: INBOUND_PORT, secure: false, ignoreTLS: true });
  await smtp.sendMail({ from: ACCOUNTS.owner, to: replyTo, subject: `Re: ${mail.subject}`, text: `${emailed}\n\nOn a weekday, ${STUDIO} wrote:\n> ${answer}\n` });
  smtp.close();

  await desk.goto("/studio/inbox");
  const again = desk.getByRole("list", { name: "Conversations" }).getByRole("listitem").filter({ hasText: emailed });
  await expect(again.getByText("Unread")).toBeVisible();
  await again.getByRole("link").click();
  await expect(desk.getByText(emailed)).toBeVisible();
  await expect(desk.getByText(/by e-mail/)).toBeVisible();
  await expect(desk.getByText(`On a weekday, ${STUDIO} wrote:`)).toHaveCount(0);
  await desk.getByRole("button", { name: "Mark done" }).click();
  await expect(desk.getByText("Marked done.")).toBeVisible();

  // The owner reads the studio's answer and their own e-mailed one on the job page.
  await owner.reload();
  await expect(owner.getByText(answer)).toBeVisible();
  await expect(owner.getByText(emailed)).toBeVisible();
  await axe(owner, "owner's job page with the answer");
  await ownerCtx.close();
  await deskCtx.close();
});
