// A repair job waiting for its owner's payment when the owner hands the piece on (releases it): the job
// goes back to the studio to be priced and sent again (lib/repairs/handed-on.ts), the payment page the
// owner opened is expired at Stripe so it can take no money, an audit row says so, and the staff job page
// says why. Another studio's job, and the owner's job on a piece they keep, are left as they were; the
// quote sent again reaches the new owner, who can pay it. Real SQLite file, the real stripe SDK against
// the local Stripe fake over HTTP (its webhooks reach the handlers, tests/support/plans-stripe.ts), the
// SMTP sink. Invented studios, owners and pieces.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { payments, type RepairJob } from "@/db/schema";
import { SUCCESS_CARD } from "@/lib/fakes/stripe-fake";
import { registerPiece } from "@/lib/owner/registration";
import { releasePiece } from "@/lib/owner/transfer";
import { HANDED_ON_WORDS, handedOnWords, jobHandedOn } from "@/lib/repairs/handed-on";
import { getOwnerJob, getStudioJob } from "@/lib/repairs/jobs";
import { approveJob, sendQuote } from "@/lib/repairs/payment";
import { AWAITING_PAYMENT } from "@/lib/repairs/states";
import { auditsOf, createStudio, unique } from "../support/fixtures";
import { waitForMail } from "../support/mail";
import { plansStripeForFile, until } from "../support/plans-stripe";
import { quotedRepairJob } from "../support/repair-quote";

const stripe = plansStripeForFile();

const payOnPage = (url: string) => fetch(url, { method: "POST", body: new URLSearchParams({ card: SUCCESS_CARD }), redirect: "manual" });
const paymentsOf = (jobId: string) => getDb().select().from(payments).where(eq(payments.jobId, jobId)).all();
const sessionAtFake = (id: string) => stripe.fake.sessions().find((s) => s.id === id)!;

/** A job of a new owner's piece, approved by them: its payment page is open. */
async function approvedJob(prefix: string) {
  const studio = createStudio({ email: `${unique(prefix)}@test.example`, taxRateBp: 0 });
  const quoted = await quotedRepairJob(studio);
  const { checkoutUrl } = await approveJob(quoted.owner, quoted.job.id);
  const [payment] = paymentsOf(quoted.job.id);
  expect(sessionAtFake(payment!.checkoutSessionId).status).toBe("open");
  return { ...quoted, studio, checkoutUrl: checkoutUrl!, sessionId: payment!.checkoutSessionId };
}

