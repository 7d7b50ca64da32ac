// Before an owner releases a piece they pay a care plan on, the release page tells them what happens to
// the plan (lib/plans/transfer.ts planOnRelease, the rule recordPlanHandOver then applies); after it, the
// "plan ended" mail sends them to their list of pieces, not to the piece's page, which is no longer theirs.
// Real stripe SDK against the local Stripe fake over HTTP, real SMTP sink. Invented studio and owners.
import { describe, expect, it } from "vitest";
import { addDays, localDate } from "@/lib/care/dates";
import { releasePiece } from "@/lib/owner/transfer";
import { planOnRelease } from "@/lib/plans/transfer";
import { createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { extractLinks, waitForMail } from "../support/mail";
import { buyPlan, plansStripeForFile, subRow, yearlyPlan } from "../support/plans-stripe";

const stripe = plansStripeForFile();

async function setup(over: { refundRule: "none" | "unused_share"; transfers: boolean }) {
  const studio = createStudio({ email: `${unique("plan-release")}@test.example`, taxRateBp: 0 });
  const admin = await memberContext(studio, "admin");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id, deliveredOn: addDays(localDate(new Date(), "UTC"), -60) });
  const plan = yearlyPlan(admin, over);
  const sub = await buyPlan(stripe.fake, owner, piece.id, plan.id);
  return { owner, piece, sub };
}

describe("a care plan when its owner releases the piece", () => {
  it("a plan that ends: the owner is told beforehand what comes back, and the mail after links to their pieces", async () => {
    const { owner, piece, sub } = await setup({ refundRule: "unused_share", transfers: false });
    const someoneElse = await createUser();
    expect(planOnRelease(someoneElse, piece.id)).toBeNull();

    const before = planOnRelease(owner, piece.id)!;
    // Bought today: 11 whole months of the 12 paid are left, 120.00 × 11 / 12 = 110.00 (pro rata by whole months, as lib/plans/refund.ts).
    expect(before).toMatchObject({ planName: "Yearly keeping (invented)", moves: false, months: 11, refundMinor: 11_000, currency: "USD", paidBy: "card" });

    const since = new Date();
    await releasePiece(owner, piece.id, { confirm: true });
    expect(subRow(sub.id).state).toBe("ended");
    const mail = await waitForMail({ to: owner.email, subject: /^Your care plan has ended with the piece's new owner/, since });
    expect(mail.text).toContain("$110.00 for 11 unused months");
    const links = extractLinks(mail.text);
    expect(links.some((l) => new URL(l).pathname === "/pieces")).toBe(true);
    expect(links.some((l) => new URL(l).pathname === `/pieces/${piece.id}`)).toBe(false);
    expect(mail.text).toContain("See your pieces");
  });

  it("a plan that moves with the piece: it runs to the end of the paid period for the next owner, nothing back", async () => {
    const { owner, piece, sub } = await setup({ refundRule: "unused_share", transfers: true });
    expect(planOnRelease(owner, piece.id)).toMatchObject({ moves: true, refundMinor: 0, endsAt: sub.periodEnd!.getTime() });
  });
});
