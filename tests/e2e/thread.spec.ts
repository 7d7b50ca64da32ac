// The whole repair thread in Chromium against the production build: an owner's claim is accepted;
// staff (1280 px) open its repair job from the claim page; a visit is booked; the technician (375 px)
// sees the job's notes, the claim, the owner's phone and the address, can't file before the start,
// then files with a photo; the claim closes; the owner (375 px) reads where the repair stands, sees the
// photo, and signs off from the report mail's link. Axe on every page of the thread. The quote,
// approval and payment are stood in for (the job set covered in the database): their own specs cover them.
import AxeBuilder from "@axe-core/playwright";
import sharp from "sharp";
import { expect, test, type Browser, type Page } from "@playwright/test";
import { waitForMail } from "../support/mail";
import { ACCOUNTS, SINK_URL, signIn } from "./helpers";
import { readE2eDb, startVisitNow, writeE2eDb } from "./e2e-db";

const STUDIO_TZ = "America/Los_Angeles"; // the demo studio's zone (db/seed/demo.ts)
const PIECE = "White oak kitchen island top"; // the Holloway household's, at 14 Quarry Lane (db/seed/demo.ts)
const studioDate = (ms: number) => new Intl.DateTimeFormat("en-CA", { timeZone: STUDIO_TZ }).format(new Date(ms));
const NOTES = "Ring the side door; the island's sink is in use until 10 (invented e2e note).";
const DESCRIPTION = "A pale ring and a rough patch by the sink, about a hand wide (invented e2e claim).";

async function axe(page: Page, what: string) {
  const r = await new AxeBuilder({ page }).analyze();
  expect(r.violations, `${what}: ${JSON.stringify(r.violations, null, 2)}`).toEqual([]);
}

async function noSideways(page: Page, what: string) {
  const { scroll, width } = await page.evaluate(() => ({
    scroll: document.documentElement.scrollWidth,
    width: window.innerWidth,
  }));
  expect(scroll, `${what} scrolls sideways`).toBeLessThanOrEqual(width);
}

async function phone(browser: Browser, email: string): Promise<Page> {
  const ctx = await browser.newContext({
    viewport: { width: 375, height: 812 },
    hasTouch: true,
    isMobile: true,
  });
  const page = await ctx.newPage();
  await signIn(page, email);
  return page;
}

