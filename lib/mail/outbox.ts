import "server-only";
import { z } from "zod";
import type { StudioContext } from "@/lib/auth/guards";
import { env, outboxEnabled } from "@/lib/env";
import { notFound } from "@/lib/errors";
import { STUDIO_HEADER } from "@/lib/mail";

// The development outbox reads the local SMTP sink over HTTP, as it would any outside service. The
// sink holds every studio's mail and every account's; a studio's admins see only the messages sent
// for their studio (sendMail's studioId, carried in the X-Grainward-Studio header). Account mail —
// e-mail confirmations and password resets, whose links hand over an account — carries no studio
// and is never shown here, to anyone; developers read it from the sink itself.
const summary = z.object({
  id: z.string(),
  receivedAt: z.string(),
  subject: z.string(),
  to: z.array(z.string()),
  text: z.string(),
  html: z.string(),
  headers: z.record(z.string(), z.string()).default({}),
  attachments: z.array(z.object({ filename: z.string(), contentType: z.string(), size: z.number() })),
});
export type OutboxMessage = z.infer<typeof summary>;

const studioHeader = STUDIO_HEADER.toLowerCase();

/** The studio's own mail as the sink received it, newest first (optionally only to one address). */
export async function listOutbox(ctx: Pick<StudioContext, "studio">, { to }: { to?: string } = {}): Promise<{ messages: OutboxMessage[]; reachable: boolean }> {
  if (!outboxEnabled) throw notFound();
  const url = new URL("/messages", env.MAIL_SINK_URL);
  if (to) url.searchParams.set("to", to);
  try {
    const res = await fetch(url, { cache: "no-store", signal: AbortSignal.timeout(3000) });
    if (!res.ok) return { messages: [], reachable: false };
    const messages = z.array(summary).parse(await res.json()).filter((m) => m.headers[studioHeader] === ctx.studio.id);
    return { messages, reachable: true };
  } catch {
    return { messages: [], reachable: false };
  }
}
