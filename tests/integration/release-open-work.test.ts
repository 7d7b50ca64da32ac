// What the studio learns when an owner releases a piece with work still open on it, and what becomes of
// that work (lib/repairs/handed-on.ts, lib/owner/transfer.ts): one staff mail per release listing each
// open claim, job and booked visit with a link, what to do next and times in the studio's zone (none of
// that when nothing is open); a payment page Stripe didn't close at the release is closed by the
// scheduler's pass (jobs/checkout-closes.ts) or left to expire; and an open claim stays with the studio,
// the new owner never seeing its words or photos. Real SQLite file, the real stripe SDK against the local
// Stripe fake over HTTP (its failNext switch makes one call answer as an outage would; a page it doesn't
// know under the key is a 404 refusal), the SMTP sink.
// Invented studios, owners and pieces.
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { auditLog, checkoutCloses, claims, payments, repairJobs, studios, type Studio } from "@/db/schema";
import { checkoutClosesJob } from "@/jobs/checkout-closes";
import { addClaimPhoto } from "@/lib/claims/photos";
import { postClaimMessage } from "@/lib/claims/reply";
import { getOwnerClaim, getStaffClaim } from "@/lib/claims/view-claim";
import { listOwnerClaims } from "@/lib/claims/list";
import { canViewFile, getFileForViewer } from "@/lib/files/access";
import { ownerConversations } from "@/lib/messages/service";
import { registerPiece } from "@/lib/owner/registration";
import { releasePiece } from "@/lib/owner/transfer";
import { SUCCESS_CARD } from "@/lib/fakes/stripe-fake";
import { checkoutCloseWords, claimHandedOnNotes, claimHandedOnWords, closeDueCheckouts } from "@/lib/repairs/handed-on";
import { handedOnRefusal } from "@/lib/repairs/jobs";
import { approveJob } from "@/lib/repairs/payment";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { putTechnicianHours } from "@/lib/visits/technicians";
import { createAcceptedClaim, createProduct, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { extractLinks, listMail, waitForMail } from "../support/mail";
import { plansStripeForFile, until } from "../support/plans-stripe";
import { quotedRepairJob } from "../support/repair-quote";
import { fileClaim, claimWorld, photoJpeg } from "./claims-helpers";
import { addJob, statusOf, WEEKDAYS_9_TO_5 } from "./visits-helpers";

const stripe = plansStripeForFile();
const paymentsOf = (jobId: string) => getDb().select().from(payments).where(eq(payments.jobId, jobId)).all();
const closeOf = (paymentId: string) => getDb().select().from(checkoutCloses).where(eq(checkoutCloses.paymentId, paymentId)).get();
const sessionAtFake = (id: string) => stripe.fake.sessions().find((s) => s.id === id)!;
const expireCalls = (sessionId: string) => stripe.fake.requests().filter((r) => r.method === "POST" && r.path === `/v1/checkout/sessions/${sessionId}/expire`).length;
const released = (studio: Studio) => listMail({ to: studio.email! }).then((all) => all.filter((m) => /^A piece changed hands/.test(m.subject)));

/** A studio in Los Angeles whose owner has a quote approved (its payment page open) on their piece. */
async function approvedWorld(prefix: string) {
  const studio = createStudio({ email: `${unique(prefix)}@test.example`, taxRateBp: 0, timeZone: "America/Los_Angeles", address: "4 Kiln Lane, Testville (invented)" });
  const quoted = await quotedRepairJob(studio);
  await approveJob(quoted.owner, quoted.job.id);
  const [payment] = paymentsOf(quoted.job.id);
  return { studio, ...quoted, payment: payment! };
}

describe("the studio is told at the release what open work the piece leaves", () => {
  it("one mail lists each open claim, job and booked visit with a link, what to do next and the visit's time in the studio's zone; a retried release sends no second", async () => {
    const w = await approvedWorld("release-open-work");
    // A second claim of theirs still being reviewed, a paid job with a visit booked, and work that is over.
    const reviewing = createAcceptedClaim(w.studio, w.job.pieceId, w.owner.id, "chargeable");
    getDb().update(claims).set({ state: "in_review", decision: null, category: "crack_gap" }).where(eq(claims.id, reviewing.id)).run();
    const declined = createAcceptedClaim(w.studio, w.job.pieceId, w.owner.id, "chargeable");
    getDb().update(claims).set({ state: "declined", decision: "declined", category: "structural" }).where(eq(claims.id, declined.id)).run();
    const product = createProduct(w.studio);
    const paid = addJob(w.studio, w.job.pieceId, w.owner.id, product.id, "paid");
    const done = addJob(w.studio, w.job.pieceId, w.owner.id, product.id, "paid");
    getDb().update(repairJobs).set({ state: "done", title: "Finished long ago (invented)" }).where(eq(repairJobs.id, done.id)).run();
    const tech = await memberContext(w.studio, "technician");
    putTechnicianHours(w.staff, tech.user.id, { hours: WEEKDAYS_9_TO_5, timeOff: [] });
    const NOW = Date.parse("2027-05-03T19:00:00Z"); // a Monday, noon in Los Angeles
    const slot = listJobSlots(w.staff, paid.id, { from: "2027-05-04T15:00:00Z", to: "2027-05-07T00:00:00Z" }, NOW).slots[0]!;
    const visit = await bookVisit(w.staff, { jobId: paid.id, technicianId: slot.technicianId, start: slot.start }, NOW);
    const since = new Date();

    await releasePiece(w.owner, w.job.pieceId, { confirm: true });

    const mail = await waitForMail({ to: w.studio.email!, subject: /^A piece changed hands with open work: /, since });
    const text = mail.text.replace(/\s+/g, " ");
    expect(text).toContain("Test Person left 5 things open on this piece.");
    expect(text).toContain("Claim: Crack or gap Reviewing It changed hands while this claim was open. The claim stays with the studio:");
    expect(text).toContain("Claim: Finish wear, rings or marks Accepted It changed hands after this claim was accepted.");
    expect(text).toContain("Repair job: Refresh the top Being priced again (it was approved, awaiting payment) It changed hands before this quote was paid.");
    expect(text).toContain("Repair job: Re-oil the top (invented test job) Visit booked It changed hands before this work was done.");
    // The visit's time as the studio's clock reads it, its zone named.
    expect(text).toMatch(/Visit: Re-oil the top \(invented test job\) with Test Person Booked for \w+day, \d{1,2} May 2027, \d\d:\d\d–\d\d:\d\d PDT Test Person no longer sees this visit/);
    expect(Date.parse(visit.start)).toBe(Date.parse(slot.start));
    // Nothing declined or done is listed.
    expect(text).not.toContain("Something else");
    expect(text).not.toContain("Structural");
    expect(text).not.toContain("Finished long ago");
    const links = extractLinks(mail.text);
    for (const path of [`/studio/claims/${reviewing.id}`, `/studio/claims/${w.job.claimId}`, `/studio/jobs/${w.job.id}`, `/studio/jobs/${paid.id}`]) expect(links.some((l) => l.endsWith(path))).toBe(true);
    expect(links.some((l) => l.endsWith(`/studio/claims/${declined.id}`) || l.endsWith(`/studio/jobs/${done.id}`))).toBe(false);

    // The same release again (a double submit, a retried request) is refused and tells nobody twice.
    expect(await statusOf(releasePiece(w.owner, w.job.pieceId, { confirm: true }))).toBe(404);
    await new Promise((r) => setTimeout(r, 300));
    expect(await released(w.studio)).toHaveLength(1);
  });

  it("with nothing open, the release mail lists no open work", async () => {
    const w = await claimWorld({ studio: { email: `${unique("release-nothing-open")}@test.example` } });
    const closed = createAcceptedClaim(w.studio, w.piece.id, w.owner.id, "covered");
    getDb().update(claims).set({ state: "closed" }).where(eq(claims.id, closed.id)).run();
    const since = new Date();
    await releasePiece(w.owner, w.piece.id, { confirm: true });
    const mail = await waitForMail({ to: w.studio.email!, subject: /^A piece changed hands/, since });
    expect(mail.subject).toBe(`A piece changed hands: ${w.piece.title}`);
    expect(mail.text).not.toMatch(/open on this piece|Claim:|Repair job:|Visit:/);
    expect(extractLinks(mail.text).some((l) => l.includes("/studio/claims/"))).toBe(false);
  });
});

describe("a payment page Stripe didn't close at the release", () => {
  it("is written down, closed by the scheduler's pass once Stripe answers, and asked no more after", async () => {
    const w = await approvedWorld("release-close-retry");
    const sid = w.payment.checkoutSessionId;
    stripe.fake.failNext("POST", `/v1/checkout/sessions/${sid}/expire`);

    await releasePiece(w.owner, w.job.pieceId, { confirm: true });
    // The release went through; the page is still open at Stripe, and the close is due.
    expect(sessionAtFake(sid).status).toBe("open");
    expect(paymentsOf(w.job.id).map((p) => p.status)).toEqual(["open"]);
    const due = closeOf(w.payment.id)!;
    expect(due).toMatchObject({ studioId: w.studio.id, tries: 1, outcome: null, settledAt: null });
    expect(due.expiresAt.getTime()).toBe(w.payment.createdAt.getTime() + 24 * 3600_000);
    expect(expireCalls(sid)).toBe(1);

    const lines = await checkoutClosesJob();
    expect(lines).toContain(`payment page close ${due.id}: closed at Stripe`);
    expect(sessionAtFake(sid).status).toBe("expired");
    expect(paymentsOf(w.job.id).map((p) => p.status)).toEqual(["expired"]);
    expect(closeOf(w.payment.id)).toMatchObject({ tries: 2, outcome: "closed", settledAt: expect.any(Date) });
    expect(expireCalls(sid)).toBe(2);

    // Settled: the next pass leaves it alone.
    expect((await checkoutClosesJob()).filter((l) => l.includes(due.id))).toEqual([]);
    expect(expireCalls(sid)).toBe(2);
  });

  it("is marked expired without asking Stripe once its lifetime is over", async () => {
    const w = await approvedWorld("release-close-expired");
    const sid = w.payment.checkoutSessionId;
    stripe.fake.failNext("POST", `/v1/checkout/sessions/${sid}/expire`);
    await releasePiece(w.owner, w.job.pieceId, { confirm: true });
    const due = closeOf(w.payment.id)!;
    const later = new Date(w.payment.createdAt.getTime() + 24 * 3600_000 + 1);
    expect(await closeDueCheckouts({ now: later, ids: [due.id] })).toEqual({ closed: [], expired: [due.id], paid: [], refused: [], failed: [] });
    expect(closeOf(w.payment.id)).toMatchObject({ tries: 1, outcome: "expired" });
    expect(expireCalls(sid)).toBe(1);
  });

  it("closes at the release itself when Stripe answers: one try, settled", async () => {
    const w = await approvedWorld("release-close-first-try");
    await releasePiece(w.owner, w.job.pieceId, { confirm: true });
    expect(sessionAtFake(w.payment.checkoutSessionId).status).toBe("expired");
    expect(closeOf(w.payment.id)).toMatchObject({ tries: 1, outcome: "closed" });
  });
});

describe("a payment page close Stripe refuses, or a page paid before it closed", () => {
  it("a refusal (a 4xx) settles at the release as refused, in words in the audit log and on the job page, and the pass asks no more", async () => {
    const w = await approvedWorld("release-close-refused");
    // A page Stripe no longer knows under this key: the fake answers 404 "No such checkout.session".
    const gone = `cs_test_gone${unique("x").replace(/[^a-z0-9]/gi, "")}`;
    getDb().update(payments).set({ checkoutSessionId: gone }).where(eq(payments.id, w.payment.id)).run();

    await releasePiece(w.owner, w.job.pieceId, { confirm: true });
    const close = closeOf(w.payment.id)!;
    expect(close).toMatchObject({ tries: 1, outcome: "refused", settledAt: expect.any(Date) });
    expect(expireCalls(gone)).toBe(1);
    const audit = getDb().select().from(auditLog).where(and(eq(auditLog.subjectId, w.payment.id), eq(auditLog.action, "payment.close_refused"))).all();
    expect(audit).toHaveLength(1);
    expect((audit[0]!.data as { reason: string }).reason).toMatch(/^The payment service refused to close the open payment page: No such checkout\.session: .+ Not asked again; the page closes on its own when it expires\.$/);

    // The scheduler's passes (every 5 minutes) leave it alone: no second ask, no second audit row.
    expect((await checkoutClosesJob()).filter((l) => l.includes(close.id))).toEqual([]);
    expect((await checkoutClosesJob(new Date(Date.now() + 3600_000))).filter((l) => l.includes(close.id))).toEqual([]);
    expect(expireCalls(gone)).toBe(1);
    expect(closeOf(w.payment.id)).toMatchObject({ tries: 1, outcome: "refused" });

    // The staff job page says so, the page's times in the studio's zone.
    const words = checkoutCloseWords(w.studio.id, w.job.id, w.studio.timeZone, "Test Person");
    expect(words).toHaveLength(1);
    expect(words[0]).toMatch(/^The payment service refused to close the payment page opened \d{1,2} [A-Z][a-z]+ \d{4}(?:,| at) \d\d:\d\d P[DS]T, so it is not asked again\. The page stays open until .+ P[DS]T; if Test Person pays on it before then, the payment goes back to them automatically\.$/);
    // Scoped to the studio: another studio's id reads nothing.
    expect(checkoutCloseWords(createStudio().id, w.job.id, "UTC", null)).toEqual([]);
  });

  it("a page the former owner paid before the pass closed it settles as paid, the staff job page says so, and the payment is refunded automatically", async () => {
    const w = await approvedWorld("release-close-paid");
    const sid = w.payment.checkoutSessionId;
    stripe.fake.failNext("POST", `/v1/checkout/sessions/${sid}/expire`);
    await releasePiece(w.owner, w.job.pieceId, { confirm: true });
    const due = closeOf(w.payment.id)!;
    expect(due).toMatchObject({ tries: 1, outcome: null });

    // The former owner pays on the page still open at Stripe; its webhook gives the money back.
    const paid = await fetch(w.payment.checkoutUrl!, { method: "POST", body: new URLSearchParams({ card: SUCCESS_CARD }), redirect: "manual" });
    expect(paid.status).toBe(303);
    const refunded = await until(() => paymentsOf(w.job.id).find((p) => p.status === "refunded"));
    expect(refunded.refundReason).not.toBeNull();
    expect(refunded.refundRequestedAt).toEqual(expect.any(Date));

    const lines = await checkoutClosesJob();
    expect(lines).toContain(`payment page close ${due.id}: the former owner paid first; the payment is refunded automatically`);
    expect(closeOf(w.payment.id)).toMatchObject({ outcome: "paid", settledAt: expect.any(Date) });
    expect(expireCalls(sid)).toBe(1);
    expect(checkoutCloseWords(w.studio.id, w.job.id, w.studio.timeZone, "Test Person")).toEqual([
      expect.stringMatching(/^Test Person paid on the payment page opened .+ P[DS]T before it could be closed\. That payment does not count toward this job and goes back to them automatically: see Payments\.$/),
    ]);
  });
});

describe("an open claim on a piece that changed hands", () => {
  it("stays with the studio, whose claim page says what to do; the new owner sees none of its words or photos", async () => {
    const w = await claimWorld({ studio: { email: `${unique("release-claim")}@test.example` } });
    getDb().update(studios).set({ timeZone: "UTC" }).where(eq(studios.id, w.studio.id)).run();
    const claim = await fileClaim(w.ownerV, w.piece.id, { description: "Private words about the glue line (invented)." });
    const photo = await addClaimPhoto(w.ownerV, claim.id, async () => await photoJpeg());
    await postClaimMessage(w.ownerV, claim.id, { body: "A private follow-up (invented)." });
    const staffView = () => getStaffClaim(w.staffCtx, claim.id);
    expect(claimHandedOnWords({ state: staffView().claim.state, ownerId: w.owner.id }, staffView().piece, w.owner.name, false)).toBeNull();

    const { code } = await releasePiece(w.owner, w.piece.id, { confirm: true });
    const next = await createUser({ emailVerifiedAt: new Date(), name: "Next Owner (invented)" });
    await registerPiece(next, { code }, "203.0.113.44");

    // The staff page's words: the claim is the studio's to decide or to take up with the new owner.
    const v = staffView();
    expect(claimHandedOnWords({ state: v.claim.state, ownerId: v.owner.id }, v.piece, v.owner.name, !!v.repair)).toBe(
      "It changed hands while this claim was open. The claim stays with the studio: Test Owner (invented) can still read it but can no longer add to it or approve, pay for or book a repair, and the new owner does not see it. Decide it on what you have (declining it, with your reason, closes it), or once the new owner has registered the piece, ask them whether the fault still needs seeing to: they can file a claim of their own.",
    );
    expect(claimHandedOnWords({ state: "awaiting_owner", ownerId: v.owner.id }, v.piece, v.owner.name, false)).toMatch(/The answer you asked Test Owner \(invented\) for may not come: resume the review without waiting\./);
    expect(claimHandedOnWords({ state: "declined", ownerId: v.owner.id }, v.piece, v.owner.name, false)).toBeNull();

    // The new owner: no claim, no photo, no conversation of the former owner's.
    expect(await statusOf(() => getOwnerClaim({ ...next, remindersEnabled: true } as never, claim.id))).toBe(404);
    expect(listOwnerClaims(next).map((c) => c.id)).not.toContain(claim.id);
    expect(canViewFile(next.id, { purpose: "claim_photo", studioId: w.studio.id, pieceId: w.piece.id, claimId: claim.id })).toBe(false);
    expect(await statusOf(getFileForViewer(next.id, photo.id))).toBe(404);
    const theirs = ownerConversations(next, { pieceId: w.piece.id });
    expect(JSON.stringify(theirs)).not.toMatch(/Private words|private follow-up/);
    // The former owner still reads it, as history.
    const former = getOwnerClaim(w.owner, claim.id);
    expect(former.mayWrite).toBe(false);
    expect(former.photos.map((p) => p.id)).toEqual([photo.id]);
  });

  it("accepted with no repair job: the claim page's notice and its 'No repair job' box say each thing once", async () => {
    const w = await claimWorld({ studio: { email: `${unique("release-accepted-nojob")}@test.example` } });
    const accepted = createAcceptedClaim(w.studio, w.piece.id, w.owner.id, "chargeable");
    await releasePiece(w.owner, w.piece.id, { confirm: true });
    const v = getStaffClaim(w.staffCtx, accepted.id);
    const claim = { state: v.claim.state, ownerId: v.owner.id };
    const notes = claimHandedOnNotes(claim, v.piece, v.owner.name, !!v.repair, handedOnRefusal("claim", claim, v.piece));
    expect(notes.changedHands).toMatch(/^It changed hands after this claim was accepted\. .+ can no longer add to it or approve, pay for or book a repair.+file a claim of their own for the repair\.$/);
    expect(notes.noJob).toBe("A repair job can't be opened from this claim now that its piece has changed hands.");
    // No run of four words of the box is in the notice (the box used to repeat "can't approve, pay or book
    // a repair" and "file a claim of their own").
    const runs = (t: string) => { const w4 = t.toLowerCase().replace(/[^a-z' ]/g, " ").split(/\s+/).filter(Boolean); return w4.slice(3).map((_, i) => w4.slice(i, i + 4).join(" ")); };
    const notice = runs(notes.changedHands!).join("|");
    expect(runs(notes.noJob!).filter((r) => notice.includes(r))).toEqual([]);
    // With a job, or while its owner still holds the piece, there is no box.
    expect(claimHandedOnNotes(claim, v.piece, v.owner.name, true, handedOnRefusal("claim", claim, v.piece)).noJob).toBeNull();
    expect(claimHandedOnNotes(claim, { ownerId: v.owner.id }, v.owner.name, false, handedOnRefusal("claim", claim, { ownerId: v.owner.id }))).toEqual({ changedHands: null, noJob: null });
  });
});