test("claim accepted → repair job → visit booked → report filed → claim closed, the owner signs off", async ({ browser }) => {
  test.setTimeout(180_000);
  const desk = await (await browser.newContext({ viewport: { width: 1280, height: 900 } })).newPage();
  await signIn(desk, ACCOUNTS.staff);
  const owner = await phone(browser, ACCOUNTS.owner);

  // The owner's claim, decided "covered" by the desk (their own specs drive these screens).
  const pieceId = readE2eDb<{ id: string }>("SELECT p.id FROM pieces p JOIN users u ON u.id = p.owner_id WHERE u.email = ? AND p.title = ?", ACCOUNTS.owner, PIECE)!.id;
  const noticedOn = studioDate(Date.now() - 3 * 86_400_000);
  const filed = await owner.request.post("/api/claims", {
    data: {
      pieceId,
      category: "finish_wear",
      noticedOn,
      description: DESCRIPTION,
      answers: {
        heat: "no",
        chemicals: "yes",
        impact: "no",
        usedOutdoors: "no",
        directSun: "no",
      },
    },
  });
  expect(filed.status(), await filed.text()).toBe(201);
  const claimId = ((await filed.json()) as { claim: { id: string } }).claim.id;
  expect(
    (
      await desk.request.post(`/api/claims/${claimId}/state`, {
        data: { to: "in_review" },
      })
    ).status(),
  ).toBe(200);
  expect(
    (
      await desk.request.post(`/api/claims/${claimId}/decision`, {
        data: { decision: "covered", reason: "" },
      })
    ).status(),
  ).toBe(200);

  // Staff, 1280 px: the accepted claim offers its repair job.
  await desk.goto(`/studio/claims/${claimId}`);
  const repair = desk.getByRole("region", { name: "Repair" });
  await expect(repair.getByText("Create the repair job to price the work and send the owner a quote.")).toBeVisible();
  await axe(desk, "staff claim page, accepted");
  await repair.getByRole("button", { name: "Create repair job" }).click();
  await expect(desk).toHaveURL(/\/studio\/jobs\/[0-9a-f-]{36}$/);
  const jobId = desk.url().split("/").pop()!;
  await expect(desk.getByRole("link", { name: "The claim this repair is for" })).toHaveAttribute("href", `/studio/claims/${claimId}`);
  const api = (await (await desk.request.get(`/api/claims/${claimId}`)).json()) as { claim: { jobId: string | null } };
  expect(api.claim.jobId).toBe(jobId);
  // A second job for the same claim is refused.
  expect((await desk.request.post(`/api/claims/${claimId}/job`)).status()).toBe(409);
  await desk.goto(`/studio/claims/${claimId}`);
  await expect(desk.getByRole("region", { name: "Repair" }).getByRole("link", { name: "Repair: finish wear, rings or marks" })).toHaveAttribute("href", `/studio/jobs/${jobId}`);

  // Stood in for: the quote sent and the job covered by the warranty, with a note for the technician;
  // the owner's client record carries a phone number (stored E.164).
  expect(writeE2eDb("UPDATE repair_jobs SET state = 'covered', quote_version = 1, notes = ? WHERE id = ?", NOTES, jobId)).toBe(1);
  // The claim's first quote on this film-finished top is an inspection, which brings no product
  // (lib/repairs/pricing.ts taskUsesProduct); staff chose the studio's conversion varnish for the patch.
  expect(
    writeE2eDb(
      "UPDATE repair_jobs SET quote_input = json_set(quote_input, '$.productIds', json_array((SELECT id FROM finish_products WHERE studio_id = repair_jobs.studio_id AND name = 'Conversion varnish, satin'))) WHERE id = ?",
      jobId,
    ),
  ).toBe(1);
  writeE2eDb(
    "UPDATE clients SET phone = '+15035550188' WHERE user_id = (SELECT id FROM users WHERE email = ?) AND studio_id = (SELECT studio_id FROM repair_jobs WHERE id = ?)",
    ACCOUNTS.owner,
    jobId,
  );

  // The visit is booked (staff, the first free time of Ines's): the claim reads "Repair booked".
  const { slots } = (await (await desk.request.get(`/api/jobs/${jobId}/slots`)).json()) as {
    slots: { technicianId: string; technicianName: string; start: string }[];
  };
  const slot = slots.find((s) => s.technicianName === "Ines Varga")!;
  const booked = await desk.request.post("/api/visits", {
    data: { jobId, technicianId: slot.technicianId, start: slot.start },
  });
  expect(booked.status(), await booked.text()).toBe(201);
  const visitId = ((await booked.json()) as { visit: { id: string } }).visit.id;
  await desk.goto(`/studio/claims/${claimId}`);
  await expect(desk.getByText("Repair booked").first()).toBeVisible();

  // The owner, 375 px: Claims in the menu, the claim says where the repair stands and links to it.
  await owner.goto("/pieces");
  await owner.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Claims" }).click();
  await expect(owner).toHaveURL(/\/claims$/);
  await owner.goto(`/claims/${claimId}`);
  const ownerRepair = owner.getByRole("region", { name: "The repair" });
  await expect(ownerRepair.getByText(/^Repair visit booked: /)).toBeVisible();
  await expect(ownerRepair.getByRole("link", { name: "Open the repair" })).toHaveAttribute("href", `/jobs/${jobId}`);
  await axe(owner, "owner claim page, repair booked");
  await noSideways(owner, "owner claim page");

  // The technician, 375 px, on the visit's day before it starts: everything she needs; no report yet.
  const tech = await phone(browser, ACCOUNTS.technician);
  await tech.goto(`/studio/today?date=${studioDate(Date.parse(slot.start))}`);
  const card = tech
    .getByRole("listitem")
    .filter({ has: tech.getByRole("heading", { name: PIECE }) })
    .filter({ hasText: NOTES });
  await expect(card).toBeVisible();
  await expect(card.getByText(DESCRIPTION)).toBeVisible();
  await expect(
    card.getByRole("link", {
      name: /^Call The Holloway household, \(503\) 555-0188$/,
    }),
  ).toHaveAttribute("href", "tel:+15035550188");
  const map = card.getByRole("link", { name: "14 Quarry Lane, Port Alder" });
  expect(new URL((await map.getAttribute("href"))!).searchParams.get("query")).toBe("14 Quarry Lane, Port Alder");
  await expect(card.getByText(/^Cure: light use after \d+ h, full use after \d+ days/).first()).toBeVisible();
  await expect(card.getByText("Not started yet")).toBeVisible();
  await card.getByLabel("What was done").fill("Too early (e2e).");
  // The proposed layer's surface: the varnish the quote brings is the outer coat of two of this piece's
  // stacks (the top and the edges), so the form leaves it at "Choose a surface" and she chooses.
  await expect(card.getByLabel("Surface")).toHaveValue("");
  await card.getByLabel("Surface").selectOption("top");
  await card.getByRole("button", { name: "File the report and close the job" }).click();
  await expect(card.getByText(/The report was not filed/)).toBeVisible();
  await expect(card.getByText(/File the report once it has started/).first()).toBeVisible();
  await axe(tech, "technician's day, before the visit");
  await noSideways(tech, "technician's day");

  // The visit starts; she files the report with an after photo.
  const started = startVisitNow(visitId);
  await tech.goto(`/studio/today?date=${studioDate(started)}`);
  await expect(card).toBeVisible();
  await expect(card.getByText("Not started yet")).toHaveCount(0);
  await card.getByLabel("What was done").fill("Cleaned the ring, keyed and recoated the patch by the sink (e2e).");
  await card.getByLabel("Surface").selectOption("top");
  const jpeg = await sharp({
    create: { width: 320, height: 240, channels: 3, background: "#b9925e" },
  })
    .jpeg()
    .toBuffer();
  await card.locator('input[type="file"]').nth(1).setInputFiles({ name: "after.jpg", mimeType: "image/jpeg", buffer: jpeg });
  await expect(card.getByRole("img", { name: "after photo" })).toBeVisible();
  const since = Date.now();
  await card.getByRole("button", { name: "File the report and close the job" }).click();
  await expect(card.getByRole("status").getByText("Report filed")).toBeVisible();
  await expect(card.getByText("Waiting for the owner to sign off from the report mail.")).toBeVisible();
  await axe(tech, "technician's day, report filed");

  // Staff: the claim is closed; its repair job is done.
  await desk.goto(`/studio/claims/${claimId}`);
  await expect(desk.getByText("Closed").first()).toBeVisible();
  await expect(desk.getByRole("region", { name: "Repair" }).getByText(/Visit done/)).toBeVisible();
  await axe(desk, "staff claim page, closed");
  await desk.goto(`/studio/pieces/${pieceId}`);
  await expect(desk.getByRole("list", { name: "Photos taken at visits" }).getByRole("img").first()).toBeVisible();

  // The owner: the claim says the repair is done.
  await owner.goto(`/claims/${claimId}`);
  await expect(owner.getByRole("region", { name: "The repair" }).getByText(/^The repair is done, /)).toBeVisible();
  // Its job page links back to the claim and shows the photo taken at the visit.
  await owner.getByRole("region", { name: "The repair" }).getByRole("link", { name: "Open the repair" }).click();
  await expect(owner).toHaveURL(new RegExp(`/jobs/${jobId}$`));
  await expect(owner.getByRole("link", { name: "The claim this repair is for" })).toHaveAttribute("href", `/claims/${claimId}`);
  await expect(owner.getByRole("list", { name: "Photos from the visit" }).getByRole("img")).toHaveCount(1);
  // And so does the piece's own page.
  await owner.goto(`/pieces/${pieceId}`);
  await expect(owner.getByRole("list", { name: "Photos taken at studio visits" }).getByRole("img").first()).toBeVisible();

  // The sign-off is the owner's own: the link in the report mail, a page with a button, once.
  const mail = await waitForMail({
    to: ACCOUNTS.owner,
    subject: `Visit report: ${PIECE}`,
    since,
    sinkUrl: SINK_URL,
  });
  const link = /https?:\/\/\S+\/visit-sign-off\?token=[A-Za-z0-9_-]+/.exec(mail.text)![0];
  const path = new URL(link).pathname + new URL(link).search;
  await owner.goto(path);
  await expect(owner.getByText("Cleaned the ring, keyed and recoated the patch by the sink (e2e).")).toBeVisible();
  await axe(owner, "sign-off page");
  await noSideways(owner, "sign-off page");
  await owner.getByRole("button", { name: "I've checked the work: sign it off" }).click();
  await expect(owner.getByText("The visit is signed off")).toBeVisible();
  await owner.goto(path);
  await expect(owner.getByText("This link has expired or was already used")).toBeVisible();
  await tech.reload();
  await expect(card.getByText("The owner signed off the work.")).toBeVisible();
});
