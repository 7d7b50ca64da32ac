// What staff see when an owner releases a piece with work still open on it: the owner (375 px) files a
// claim and releases the piece; the studio's mail lists the claim, the paid job and its booked visit with
// the visit's time in the studio's zone; staff (1280 px) read on the claim page and the job page that the
// piece changed hands and what to do next. The paid job and its visit are written straight into the
// database (tests/e2e/e2e-db.ts): paying and booking have their own specs, and a visit far ahead keeps
// the slots other specs book free. Uses fixture().unregistered[6] only (owner.spec and owner-account.spec
// take 0 to 5, plans-held.spec the last).
import path from "node:path";
import { expect, test, type Page } from "@playwright/test";
import { formatVisitWhen } from "../../lib/format";
import { waitForMail } from "../support/mail";
import { readE2eDb, writeE2eDb } from "./e2e-db";
import { ACCOUNTS, fixture, SINK_URL, signIn, signInTo } from "./helpers";

const SHOTS = path.resolve("tests/.tmp/screens/release-open-work");
const shot = (page: Page, name: string) => page.screenshot({ path: path.join(SHOTS, `${name}.png`), fullPage: true });

test("a piece released with a claim and a booked visit: the studio is told, and the claim and job pages say what to do", async ({ browser }) => {
  const card = fixture().unregistered[6]!;
  const owner = await browser.newContext({ viewport: { width: 375, height: 812 }, isMobile: true, hasTouch: true, extraHTTPHeaders: { "x-forwarded-for": "198.51.100.66" } });
  const ownerPage = await owner.newPage();
  await signIn(ownerPage, ACCOUNTS.otherOwner);
  const origin = { origin: new URL(ownerPage.url()).origin };
  expect((await ownerPage.request.post("/api/registrations", { headers: origin, data: { code: card.code } })).status()).toBe(201);
  const filed = await ownerPage.request.post("/api/claims", {
    headers: origin,
    data: {
      pieceId: card.pieceId,
      category: "crack_gap",
      noticedOn: new Date().toISOString().slice(0, 10),
      description: "A hairline crack along the glue line (invented for this test).",
      answers: { heat: "no", chemicals: "no", impact: "no", usedOutdoors: "no", directSun: "no" },
    },
  });
  expect(filed.status()).toBe(201);
  const claimId = ((await filed.json()) as { claim: { id: string } }).claim.id;

  // A paid job on the piece with a visit booked 200 days ahead, 90 minutes from 16:00 UTC (stand-ins).
  const piece = readE2eDb<{ studioId: string; owner: string }>("SELECT studio_id AS studioId, owner_id AS owner FROM pieces WHERE id = ?", card.pieceId)!;
  const ines = readE2eDb<{ id: string }>("SELECT id FROM users WHERE email = ?", ACCOUNTS.technician)!;
  const jobId = crypto.randomUUID();
  const now = Date.now();
  writeE2eDb(
    "INSERT INTO repair_jobs (id, studio_id, piece_id, owner_id, origin, state, title, quote_input, lines, currency, quote_version, paid_at, created_at, updated_at) VALUES (?, ?, ?, ?, 'studio', 'paid', ?, ?, '[]', 'USD', 1, ?, ?, ?)",
    jobId, piece.studioId, card.pieceId, piece.owner, "Re-oil the top (invented)", JSON.stringify({ title: "Re-oil the top (invented)", tasks: ["reoil"], productIds: [], coats: 1, travel: false, coveredPct: 0, notes: "" }), now, now, now,
  );
  const day = new Date(now + 200 * 86_400_000).toISOString().slice(0, 10);
  const start = Date.parse(`${day}T16:00:00Z`);
  writeE2eDb(
    "INSERT INTO visits (id, studio_id, job_id, piece_id, technician_id, start_at, end_at, location_kind, location, ics_uid, state, job_state_before, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?, 'studio', 'The workshop (invented)', ?, 'booked', 'paid', ?, ?)",
    crypto.randomUUID(), piece.studioId, jobId, card.pieceId, ines.id, start, start + 90 * 60_000, `${crypto.randomUUID()}@grainward.test`, now, now,
  );
  writeE2eDb("UPDATE repair_jobs SET state = 'scheduled' WHERE id = ?", jobId);

  // The owner releases the piece on their phone.
  await ownerPage.goto(`/pieces/${card.pieceId}/transfer`);
  await ownerPage.getByRole("checkbox").check();
  await ownerPage.getByRole("button", { name: "Release this piece" }).click();
  const since = new Date();
  await ownerPage.getByRole("dialog", { name: "Release this piece?" }).getByRole("button", { name: "Yes, release it" }).click();
  await expect(ownerPage.getByLabel("New registration code")).toBeVisible();
  await shot(ownerPage, "01-owner-released-375");
  await owner.close();

  // The studio's one mail: each open thing, a link to it and what to do, the visit's time with its zone.
  const mail = await waitForMail({ to: "studio@larchmere.example", subject: /^A piece changed hands with open work: /, sinkUrl: SINK_URL, since });
  const text = mail.text.replace(/\s+/g, " ");
  expect(text).toContain("Jonah Reyes left 3 things open on this piece.");
  expect(text).toContain("Claim: Crack or gap New It changed hands while this claim was open.");
  expect(text).toContain("Repair job: Re-oil the top (invented) Visit booked It changed hands before this work was done.");
  // As the demo studio's clock reads it (db/seed/demo.ts: America/Los_Angeles), its zone named.
  const when = formatVisitWhen(start, start + 90 * 60_000, "America/Los_Angeles");
  expect(when).toMatch(/ P[SD]T$/);
  expect(text).toMatch(new RegExp(`Visit: Re-oil the top \\(invented\\) with Ines [^ ]+ Booked for ${when}`));
  expect(text).toContain(`/studio/claims/${claimId}`);
  expect(text).toContain(`/studio/jobs/${jobId}`);

  // Staff at their desk: the claim page and the job page say the piece changed hands, and what to do.
  const staff = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  const staffPage = await staff.newPage();
  await signInTo(staffPage, ACCOUNTS.staff, `/studio/claims/${claimId}`);
  await expect(staffPage.getByText("The piece changed hands", { exact: true })).toBeVisible();
  await expect(staffPage.getByText(/The claim stays with the studio: Jonah [^ ]+ can still read it but can no longer add to it/)).toBeVisible();
  await expect(staffPage.getByText(/ask them whether the fault still needs seeing to: they can file a claim of their own\./)).toBeVisible();
  await shot(staffPage, "02-staff-claim-1280");

  await staffPage.goto(`/studio/jobs/${jobId}`);
  await expect(staffPage.getByText("The piece changed hands", { exact: true })).toBeVisible();
  await expect(staffPage.getByText(/It changed hands before this work was done\. Jonah [^ ]+ no longer sees this job's visit/)).toBeVisible();
  await shot(staffPage, "03-staff-job-1280");
  await staff.close();
});
