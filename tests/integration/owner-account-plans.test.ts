// Deleting an owner's account (lib/owner/account-delete.ts) with care plans: refused while a plan's first
// payment is under way (its payment page open), and a running plan on a piece they hold ends by the rule a
// release applies (lib/plans/transfer.ts), its refund claimed. Real stripe SDK against the local Stripe fake
// over HTTP, real SQLite file, real SMTP sink. Invented studio and owner.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { ownerships, pieces, planRefunds, users } from "@/db/schema";
import { ownerActor } from "@/lib/auth/actor";
import { addDays, localDate } from "@/lib/care/dates";
import { deleteAccount } from "@/lib/owner/account-delete";
import { startPlanCheckout } from "@/lib/plans/subscriptions";
import { createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { buyPlan, plansStripeForFile, subRow, yearlyPlan } from "../support/plans-stripe";

const stripe = plansStripeForFile();
const PASSWORD = "correct horse battery"; // tests/support/fixtures.ts createUser

async function world() {
  const studio = createStudio({ email: `${unique("plans-delete")}@test.example`, taxRateBp: 0 });
  const admin = await memberContext(studio, "admin");
  const owner = await createUser({ name: "Plan Holder (invented)" });
  const { piece } = createPiece(studio, { ownerId: owner.id, registeredAt: new Date(), deliveredOn: addDays(localDate(new Date(), "UTC"), -60) });
  getDb().insert(ownerships).values({ studioId: studio.id, pieceId: piece.id, userId: owner.id, via: "registration", startedAt: new Date() }).run();
  return { studio, admin, owner, piece };
}

describe("deleting an account that pays for a care plan", () => {
  it("is refused while the plan's first payment is under way; nothing changes", async () => {
    const w = await world();
    const plan = yearlyPlan(w.admin, { refundRule: "none", transfers: false });
    const { subscriptionId } = await startPlanCheckout(w.owner, w.piece.id, plan.id);
    expect(subRow(subscriptionId).state).toBe("awaiting_payment");
    await expect(deleteAccount(ownerActor(w.owner), PASSWORD, "198.51.100.201")).rejects.toMatchObject({
      status: 409,
      message: expect.stringContaining("The first payment for the care plan on “Test table (invented)” is under way."),
    });
    expect(getDb().select({ ownerId: pieces.ownerId }).from(pieces).where(eq(pieces.id, w.piece.id)).get()!.ownerId).toBe(w.owner.id);
    expect(getDb().select({ deletedAt: users.deletedAt }).from(users).where(eq(users.id, w.owner.id)).get()!.deletedAt).toBeNull();
  });

  it("a running plan on a piece they hold ends with the release, its refund claimed by the plan's rule", async () => {
    const w = await world();
    const plan = yearlyPlan(w.admin, { refundRule: "unused_share", transfers: false });
    const sub = await buyPlan(stripe.fake, w.owner, w.piece.id, plan.id);
    expect(sub.state).toBe("running");
    await deleteAccount(ownerActor(w.owner), PASSWORD, "198.51.100.202");
    expect(subRow(sub.id).state).toBe("ended");
    const refund = getDb().select().from(planRefunds).where(eq(planRefunds.subscriptionId, sub.id)).get();
    expect(refund).toBeDefined();
    expect(refund!.amountMinor).toBeGreaterThan(0);
    expect(getDb().select({ ownerId: pieces.ownerId }).from(pieces).where(eq(pieces.id, w.piece.id)).get()!.ownerId).toBeNull();
    expect(getDb().select({ name: users.name }).from(users).where(eq(users.id, w.owner.id)).get()!.name).toBe("Former owner (account deleted)");
  });
});
