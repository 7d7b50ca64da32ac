// Test helpers that read the local SMTP sink over its HTTP API, as any outside client would.
import type { MessageSummary, StoredMessage } from "@/lib/fakes/smtp-sink";

export type { MessageSummary, StoredMessage };

function sinkUrl(explicit?: string): string {
  const url = explicit ?? process.env.MAIL_SINK_URL;
  if (!url) throw new Error("MAIL_SINK_URL is not set: start a sink (startSmtpSink) and set it, or pass sinkUrl");
  return url.replace(/\/+$/, "");
}

/** GET /messages (newest first), optionally only those sent to `to`. */
export async function listMail(opts: { to?: string; sinkUrl?: string } = {}): Promise<MessageSummary[]> {
  const url = new URL(`${sinkUrl(opts.sinkUrl)}/messages`);
  if (opts.to) url.searchParams.set("to", opts.to);
  const res = await fetch(url);
  if (!res.ok) throw new Error(`SMTP sink answered ${res.status} to GET ${url.pathname}`);
  return (await res.json()) as MessageSummary[];
}

/** GET /messages/:id, including the raw source. */
export async function getMail(id: string, opts: { sinkUrl?: string } = {}): Promise<StoredMessage> {
  const res = await fetch(`${sinkUrl(opts.sinkUrl)}/messages/${encodeURIComponent(id)}`);
  if (!res.ok) throw new Error(`SMTP sink answered ${res.status} to GET /messages/${id}`);
  return (await res.json()) as StoredMessage;
}

/** DELETE /messages. */
export async function clearMail(opts: { sinkUrl?: string } = {}): Promise<void> {
  const res = await fetch(`${sinkUrl(opts.sinkUrl)}/messages`, { method: "DELETE" });
  if (!res.ok) throw new Error(`SMTP sink answered ${res.status} to DELETE /messages`);
}

export type WaitForMailOptions = {
  to: string;
  subject?: string | RegExp;
  timeoutMs?: number;
  /** Only messages received at or after this moment (e.g. a Date taken before the action). */
  since?: Date | string | number;
  sinkUrl?: string;
  pollMs?: number;
};

/**
 * Polls the sink until a message to `to` (and matching `subject`: exact string or RegExp) arrives,
 * and returns the newest such message. Throws after `timeoutMs` with what the sink did hold.
 */
export async function waitForMail({
  to,
  subject,
  timeoutMs = 10_000,
  since,
  sinkUrl: explicitUrl,
  pollMs = 100,
}: WaitForMailOptions): Promise<MessageSummary> {
  const sinceMs = since === undefined ? undefined : new Date(since).getTime();
  const matches = (m: MessageSummary) =>
    (sinceMs === undefined || Date.parse(m.receivedAt) >= sinceMs) &&
    (subject === undefined || (typeof subject === "string" ? m.subject === subject : subject.test(m.subject)));

  const deadline = Date.now() + timeoutMs;
  let seen: MessageSummary[] = [];
  for (;;) {
    seen = await listMail({ to, sinkUrl: explicitUrl });
    const found = seen.find(matches);
    if (found) return found;
    if (Date.now() >= deadline) break;
    await new Promise((r) => setTimeout(r, pollMs));
  }
  const held = seen.map((m) => `  ${m.receivedAt} "${m.subject}"`).join("\n") || "  (none)";
  throw new Error(
    `No mail to ${to}${subject === undefined ? "" : ` with subject ${String(subject)}`} within ${timeoutMs} ms. Messages to ${to}:\n${held}`,
  );
}

/** Every http(s) URL in a text (plain-text part or HTML), in order, without duplicates. */
export function extractLinks(text: string): string[] {
  const found = text.match(/https?:\/\/[^\s<>"'`)\]]+/g) ?? [];
  const links = found.map((l) => l.replace(/&amp;/g, "&").replace(/[.,;:!?]+$/, ""));
  return [...new Set(links)];
}
