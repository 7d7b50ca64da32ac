import "server-only";
import { z } from "zod";
import { env, outboxEnabled } from "@/lib/env";
import { notFound } from "@/lib/errors";

// The development outbox reads the local SMTP sink over HTTP, as it would any outside service.
const summary = z.object({
  id: z.string(),
  receivedAt: z.string(),
  subject: z.string(),
  to: z.array(z.string()),
  text: z.string(),
  html: z.string(),
  attachments: z.array(z.object({ filename: z.string(), contentType: z.string(), size: z.number() })),
});
export type OutboxMessage = z.infer<typeof summary>;

export async function listOutbox({ to }: { to?: string } = {}): Promise<{ messages: OutboxMessage[]; reachable: boolean }> {
  if (!outboxEnabled) throw notFound();
  const url = new URL("/messages", env.MAIL_SINK_URL);
  if (to) url.searchParams.set("to", to);
  try {
    const res = await fetch(url, { cache: "no-store", signal: AbortSignal.timeout(3000) });
    if (!res.ok) return { messages: [], reachable: false };
    return { messages: z.array(summary).parse(await res.json()), reachable: true };
  } catch {
    return { messages: [], reachable: false };
  }
}
