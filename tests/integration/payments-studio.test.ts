// A studio's own Stripe account, through the real stripe SDK against the local Stripe fake over HTTP:
// a studio that saved its own key in set-up is charged under that key (the fake says which key each
// request came with, and keeps accounts apart as Stripe does), a studio without one under the
// install's key; events from the studio's account reach its own endpoint and are verified with the
// signing secret it saved, so one signed with another studio's secret is refused.
import { eq } from "drizzle-orm";
import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { auditLog, payments, repairJobs, studios } from "@/db/schema";
import { startStripeFake, SUCCESS_CARD, type StripeFake } from "@/lib/fakes/stripe-fake";
import { getStripe } from "@/lib/payments/stripe";
import { approveJob, cancelJob, handleStripeWebhook } from "@/lib/repairs/payment";
import { saveStripeWebhookSecret, stripeAccountStatus } from "@/lib/studio/setup-payments";
import { saveStripeKey } from "@/lib/studio/setup-steps";
import { createStudio, memberContext, unique } from "../support/fixtures";
import { quotedRepairJob } from "../support/repair-quote";
import { startWebhookReceiver, until, type WebhookReceiver } from "../support/stripe-receiver";

// Invented keys of two studios' own (test-mode) Stripe accounts.
const A = { secretKey: "sk_test_studio_a_invented_4e1f", webhookSecret: "whsec_studio_a_invented_77aa" };
const C = { secretKey: "sk_test_studio_c_invented_90bc", webhookSecret: "whsec_studio_c_invented_31cc" };
const INSTALL_KEY = process.env.STRIPE_SECRET_KEY!;

let fake: StripeFake;
let studioA: ReturnType<typeof createStudio>;
let receiver: WebhookReceiver;
const answers: { path: string; status: number }[] = [];

beforeAll(async () => {
  // Stands in for the app's endpoints: /install → the install's endpoint, /studio/:id → a studio's.
  receiver = await startWebhookReceiver(
    (raw, sig, path) => handleStripeWebhook(raw, sig, path.startsWith("/studio/") ? path.slice("/studio/".length) : undefined),
    (status, path) => answers.push({ path, status }),
  );
  studioA = createStudio({ email: `${unique("a")}@test.example`, currency: "USD", labourRateMinor: 8000, taxRateBp: 0 });
  const base = receiver.url;
  fake = await startStripeFake({
    port: Number(process.env.STRIPE_API_PORT),
    secretKey: INSTALL_KEY,
    webhookSecret: process.env.STRIPE_WEBHOOK_SECRET!,
    webhookUrl: `${base}/install`,
    retryDelaysMs: [200],
    accounts: [{ ...A, webhookUrl: `${base}/studio/${studioA.id}` }, C],
  });
});

afterAll(async () => {
  await fake.close();
  await receiver.close();
});

const jobState = (id: string) => getDb().select({ s: repairJobs.state }).from(repairJobs).where(eq(repairJobs.id, id)).get()!.s;

/** Posts to the studio's webhook route as Stripe would. */
async function postToStudioEndpoint(studioId: string, payload: string, signature: string) {
  const { POST } = await import("@/app/api/webhooks/stripe/studio/[studioId]/route");
  const req = new NextRequest(`http://localhost:3999/api/webhooks/stripe/studio/${studioId}`, { method: "POST", body: payload, headers: { "content-type": "application/json", "stripe-signature": signature } });
  const res = await POST(req, { params: Promise.resolve({ studioId }) });
  return { status: res.status, body: await res.text() };
}

