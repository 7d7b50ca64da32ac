// What the Stripe-fake tests share: a small HTTP receiver standing in for the app's webhook endpoint
// (the fake posts its signed events there; the raw body and signature go to the product's handler, and
// an AppError's status is the answer, as the route gives it), and a poll for what arrives later.
import http from "node:http";
import type { AddressInfo } from "node:net";
import { AppError } from "@/lib/errors";

export type WebhookReceiver = { url: string; close: () => Promise<void> };

/**
 * Starts the receiver on a free port. `handle` gets the raw body, the signature header and the path
 * posted to; `onAnswer` hears each answer's status (200 unless `handle` threw).
 */
export async function startWebhookReceiver(
  handle: (raw: string, signature: string | null, path: string) => Promise<unknown>,
  onAnswer?: (status: number, path: string) => void,
): Promise<WebhookReceiver> {
  const receiver = http.createServer(async (req, res) => {
    const chunks: Buffer[] = [];
    for await (const c of req) chunks.push(c as Buffer);
    const path = req.url ?? "/";
    let status = 200;
    let out: unknown = {};
    try {
      out = (await handle(Buffer.concat(chunks).toString("utf8"), (req.headers["stripe-signature"] as string) ?? null, path)) ?? {};
    } catch (e) {
      status = e instanceof AppError ? e.status : 500;
    }
    onAnswer?.(status, path);
    res.writeHead(status).end(status === 200 ? JSON.stringify(out) : undefined);
  });
  await new Promise<void>((r) => receiver.listen(0, "127.0.0.1", () => r()));
  return {
    url: `http://127.0.0.1:${(receiver.address() as AddressInfo).port}`,
    close: () => new Promise<void>((r) => receiver.close(() => r())),
  };
}

/** Polls `fn` until it gives something truthy (events arrive asynchronously); fails after `ms`. */
export async function until<T>(fn: () => T | undefined | null | false, ms = 8000): Promise<T> {
  const end = Date.now() + ms;
  for (;;) {
    const v = fn();
    if (v) return v;
    if (Date.now() > end) throw new Error("timed out waiting");
    await new Promise((r) => setTimeout(r, 50));
  }
}

/**
 * A gate for the receiver's deliveries: while held, `passed()` waits (the fake waits up to 10 s for an
 * answer), so the app has not yet heard of payments the fake has already taken, as when webhooks are
 * slow or out of order; `release()` lets them through.
 */
export function webhookGate() {
  let held: Promise<void> | null = null;
  let open = () => {};
  return {
    hold() {
      held = new Promise<void>((r) => {
        open = () => {
          held = null;
          r();
        };
      });
    },
    release: () => open(),
    passed: () => held ?? Promise.resolve(),
  };
}
