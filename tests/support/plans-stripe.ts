// Care plan tests against the local Stripe fake over HTTP, through the real stripe SDK: the fake's
// signed webhooks arrive at a small receiver here that hands the raw body to the webhook route's
// handlers (plans first, then repair payments, as app/api/webhooks/stripe/route.ts does). A studio's own
// account (`accounts`) posts to the receiver's /studio/<id>, which stands in for that studio's endpoint.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll } from "vitest";
import { getDb } from "@/db/client";
import type { User } from "lucia";
import { planInvoices, planSubscriptions, type PlanSubscription } from "@/db/schema";
import type { StudioActor } from "@/lib/auth/actor";
import { env } from "@/lib/env";
import { startStripeFake, SUCCESS_CARD, type FakeAccount, type StripeFake } from "@/lib/fakes/stripe-fake";
import { handlePlanWebhook } from "@/lib/plans/stripe-sync";
import { startPlanCheckout } from "@/lib/plans/subscriptions";
import { createTemplate } from "@/lib/plans/templates";
import { handleStripeWebhook } from "@/lib/repairs/payment";
import { planTemplateInput } from "./fixtures";
import { startWebhookReceiver, until } from "./stripe-receiver";

export { until };

export type PlansStripeOptions = {
  /** Studios' own Stripe accounts, given the receiver's address: each posts its events to `${url}/studio/<studio id>`. */
  accounts?: (url: string) => FakeAccount[];
};

/** What the receiver answered each event with, and where it was posted (`/` for the install's endpoint). */
export type WebhookAnswer = { path: string; status: number };

/** Starts the fake and the webhook receiver, and points the app's Stripe client at the fake. */
export async function startPlansStripe(opts: PlansStripeOptions = {}): Promise<{ fake: StripeFake; answers: WebhookAnswer[]; close: () => Promise<void> }> {
  const answers: WebhookAnswer[] = [];
  const receiver = await startWebhookReceiver(
    async (raw, sig, path) => {
      const studioId = path.startsWith("/studio/") ? path.slice("/studio/".length) : undefined;
      return (await handlePlanWebhook(raw, sig, studioId)) ?? (await handleStripeWebhook(raw, sig, studioId));
    },
    (status, path) => answers.push({ path, status }),
  );
  const fake = await startStripeFake({
    port: 0,
    secretKey: env.STRIPE_SECRET_KEY,
    webhookSecret: env.STRIPE_WEBHOOK_SECRET,
    webhookUrl: `${receiver.url}/`,
    retryDelaysMs: [200, 400],
    accounts: opts.accounts?.(receiver.url),
  });
  env.STRIPE_API_PORT = fake.port;
  return {
    fake,
    answers,
    close: async () => {
      await fake.close();
      await receiver.close();
    },
  };
}

/**
 * For a test file: the fake and its receiver start before the file's tests and close after them; `.fake` is
 * the fake while they run, `.answers` the receiver's answers so far.
 */
export function plansStripeForFile(opts: PlansStripeOptions = {}): { readonly fake: StripeFake; readonly answers: WebhookAnswer[] } {
  let started: Awaited<ReturnType<typeof startPlansStripe>> | undefined;
  beforeAll(async () => {
    started = await startPlansStripe(opts);
  });
  afterAll(() => started?.close());
  const running = () => {
    if (!started) throw new Error("The Stripe fake starts before the file's tests (beforeAll).");
    return started;
  };
  return {
    get fake() {
      return running().fake;
    },
    get answers() {
      return running().answers;
    },
  };
}

export const subRow = (id: string) => getDb().select().from(planSubscriptions).where(eq(planSubscriptions.id, id)).get()!;

/** The fake's test knob: renew (outcome=pay|fail, amount=…), settle or lapse a subscription. */
export const knob = (fake: StripeFake, subId: string, action: string, body = "") =>
  fetch(`${fake.url}/_test/subscriptions/${subId}/${action}`, { method: "POST", headers: { authorization: `Bearer ${env.STRIPE_SECRET_KEY}`, "content-type": "application/x-www-form-urlencoded" }, body });

/** A yearly plan (120.00 before the studio's tax) that fits every piece, with no visits; invented. */
export function yearlyPlan(admin: StudioActor, over: { refundRule: "none" | "unused_share"; transfers: boolean }) {
  return createTemplate(
    admin,
    planTemplateInput({
      name: "Yearly keeping (invented)",
      included: { tasks: ["reoil"], visitsPerYear: 0, visitSharePct: 0, extendedLines: [], repairDiscountPct: 0 },
      fits: { finishClasses: [], pieceKinds: [], minTopAreaM2: null, maxTopAreaM2: null },
      priceMinor: 12_000,
      ...over,
    }),
  );
}

/** A second plan that fits every piece, monthly at another price (15.00 before the studio's tax), with no visits; invented. */
export function monthlyPlan(admin: StudioActor) {
  return createTemplate(
    admin,
    planTemplateInput({
      name: "Monthly keeping (invented)",
      included: { tasks: ["reoil"], visitsPerYear: 0, visitSharePct: 0, extendedLines: [], repairDiscountPct: 0 },
      fits: { finishClasses: [], pieceKinds: [], minTopAreaM2: null, maxTopAreaM2: null },
      priceMinor: 1_500,
      interval: "month",
    }),
  );
}

/** The owner buys the plan on the fake's payment page; resolves once it runs and every event of the purchase has landed. */
export async function buyPlan(fake: StripeFake, owner: Pick<User, "id" | "email" | "name">, pieceId: string, templateId: string): Promise<PlanSubscription> {
  const { checkoutUrl, subscriptionId } = await startPlanCheckout(owner, pieceId, templateId);
  const paid = await fetch(checkoutUrl, { method: "POST", body: new URLSearchParams({ card: SUCCESS_CARD }), redirect: "manual" });
  if (paid.status !== 303) throw new Error(`the fake's payment page answered ${paid.status}`);
  await until(() => subRow(subscriptionId).state === "running" && getDb().select().from(planInvoices).where(eq(planInvoices.subscriptionId, subscriptionId)).all().length === 1);
  await until(() => fake.deliveries().length >= fake.events().length && fake.deliveries().every((d) => d.status === 200));
  return subRow(subscriptionId);
}
