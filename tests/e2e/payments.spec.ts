// The owner approves a quote and pays on the Stripe fake's hosted page with a test card.
import { expect, test } from "@playwright/test";
import { extractLinks, waitForMail } from "../support/mail";
import { ACCOUNTS, PORTS, SINK_URL, fakeKnob, fixture, signIn, signInTo } from "./helpers";

test("owner approves a quote, pays with the success card, returns and sees the job paid; staff cancel and refund it", async ({ page, browser }) => {
  const jobId = fixture().jobs.quoted!;
  await signInTo(page, ACCOUNTS.otherOwner, "/jobs");
  await page.getByRole("link", { name: /Re-wax the desk top/ }).click();
  await expect(page.getByText("Quote sent")).toBeVisible();
  await page.getByRole("button", { name: "Approve and pay" }).click();

  await expect(page).toHaveURL(new RegExp(`127\\.0\\.0\\.1:${PORTS.stripe}/pay/cs_test_`));
  await expect(page.getByRole("heading", { name: /Pay .* USD/ })).toBeVisible();
  // A declined card first: the page says so and the job stays unpaid.
  await page.getByLabel("Card number").fill("4000 0000 0000 0002");
  await page.getByRole("button", { name: "Pay", exact: true }).click();
  await expect(page.getByRole("alert")).toContainText("Your card was declined.");

  await page.getByLabel("Card number").fill("4242 4242 4242 4242");
  await page.getByRole("button", { name: "Pay", exact: true }).click();
  await expect(page).toHaveURL(new RegExp(`/jobs/${jobId}\\?checkout=success`));
  await expect(page.getByText("Paid — thank you")).toBeVisible();
  await expect(page.getByText("Paid", { exact: true }).first()).toBeVisible(); // the state badge (the receipt's table says it too)

  const receipt = await waitForMail({ to: ACCOUNTS.otherOwner, subject: /receipt/i, sinkUrl: SINK_URL });
  expect(extractLinks(receipt.text).some((l) => l.includes(`/jobs/${jobId}`))).toBe(true);

  // Staff give back a part of the payment while the job stays paid: the amount and a reason the owner reads, confirmed first.
  const desk = await (await browser.newContext()).newPage();
  await signInTo(desk, ACCOUNTS.staff, `/studio/jobs/${jobId}`);
  const giveBack = desk.getByRole("heading", { name: "Money given back" }).locator("..");
  await expect(giveBack).toContainText(/Up to \$[\d,.]+ can still be given back\. The job stays “Paid”\./);
  await giveBack.getByLabel("Amount to give back (USD)").fill("10");
  await giveBack.getByRole("button", { name: "Give money back…" }).click();
  await expect(giveBack.getByRole("alert")).toHaveText("Say why the money is given back: the owner reads it.");
  await giveBack.getByLabel("Reason (the owner reads it)").fill("The wax was applied to the top only, not the legs.");
  await giveBack.getByRole("button", { name: "Give money back…" }).click();
  // The confirmation quotes the reason as typed, its own full stop the last mark ('… legs.”.' before).
  await expect(giveBack.getByText("“The wax was applied to the top only, not the legs.”", { exact: true })).toBeVisible();
  await giveBack.getByRole("button", { name: "Give back $10.00" }).click();
  await expect(desk.getByText("$10.00 is on its way back to the owner's card.")).toBeVisible();
  await expect(giveBack.getByRole("listitem").first()).toContainText(/\d{4}(,| at) \d{2}:\d{2} [A-Z]{3,4}\s*The wax was applied to the top only, not the legs\.\s*\$10\.00/);
  await expect(desk.getByText("Paid", { exact: true }).first()).toBeVisible();
  // Through the route itself: a body that isn't a refund is a 400 in words, a stale confirmation a 409; neither moves money.
  const bad = await desk.request.post(`/api/jobs/${jobId}/refund`, { data: { version: 1, refundableMinor: 100, amountMinor: "ten", reason: "" } });
  expect(bad.status()).toBe(400);
  expect((await bad.json()).error.fieldErrors).toMatchObject({ amountMinor: ["Enter the amount to give back."], reason: ["Say why the money is given back: the owner reads it."] });
  const stale = await desk.request.post(`/api/jobs/${jobId}/refund`, { data: { version: 0, refundableMinor: 100, amountMinor: 100, reason: "Sent from a page left open." } });
  expect(stale.status()).toBe(409);
  expect((await stale.json()).error.message).toMatch(/^(The job changed since this page was opened|What can still be given back isn't the amount shown), so nothing was given back\. Reload to see it as it is now\.$/);
  const refundMail = await waitForMail({ to: ACCOUNTS.otherOwner, subject: /gave back \$10\.00/, sinkUrl: SINK_URL });
  expect(refundMail.text).toContain("The wax was applied to the top only, not the legs.");
  await page.goto(`/jobs/${jobId}`);
  await expect(page.getByRole("status").filter({ hasText: "gave back $10.00" })).toContainText("Their reason: The wax was applied to the top only, not the legs. Refunds usually show");
  // A repair's page leads back to the list, as a claim's does (it had no way back but the menu).
  await page.getByRole("link", { name: "← My repairs" }).click();
  await expect(page).toHaveURL(/\/jobs$/);
  await expect(page.getByRole("link", { name: /Re-wax the desk top/ })).toContainText(/\$[\d,.]+ paid, \$10\.00 refunded/);

  // The payment service does not answer a second refund: the page says it can't tell yet, keeps the $5.00
  // set aside as being paid back, and "Finish giving back" asks again with the same key.
  expect((await fakeKnob("fail-next", { method: "POST", path: "/v1/refunds" })).status).toBe(200);
  await giveBack.getByLabel("Amount to give back (USD)").fill("5");
  await giveBack.getByLabel("Reason (the owner reads it)").fill("Delivery came a day late.");
  await giveBack.getByRole("button", { name: "Give money back…" }).click();
  await giveBack.getByRole("button", { name: "Give back $5.00" }).click();
  await expect(giveBack.getByRole("alert")).toContainText("The payment service didn't answer, so we can't tell yet whether $5.00 went back.");
  const pendingRow = giveBack.getByRole("listitem").filter({ hasText: "Delivery came a day late." });
  await expect(pendingRow).toContainText("Being paid back");
  await pendingRow.getByRole("button", { name: "Finish giving back" }).click();
  await expect(desk.getByText("The payment service confirmed the refund.")).toBeVisible();
  await expect(pendingRow).toContainText(/\d{4}(,| at) \d{2}:\d{2} [A-Z]{3,4}\s*Delivery came a day late\.\s*\$5\.00/);
  await expect(pendingRow.getByRole("button", { name: "Finish giving back" })).toHaveCount(0);
  await waitForMail({ to: ACCOUNTS.otherOwner, subject: /gave back \$5\.00/, sinkUrl: SINK_URL });

  // Staff cancel the paid job: the app's own dialog asks first (a browser confirm() box would be
  // dismissed here and the button would seem dead), saying the payment is refunded.
  let browserDialog = "";
  desk.on("dialog", (d) => {
    browserDialog = d.message();
    void d.dismiss();
  });
  await desk.getByRole("button", { name: "Cancel and refund" }).click();
  const ask = desk.getByRole("dialog", { name: "Cancel this job and refund the owner?" });
  await expect(ask).toBeVisible();
  await ask.getByRole("button", { name: "Keep the job" }).click();
  await expect(ask).toBeHidden();
  await desk.getByRole("button", { name: "Cancel and refund" }).click();
  await ask.getByRole("button", { name: "Cancel and refund" }).click();
  await expect(desk.getByText("Job cancelled; the refund is on its way.")).toBeVisible();
  expect(browserDialog).toBe("");
  await waitForMail({ to: ACCOUNTS.otherOwner, subject: /^Refund from/, sinkUrl: SINK_URL });
  // Staff read the cancelled job's total as quoted, not as still to pay.
  await desk.reload();
  await expect(desk.getByText("Quoted (nothing to pay)", { exact: true })).toBeVisible();
  await expect(desk.getByText("To pay", { exact: true })).toHaveCount(0);
  // The closed quote is read only: no edit controls that could not act beside that sentence.
  await expect(desk.getByText("This quote can no longer be changed.")).toBeVisible();
  await expect(desk.getByRole("button", { name: /^Remove line/ })).toHaveCount(0);
  await expect(desk.getByRole("button", { name: "Add a typed line" })).toHaveCount(0);
  await expect(desk.getByRole("button", { name: "Propose lines" })).toHaveCount(0);
  await expect(desk.getByRole("textbox", { name: "Job title" })).toHaveCount(0);
  await desk.context().close();

  // The owner's page says the studio refunded them, and no longer asks them to pay the cancelled job.
  await page.goto(`/jobs/${jobId}`);
  await expect(page.getByText("Cancelled", { exact: true })).toBeVisible();
  await expect(page.getByRole("status").filter({ hasText: "Payment refunded" })).toContainText(/We refunded the rest of your payment, \$[\d,.]+: the job was cancelled\./);
  await expect(page.getByText("To pay", { exact: true })).toHaveCount(0);
  await expect(page.getByText("Quoted (nothing to pay)", { exact: true })).toBeVisible();
  // The job had a payment: its receipt is still offered, and the list of repairs says the money went back.
  await expect(page.getByRole("link", { name: "Download your receipt (PDF)" })).toBeVisible();
  const receiptPdf = await page.request.get(`/api/jobs/${jobId}/receipt`);
  expect(receiptPdf.status()).toBe(200);
  expect(receiptPdf.headers()["content-type"]).toBe("application/pdf");
  await page.goto("/jobs");
  await expect(page.getByRole("link", { name: /Re-wax the desk top/ })).toContainText(/Refunded \$[\d,.]+/);
});

test("cancelling on the payment page comes back with a clear message and nothing charged", async ({ page }) => {
  const jobId = fixture().jobs.approved!;
  await signInTo(page, ACCOUNTS.otherOwner, `/jobs/${jobId}`);
  await page.getByRole("button", { name: "Pay now" }).click();
  await expect(page).toHaveURL(/\/pay\/cs_test_/);
  await page.getByRole("button", { name: "Cancel and go back" }).click();
  await expect(page).toHaveURL(new RegExp(`/jobs/${jobId}\\?checkout=cancelled`));
  await expect(page.getByText("Payment not completed")).toBeVisible();
  await expect(page.getByText("Your card was not charged.")).toBeVisible();

  // Declining the quote asks first in the app's own dialog; "Keep the quote" leaves it as it was.
  page.on("dialog", (d) => void d.dismiss());
  await page.getByRole("button", { name: "Decline the quote" }).click();
  const ask = page.getByRole("dialog", { name: "Decline this quote?" });
  await expect(ask).toBeVisible();
  // It says what follows (it said only "The studio will be told.").
  await expect(ask).toContainText("The repair is closed and nothing is charged.");
  await ask.getByRole("button", { name: "Keep the quote" }).click();
  await expect(ask).toBeHidden();
  await page.getByRole("button", { name: "Decline the quote" }).click();
  await ask.getByRole("button", { name: "Decline the quote" }).click();
  await expect(page.getByText("Quote declined.")).toBeVisible();
});

test("staff see the studio's jobs by state and another owner cannot open a job", async ({ page, browser }) => {
  await signInTo(page, ACCOUNTS.staff, "/studio/jobs?state=draft");
  await expect(page.getByRole("link", { name: /Inspect the island's film finish/ })).toBeVisible();
  await expect(page.getByRole("link", { name: /Re-wax the desk top/ })).toHaveCount(0);
  // A state the list does not have (an old or mistyped link) shows every job, not "Some fields need a second look."
  await page.goto("/studio/jobs?state=bogus");
  await expect(page.getByRole("link", { name: /Re-wax the desk top/ })).toBeVisible();
  await expect(page.getByText("Couldn't load the jobs")).toHaveCount(0);

  const other = await (await browser.newContext()).newPage();
  await signIn(other, ACCOUNTS.owner);
  const res = await other.request.get(`/api/jobs/${fixture().jobs.quoted}`);
  expect(res.status()).toBe(404);
});