describe("a repair job awaiting payment when its owner hands the piece on", () => {
  it("goes back to the studio, its payment page is expired at Stripe, audited, and staff are told why; other jobs are untouched", async () => {
    const handed = await approvedJob("handon-set-back");
    const elsewhere = await approvedJob("handon-other-studio");
    // The same owner's job on a piece of theirs they keep, at the same studio.
    const kept = await quotedRepairJob(handed.studio);
    const keptPage = await approveJob(kept.owner, kept.job.id);
    expect(keptPage.checkoutUrl).toBeTruthy();

    await releasePiece(handed.owner, handed.job.pieceId, { confirm: true });

    const view = getStudioJob(handed.staff, handed.job.id);
    expect(view.job.state).toBe("draft");
    expect(view.job.quoteVersion).toBe(handed.job.quoteVersion);
    expect(sessionAtFake(handed.sessionId).status).toBe("expired");
    expect(paymentsOf(handed.job.id).map((p) => p.status)).toEqual(["expired"]);
    // The page open in the former owner's tab takes no money now.
    expect((await payOnPage(handed.checkoutUrl)).status).toBe(410);
    const audit = auditsOf(handed.job.id, "job.handed_on");
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ studioId: handed.studio.id, actorId: handed.owner.id });
    // The staff job page's notice (app/studio/jobs/[id]/page.tsx shows it when this holds).
    expect(jobHandedOn(view.job, view.piece)).toBe(true);
    expect(HANDED_ON_WORDS).toBe("It changed hands before this quote was paid. Once the new owner has registered the piece, send the quote again to reach them, or cancel the job.");
    // The former owner can no longer act on it.
    expect(await approveJob(handed.owner, handed.job.id).catch((e: unknown) => (e as { status: number }).status)).toBe(404);

    // Another studio's job, and the job on the piece the owner kept: still awaiting payment, pages open.
    for (const other of [elsewhere, { ...kept, sessionId: paymentsOf(kept.job.id)[0]!.checkoutSessionId }]) {
      const still = getStudioJob(other.staff, other.job.id);
      expect(still.job.state).toBe(AWAITING_PAYMENT);
      expect(jobHandedOn(still.job, still.piece)).toBe(false);
      expect(sessionAtFake(other.sessionId).status).toBe("open");
      expect(paymentsOf(other.job.id).map((p) => p.status)).toEqual(["open"]);
      expect(auditsOf(other.job.id, "job.handed_on")).toEqual([]);
    }
  });

  it("the new owner's own job is untouched, and the quote sent again reaches them: they can pay it", async () => {
    const handed = await approvedJob("handon-new-owner");
    const since = new Date();
    const { code } = await releasePiece(handed.owner, handed.job.pieceId, { confirm: true });
    const staffView = getStudioJob(handed.staff, handed.job.id);
    // Nobody holds the piece yet: sending again says so, and the job stays with the studio.
    expect(await sendQuote(handed.staff, handed.job.id).catch((e: unknown) => e)).toMatchObject({ status: 409, message: expect.stringMatching(/^The piece changed hands and nobody has registered it since/) });
    expect(getStudioJob(handed.staff, handed.job.id).job).toMatchObject({ state: "draft", version: staffView.job.version, ownerId: handed.owner.id });

    // The new owner, with a job of their own on another piece awaiting their payment, registers the piece.
    const theirs = await approvedJob("handon-new-owner-own");
    const next = theirs.owner;
    await registerPiece({ ...next, emailVerifiedAt: new Date() }, { code }, "203.0.113.92");
    expect(getStudioJob(theirs.staff, theirs.job.id).job.state).toBe(AWAITING_PAYMENT);
    expect(sessionAtFake(theirs.sessionId).status).toBe("open");
    // Until the quote is sent again, the job isn't theirs.
    expect(() => getOwnerJob(next, handed.job.id)).toThrow("No such repair job.");

    await sendQuote(handed.staff, handed.job.id);
    const mail = await waitForMail({ to: next.email, subject: /^Your repair quote from /, since });
    expect(mail.text).toContain(staffView.piece.title);
    const sent = getStudioJob(handed.staff, handed.job.id);
    expect(sent.job).toMatchObject({ state: "quoted", ownerId: next.id, quoteVersion: handed.job.quoteVersion + 1 });
    expect(jobHandedOn(sent.job, sent.piece)).toBe(false);
    const { checkoutUrl } = await approveJob(next, handed.job.id);
    expect((await payOnPage(checkoutUrl!)).status).toBe(303);
    await until(() => getStudioJob(handed.staff, handed.job.id).job.state === "paid", 15_000);
    // Their own job elsewhere is as it was.
    expect(getStudioJob(theirs.staff, theirs.job.id).job.state).toBe(AWAITING_PAYMENT);
    expect(sessionAtFake(theirs.sessionId).status).toBe("open");
  });
});

describe("what the staff job page says about a job whose piece changed hands", () => {
  const held = { ownerId: "owner-a" };
  const handedOn = { ownerId: null };
  const job = (state: RepairJob["state"], quoteVersion = 1) => ({ state, quoteVersion, ownerId: "owner-a" });

  it("names the state the job is in: set back, a quote the former owner can't approve, or work whose visit they no longer see", () => {
    expect(handedOnWords(job("draft"), handedOn, "Jonah Reyes")).toBe(HANDED_ON_WORDS);
    // Before, a sent quote or booked work on a handed-on piece said nothing to staff.
    expect(handedOnWords(job("quoted"), handedOn, "Jonah Reyes")).toBe(
      "It changed hands after this quote was sent, and Jonah Reyes can no longer approve it. Edit the quote and send it again once the new owner has registered the piece, or cancel the job.",
    );
    for (const state of ["paid", "covered", "scheduled"] as const) {
      expect(handedOnWords(job(state), { ownerId: "owner-b" }, "Jonah Reyes")).toMatch(/^It changed hands before this work was done\. Jonah Reyes no longer sees this job's visit/);
    }
    // Nothing while the owner holds the piece, and nothing on a job that is over or never sent.
    for (const state of ["draft", "quoted", "approved", "paid", "scheduled", "done", "cancelled"] as const) expect(handedOnWords(job(state), held, "Jonah Reyes")).toBeNull();
    for (const state of ["done", "cancelled"] as const) expect(handedOnWords(job(state), handedOn, "Jonah Reyes")).toBeNull();
    expect(handedOnWords(job("draft", 0), handedOn, "Jonah Reyes")).toBeNull();
  });
});
