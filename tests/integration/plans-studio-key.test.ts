// Care plans of a studio that charges under its own Stripe account, through the real stripe SDK against
// the local Stripe fake over HTTP: the plan's checkout, its subscription's events (at the studio's own
// webhook endpoint, verified with its own signing secret) and its cancellation all run under the
// studio's key; a studio without a key stays on the install's. Invented studios, keys and owners.
import { describe, expect, it } from "vitest";
import { env } from "@/lib/env";
import { addDays, localDate } from "@/lib/care/dates";
import { cancelMyPlan, myPlanControl } from "@/lib/plans/cancel";
import { saveStripeWebhookSecret } from "@/lib/studio/setup-payments";
import { saveStripeKey } from "@/lib/studio/setup-steps";
import { createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { buyPlan, plansStripeForFile, subRow, yearlyPlan } from "../support/plans-stripe";

const A = { secretKey: "sk_test_plans_studio_a_invented_5d2e", webhookSecret: "whsec_plans_studio_a_invented_8b41" };

let studioA: ReturnType<typeof createStudio>;
// The studio is made before the fake starts, so that its account's events go to its own endpoint.
const stripe = plansStripeForFile({
  accounts: (url) => {
    studioA = createStudio({ email: `${unique("plans-a")}@test.example`, taxRateBp: 0 });
    return [{ ...A, webhookUrl: `${url}/studio/${studioA.id}` }];
  },
});

async function ownerWithPlan(studio: ReturnType<typeof createStudio>) {
  const admin = await memberContext(studio, "admin");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id, deliveredOn: addDays(localDate(new Date(), "UTC"), -30) });
  const plan = yearlyPlan(admin, { refundRule: "none", transfers: false });
  return { admin, owner, piece, plan };
}

describe("care plans under a studio's own Stripe account", () => {
  it("checkout, the subscription's events at the studio's endpoint and the cancellation all use the studio's key", async () => {
    const { admin, owner, piece, plan } = await ownerWithPlan(studioA);
    await saveStripeKey(admin, { secretKey: A.secretKey });
    saveStripeWebhookSecret(admin, { webhookSecret: A.webhookSecret });

    const { fake, answers } = stripe;
    const mark = fake.requests().length;
    // Bought on the fake's payment page; the events come to the studio's own endpoint, verified with its secret, and move its plan.
    const { id: subscriptionId } = await buyPlan(fake, owner, piece.id, plan.id);
    const session = fake.sessions().find((s) => s.client_reference_id === subscriptionId)!;
    expect(fake.sessionKey(session.id)).toBe(A.secretKey);
    expect(fake.requests().slice(mark).filter((r) => r.method === "POST").map((r) => r.key)).toEqual(expect.arrayContaining([A.secretKey]));
    expect(fake.requests().slice(mark).some((r) => r.key === env.STRIPE_SECRET_KEY)).toBe(false);
    expect(answers.filter((a) => a.path === `/studio/${studioA.id}`).length).toBeGreaterThan(0);
    expect(answers.every((a) => a.status === 200)).toBe(true);

    const control = myPlanControl(owner, piece.id)!;
    const before = fake.requests().length;
    await cancelMyPlan(owner, control.subscriptionId, { version: control.version, refundMinor: 0 });
    const calls = fake.requests().slice(before);
    expect(calls.some((r) => r.method === "POST" && r.path.startsWith("/v1/subscriptions/"))).toBe(true);
    expect(calls.every((r) => r.key === A.secretKey)).toBe(true);
    expect(subRow(subscriptionId).state).toBe("ending");
  });

  it("a studio without its own key buys and cancels under the install's key", async () => {
    const studio = createStudio({ email: `${unique("plans-b")}@test.example`, taxRateBp: 0 });
    const { owner, piece, plan } = await ownerWithPlan(studio);
    const { id: subscriptionId } = await buyPlan(stripe.fake, owner, piece.id, plan.id);
    const session = stripe.fake.sessions().find((s) => s.client_reference_id === subscriptionId)!;
    expect(stripe.fake.sessionKey(session.id)).toBe(env.STRIPE_SECRET_KEY);
  });
});
