// Care plans of a studio that charges under its own Stripe account, through the real stripe SDK against
// the local Stripe fake over HTTP: the plan's checkout, its subscription's events (at the studio's own
// webhook endpoint, verified with its own signing secret) and its cancellation all run under the
// studio's key; a studio without a key stays on the install's. Invented studios, keys and owners.
import http from "node:http";
import type { AddressInfo } from "node:net";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { startStripeFake, SUCCESS_CARD, type StripeFake } from "@/lib/fakes/stripe-fake";
import { addDays, localDate } from "@/lib/care/dates";
import { cancelMyPlan, myPlanControl } from "@/lib/plans/cancel";
import { handlePlanWebhook } from "@/lib/plans/stripe-sync";
import { startPlanCheckout } from "@/lib/plans/subscriptions";
import { createTemplate } from "@/lib/plans/templates";
import { planTemplateSchema } from "@/lib/plans/validation";
import { handleStripeWebhook } from "@/lib/repairs/payment";
import { saveStripeWebhookSecret } from "@/lib/studio/setup-payments";
import { saveStripeKey } from "@/lib/studio/setup-steps";
import { createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { subRow, until } from "../support/plans-stripe";

const A = { secretKey: "sk_test_plans_studio_a_invented_5d2e", webhookSecret: "whsec_plans_studio_a_invented_8b41" };

let fake: StripeFake;
let receiver: http.Server;
let studioA: ReturnType<typeof createStudio>;
const answers: { path: string; status: number }[] = [];

beforeAll(async () => {
  // Stands in for the app's two endpoints, each handing plan events to lib/plans first, as the routes do.
  receiver = http.createServer(async (req, res) => {
    const chunks: Buffer[] = [];
    for await (const c of req) chunks.push(c as Buffer);
    const raw = Buffer.concat(chunks).toString("utf8");
    const sig = (req.headers["stripe-signature"] as string) ?? null;
    const studioId = req.url?.startsWith("/studio/") ? req.url.slice("/studio/".length) : undefined;
    let status = 200;
    try {
      if (!(await handlePlanWebhook(raw, sig, studioId))) await handleStripeWebhook(raw, sig, studioId);
    } catch (e) {
      status = e instanceof AppError ? e.status : 500;
    }
    answers.push({ path: req.url ?? "", status });
    res.writeHead(status).end("{}");
  });
  await new Promise<void>((r) => receiver.listen(0, "127.0.0.1", () => r()));
  studioA = createStudio({ email: `${unique("plans-a")}@test.example`, taxRateBp: 0 });
  const base = `http://127.0.0.1:${(receiver.address() as AddressInfo).port}`;
  fake = await startStripeFake({
    port: 0,
    secretKey: env.STRIPE_SECRET_KEY,
    webhookSecret: env.STRIPE_WEBHOOK_SECRET,
    webhookUrl: `${base}/install`,
    retryDelaysMs: [200],
    accounts: [{ ...A, webhookUrl: `${base}/studio/${studioA.id}` }],
  });
  env.STRIPE_API_PORT = fake.port;
});

afterAll(async () => {
  await fake?.close();
  await new Promise((r) => receiver.close(r));
});

async function ownerWithPlan(studio: ReturnType<typeof createStudio>) {
  const admin = await memberContext(studio, "admin");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id, deliveredOn: addDays(localDate(new Date(), "UTC"), -30) });
  const plan = createTemplate(
    admin,
    planTemplateSchema.parse({
      name: "Yearly keeping (invented)",
      included: { tasks: ["reoil"], visitsPerYear: 0, visitSharePct: 0, extendedLines: [], repairDiscountPct: 0 },
      fits: { finishClasses: [], pieceKinds: [], minTopAreaM2: null, maxTopAreaM2: null },
      priceMinor: 12_000,
      interval: "year",
      refundRule: "none",
      transfers: false,
    }),
  );
  return { admin, owner, piece, plan };
}

describe("care plans under a studio's own Stripe account", () => {
  it("checkout, the subscription's events at the studio's endpoint and the cancellation all use the studio's key", async () => {
    const { admin, owner, piece, plan } = await ownerWithPlan(studioA);
    await saveStripeKey(admin, { secretKey: A.secretKey });
    saveStripeWebhookSecret(admin, { webhookSecret: A.webhookSecret });

    const mark = fake.requests().length;
    const { checkoutUrl, subscriptionId } = await startPlanCheckout(owner, piece.id, plan.id);
    const session = fake.sessions().find((s) => s.client_reference_id === subscriptionId)!;
    expect(fake.sessionKey(session.id)).toBe(A.secretKey);
    expect(fake.requests().slice(mark).filter((r) => r.method === "POST").map((r) => r.key)).toEqual(expect.arrayContaining([A.secretKey]));
    expect(fake.requests().slice(mark).some((r) => r.key === env.STRIPE_SECRET_KEY)).toBe(false);

    const paid = await fetch(checkoutUrl, { method: "POST", body: new URLSearchParams({ card: SUCCESS_CARD }), redirect: "manual" });
    expect(paid.status).toBe(303);
    // The events come to the studio's own endpoint, verified with its secret, and move its plan.
    await until(() => subRow(subscriptionId).state === "running");
    expect(answers.filter((a) => a.path === `/studio/${studioA.id}`).length).toBeGreaterThan(0);
    expect(answers.every((a) => a.status === 200)).toBe(true);
    await until(() => fake.deliveries().length >= fake.events().length);

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
    const { checkoutUrl, subscriptionId } = await startPlanCheckout(owner, piece.id, plan.id);
    const session = fake.sessions().find((s) => s.client_reference_id === subscriptionId)!;
    expect(fake.sessionKey(session.id)).toBe(env.STRIPE_SECRET_KEY);
    await fetch(checkoutUrl, { method: "POST", body: new URLSearchParams({ card: SUCCESS_CARD }), redirect: "manual" });
    await until(() => subRow(subscriptionId).state === "running");
  });
});
