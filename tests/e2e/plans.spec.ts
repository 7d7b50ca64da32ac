// Care plans end to end: an owner at 375 px buys a plan for a piece through the Stripe fake's hosted
// checkout (subscription mode); the signed webhook makes the plan run; staff then see it on the
// client's page and on the overview. Axe checks each page.
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import { ACCOUNTS, PORTS, signIn, signInTo } from "./helpers";

async function noAxeViolations(page: Page) {
  const axe = await new AxeBuilder({ page }).analyze();
  expect(axe.violations, JSON.stringify(axe.violations, null, 2)).toEqual([]);
}

test.describe("care plans", () => {
  test.describe.configure({ mode: "serial" });
  let pieceTitle = "";

  test("an owner buys a plan for a piece at 375 px through the fake's checkout page", async ({ browser }) => {
    const context = await browser.newContext({ viewport: { width: 375, height: 812 }, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    await signIn(page, ACCOUNTS.owner);
    // A piece of theirs that plans fit and that runs under none yet.
    const { pieces } = (await (await page.request.get("/api/me/pieces")).json()) as { pieces: { id: string; title: string }[] };
    let target: { id: string; title: string; plan: string } | null = null;
    for (const p of pieces) {
      const res = (await (await page.request.get(`/api/plans?pieceId=${p.id}`)).json()) as { current: unknown; offers: { name: string }[] };
      if (!res.current && res.offers.length) {
        target = { id: p.id, title: p.title, plan: res.offers[0]!.name };
        break;
      }
    }
    expect(target, "an owner's piece with a fitting plan").not.toBeNull();
    pieceTitle = target!.title;
    await page.goto(`/pieces/${target!.id}`);
    const section = page.getByRole("region", { name: "Care plan" });
    await expect(section.getByText(target!.plan).first()).toBeVisible();
    await noAxeViolations(page);
    // What the offer says it costs and gives, to find again on the plan once it runs.
    const offer = section.getByRole("listitem").filter({ has: page.getByRole("button", { name: `Start ${target!.plan}` }) });
    const price = (await offer.getByText(/^\$[\d,.]+ a (year|month)/).innerText()).replace(/ \(including .*\)$/, "");
    const gives = await offer.locator("ul li").allInnerTexts();
    expect(gives.length).toBeGreaterThan(0);
    await section.getByRole("button", { name: `Start ${target!.plan}` }).click();

    await expect(page).toHaveURL(new RegExp(`127\\.0\\.0\\.1:${PORTS.stripe}/pay/cs_test_`));
    await page.getByLabel("Card number").fill("4242 4242 4242 4242");
    await page.getByRole("button", { name: "Pay", exact: true }).click();
    // Back on the piece page: a word that the plan is paid, and the address tidied of the payment's parameters.
    await expect(page.getByText("Thank you — your care plan is paid. It shows as running below once the payment is confirmed.")).toBeVisible();
    await expect(page).toHaveURL(new RegExp(`/pieces/${target!.id}$`));
    // The webhook makes it run; the page says so once it has arrived.
    await expect(async () => {
      await page.reload();
      await expect(page.getByRole("region", { name: "Care plan" }).getByText("Running")).toBeVisible({ timeout: 1000 });
    }).toPass({ timeout: 20_000 });
    const me = (await (await page.request.get(`/api/me/pieces/${target!.id}`)).json()) as { plan: { name: string; state: string } | null };
    expect(me.plan).toMatchObject({ name: target!.plan, state: "running" });
    // The running plan still says what the owner pays and what it gives them (it showed only its name and state).
    const mine = page.getByTestId("current-plan");
    await expect(mine).toContainText(price);
    for (const line of gives) await expect(mine).toContainText(line);
    await noAxeViolations(page);
    await context.close();
  });

  test("staff see the plan on the client's page and on the overview", async ({ page }) => {
    await signIn(page, ACCOUNTS.staff);
    const list = (await (await page.request.get(`/api/clients?q=${encodeURIComponent(ACCOUNTS.owner)}`)).json()) as { rows: { id: string }[] };
    expect(list.rows.length).toBeGreaterThan(0);
    await page.goto(`/studio/clients/${list.rows[0]!.id}`);
    const card = page.getByRole("heading", { name: "Care plans" }).locator("xpath=..");
    await expect(card.getByText(pieceTitle)).toBeVisible();
    await expect(card.getByText(/Running · paid to .* · paid by card/)).toBeVisible();
    await noAxeViolations(page);

    await page.goto("/studio");
    const plans = page.getByRole("region", { name: "Care plans" });
    await expect(plans.getByText("Plans running")).toBeVisible();
    // The demo plan and the one just bought.
    const running = Number(await plans.getByRole("link", { name: /Plans running/ }).locator("p").nth(1).innerText());
    expect(running).toBeGreaterThanOrEqual(2);
    await noAxeViolations(page);
  });

  test("the owner cancels the plan at 375 px: the confirm step names the end date with its zone and the refund; then keeps it after all", async ({ browser }) => {
    const context = await browser.newContext({ viewport: { width: 375, height: 812 }, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    await signIn(page, ACCOUNTS.owner);
    const { pieces } = (await (await page.request.get("/api/me/pieces")).json()) as { pieces: { id: string; title: string }[] };
    const piece = pieces.find((p) => p.title === pieceTitle)!;
    // Before releasing the piece, the owner is told what happens to the plan they pay for on it, on the page and in the confirm step.
    await page.goto(`/pieces/${piece.id}/transfer`);
    const planWords = /Your care plan “.+” (ends the moment you release the piece\. (You get .+ back|Nothing is paid back)|stays with the piece until .+ for its next owner)/;
    await expect(page.getByRole("heading", { name: "Your care plan" })).toBeVisible();
    await expect(page.getByText(planWords).first()).toBeVisible();
    await page.getByRole("checkbox").check();
    await page.getByRole("button", { name: "Release this piece" }).click();
    await expect(page.getByRole("dialog").getByText(planWords)).toBeVisible();
    await page.getByRole("dialog").getByRole("button", { name: "Cancel" }).click();
    await page.goto(`/pieces/${piece.id}`);
    await page.getByRole("button", { name: "Cancel this plan" }).click();
    const confirm = page.getByRole("group", { name: /^Cancel / });
    // The demo plans pay nothing back on cancelling: it runs to the end of the period paid.
    await expect(confirm.getByText(/keeps working until \d{1,2} \w+ \d{4} \(.+\) and isn't renewed/)).toBeVisible();
    await expect(confirm.getByText(/Nothing is paid back under the studio's terms/)).toBeVisible();
    await noAxeViolations(page);
    await confirm.getByRole("button", { name: "Yes, cancel the plan" }).click();
    await expect(page.getByText(/You cancelled this plan\. It keeps working until \d{1,2} \w+ \d{4} \(.+\)/)).toBeVisible();
    const me = (await (await page.request.get(`/api/me/pieces/${piece.id}`)).json()) as { plan: { state: string } | null };
    expect(me.plan).toMatchObject({ state: "ending" });
    await noAxeViolations(page);
    await page.getByRole("button", { name: "Keep my plan after all" }).click();
    await expect(page.getByRole("button", { name: "Cancel this plan" })).toBeVisible();
    const after = (await (await page.request.get(`/api/me/pieces/${piece.id}`)).json()) as { plan: { state: string } | null };
    expect(after.plan).toMatchObject({ state: "running" });
    await context.close();
  });

  test("staff cancel the plan from its page at 1280 px, with the end date and refund shown, then take it back", async ({ page }) => {
    await signInTo(page, ACCOUNTS.staff, "/studio/plans");
    // Each plan's link reads as a link before it is hovered, underlined as the other staff lists' links are.
    await expect(page.getByRole("link", { name: pieceTitle }).first()).toHaveCSS("text-decoration-line", "underline");
    await page.getByRole("link", { name: pieceTitle }).first().click();
    await expect(page).toHaveURL(/\/studio\/plans\/[^/]+$/);
    await expect(page.getByText(/^Running · /)).toBeVisible();
    await expect(page.getByRole("heading", { name: "Payments held" })).toBeVisible();
    await noAxeViolations(page);
    await page.getByRole("button", { name: "Cancel this plan" }).click();
    const confirm = page.getByRole("group", { name: "Cancel this plan?" });
    await expect(confirm.getByText(/keeps working until \d{1,2} \w+ \d{4} \(.+\) and isn't renewed\. Nothing is paid back/)).toBeVisible();
    await noAxeViolations(page);
    await confirm.getByRole("button", { name: "Cancel the plan" }).click();
    await expect(page.getByText(/^Ends at the end of the period · /)).toBeVisible();
    await expect(page.getByText(/Cancelled: it ends on \d{1,2} \w+ \d{4} \(.+\)\./)).toBeVisible();
    await page.getByRole("button", { name: "Take the cancellation back" }).click();
    await expect(page.getByText(/^Running · /)).toBeVisible();
  });
});
