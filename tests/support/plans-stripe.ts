// Care plan tests against the local Stripe fake over HTTP, through the real stripe SDK: the fake's
// signed webhooks arrive at a small receiver here that hands the raw body to the webhook route's
// handlers (plans first, then repair payments, as app/api/webhooks/stripe/route.ts does).
import http from "node:http";
import type { AddressInfo } from "node:net";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { planSubscriptions } from "@/db/schema";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { startStripeFake, type StripeFake } from "@/lib/fakes/stripe-fake";
import { handlePlanWebhook } from "@/lib/plans/stripe-sync";
import { handleStripeWebhook } from "@/lib/repairs/payment";

/** Starts the fake and the webhook receiver, and points the app's Stripe client at the fake. */
export async function startPlansStripe(): Promise<{ fake: StripeFake; close: () => Promise<void> }> {
  const receiver = http.createServer(async (req, res) => {
    const chunks: Buffer[] = [];
    for await (const c of req) chunks.push(c as Buffer);
    const raw = Buffer.concat(chunks).toString("utf8");
    const sig = (req.headers["stripe-signature"] as string) ?? null;
    try {
      const out = (await handlePlanWebhook(raw, sig)) ?? (await handleStripeWebhook(raw, sig));
      res.writeHead(200).end(JSON.stringify(out));
    } catch (e) {
      res.writeHead(e instanceof AppError ? e.status : 500).end();
    }
  });
  await new Promise<void>((r) => receiver.listen(0, "127.0.0.1", () => r()));
  const fake = await startStripeFake({ port: 0, secretKey: env.STRIPE_SECRET_KEY, webhookSecret: env.STRIPE_WEBHOOK_SECRET, webhookUrl: `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/`, retryDelaysMs: [200, 400] });
  env.STRIPE_API_PORT = fake.port;
  return {
    fake,
    close: async () => {
      await fake.close();
      await new Promise((r) => receiver.close(r));
    },
  };
}

/** Polls `fn` until it gives something truthy (events arrive asynchronously). */
export async function until<T>(fn: () => T | undefined | null | false, ms = 8000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = fn();
    if (v) return v;
    if (Date.now() > end) throw new Error("timed out waiting");
    await new Promise((r) => setTimeout(r, 50));
  }
}

export const subRow = (id: string) => getDb().select().from(planSubscriptions).where(eq(planSubscriptions.id, id)).get()!;

/** The fake's test knob: renew (outcome=pay|fail, amount=…), settle or lapse a subscription. */
export const knob = (fake: StripeFake, subId: string, action: string, body = "") =>
  fetch(`${fake.url}/_test/subscriptions/${subId}/${action}`, { method: "POST", headers: { authorization: `Bearer ${env.STRIPE_SECRET_KEY}`, "content-type": "application/x-www-form-urlencoded" }, body });