describe("a studio's own Stripe account", () => {
  it("set-up keeps the studio's key and signing secret sealed and shows only their last four characters", async () => {
    const admin = await memberContext(studioA, "admin");
    await saveStripeKey(admin, { secretKey: A.secretKey });
    saveStripeWebhookSecret(admin, { webhookSecret: A.webhookSecret });
    const row = getDb().select().from(studios).where(eq(studios.id, studioA.id)).get()!;
    expect(row.stripeSecretSealed).not.toContain(A.secretKey);
    expect(row.stripeWebhookSecretSealed).not.toContain(A.webhookSecret);
    const status = stripeAccountStatus(admin);
    expect(status).toMatchObject({ keyEnding: "…4e1f", webhookSecretEnding: "…77aa" });
    expect(status.webhookUrl).toMatch(new RegExp(`/api/webhooks/stripe/studio/${studioA.id}$`));
    const shown = JSON.stringify(status);
    expect(shown).not.toContain(A.secretKey.slice(0, -4));
    expect(shown).not.toContain(A.webhookSecret.slice(0, -4));
    const audit = JSON.stringify(getDb().select().from(auditLog).where(eq(auditLog.studioId, studioA.id)).all());
    expect(audit).not.toContain(A.secretKey);
    expect(audit).not.toContain(A.webhookSecret);
  });

  it("checkout, its webhook and the refund of a studio with its own key all run under that key", async () => {
    const { owner, job, staff } = await quotedRepairJob(studioA);
    const before = fake.requests().length;
    const { checkoutUrl } = await approveJob(owner, job.id);
    const session = fake.sessions().find((s) => s.client_reference_id === job.id)!;
    // From the fake's side: the session was created with studio A's key, and not with the install's.
    expect(fake.sessionKey(session.id)).toBe(A.secretKey);
    const created = fake.requests().slice(before).find((r) => r.method === "POST" && r.path === "/v1/checkout/sessions")!;
    expect(created.key).toBe(A.secretKey);
    // As at Stripe, the install's account can't see studio A's session.
    await expect(getStripe().checkout.sessions.retrieve(session.id)).rejects.toThrow(/No such checkout.session/);

    // Paid on the fake's page: the event goes to studio A's endpoint, signed with its secret; the app
    // re-reads the session under A's key and the job is paid.
    const res = await fetch(checkoutUrl!, { method: "POST", body: new URLSearchParams({ card: SUCCESS_CARD }), redirect: "manual" });
    expect(res.status).toBe(303);
    await until(() => jobState(job.id) === "paid");
    expect(answers.filter((a) => a.path === `/studio/${studioA.id}`).every((a) => a.status === 200)).toBe(true);

    // Cancelling refunds under A's key too.
    const mark = fake.requests().length;
    await cancelJob(staff, job.id);
    const refundCall = fake.requests().slice(mark).find((r) => r.path === "/v1/refunds")!;
    expect(refundCall.key).toBe(A.secretKey);
    await until(() => getDb().select().from(payments).where(eq(payments.jobId, job.id)).get()?.status === "refunded");
  });

  it("a studio without its own key is charged under the install's key", async () => {
    const studioB = createStudio({ email: `${unique("b")}@test.example`, currency: "USD", labourRateMinor: 8000, taxRateBp: 0 });
    const { owner, job } = await quotedRepairJob(studioB);
    await approveJob(owner, job.id);
    const session = fake.sessions().find((s) => s.client_reference_id === job.id)!;
    expect(fake.sessionKey(session.id)).toBe(INSTALL_KEY);
    expect(fake.requests().filter((r) => r.path === "/v1/checkout/sessions" && r.method === "POST").at(-1)!.key).toBe(INSTALL_KEY);
  });

  it("a webhook signed with another studio's secret is refused at the studio's endpoint, and nothing changes", async () => {
    const { owner, job } = await quotedRepairJob(studioA);
    await approveJob(owner, job.id);
    const session = fake.sessions().find((s) => s.client_reference_id === job.id)!;
    const payload = JSON.stringify({ id: `evt_${unique("forged")}`, object: "event", type: "checkout.session.completed", data: { object: { id: session.id } } });
    const stripe = getStripe();
    const wrong = await postToStudioEndpoint(studioA.id, payload, stripe.webhooks.generateTestHeaderString({ payload, secret: C.webhookSecret }));
    expect(wrong.status).toBe(400);
    expect(JSON.parse(wrong.body)).toMatchObject({ error: { code: "bad_request" } });
    // The install's secret is not studio A's either.
    const install = await postToStudioEndpoint(studioA.id, payload, stripe.webhooks.generateTestHeaderString({ payload, secret: process.env.STRIPE_WEBHOOK_SECRET! }));
    expect(install.status).toBe(400);
    // A studio that saved no signing secret has no endpoint.
    const none = await postToStudioEndpoint(createStudio().id, payload, stripe.webhooks.generateTestHeaderString({ payload, secret: A.webhookSecret }));
    expect(none.status).toBe(404);
    expect(jobState(job.id)).toBe("approved");
    // Signed with A's own secret the same event is taken (the session is still open: nothing is paid).
    const right = await postToStudioEndpoint(studioA.id, payload, stripe.webhooks.generateTestHeaderString({ payload, secret: A.webhookSecret }));
    expect(right.status).toBe(200);
  });
});
