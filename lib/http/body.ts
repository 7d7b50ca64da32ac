import "server-only";
import { badRequest, payloadTooLarge, unsupportedMediaType } from "@/lib/errors";

// The one way a route reads a request body: never more than the route's limit held in memory. A
// declared Content-Length over the limit is refused before anything is read; a body sent in chunks
// (no Content-Length, or one that lies) is counted as it streams and cancelled at the limit. Both
// answer 413 payload_too_large.

const KB = 1024;
const MB = 1024 * KB;

/** Per-kind limits, in bytes. Photo uploads have theirs in lib/files/upload.ts (a photo plus its multipart framing). */
export const BODY_LIMITS = {
  /** Any JSON body unless its route names a larger one. */
  json: 1 * MB,
  /** The payment provider's webhook: one event, signed over its raw text. */
  webhook: 1 * MB,
  /** A small url-encoded or multipart form without files (one-click unsubscribe). */
  form: 64 * KB,
} as const;

/** The body's bytes, at most `limit` of them, else a 413 (the rest of the stream is cancelled, never read). */
export async function readBody(req: Request, limit: number): Promise<Uint8Array> {
  const declared = req.headers.get("content-length");
  if (declared !== null && Number(declared) > limit) {
    await req.body?.cancel().catch(() => {});
    throw payloadTooLarge(limit);
  }
  if (!req.body) return new Uint8Array(0);
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > limit) {
      await reader.cancel().catch(() => {});
      throw payloadTooLarge(limit);
    }
    chunks.push(value);
  }
  return chunks.length === 1 ? chunks[0]! : Buffer.concat(chunks, total);
}

/** The body as UTF-8 text (for a signature checked over the raw text), at most `limit` bytes. */
export async function readText(req: Request, limit: number): Promise<string> {
  return new TextDecoder().decode(await readBody(req, limit));
}

/**
 * The body parsed as JSON, at most `limit` bytes. An empty body is `undefined` when `optional`, else
 * a 400 like any body that is not JSON.
 */
export async function readJson(req: Request, opts: { limit?: number; optional?: boolean } = {}): Promise<unknown> {
  const text = await readText(req, opts.limit ?? BODY_LIMITS.json);
  if (opts.optional && !text.trim()) return undefined;
  try {
    return JSON.parse(text) as unknown;
  } catch {
    throw badRequest("The request body must be JSON.");
  }
}

const FORM_TYPES = { multipart: /^multipart\/form-data;\s*boundary=/i, urlencoded: /^application\/x-www-form-urlencoded\b/i } as const;
export type FormKind = keyof typeof FORM_TYPES;

export function isForm(req: Request, kinds: readonly FormKind[] = ["multipart"]): boolean {
  const type = req.headers.get("content-type") ?? "";
  return kinds.some((k) => FORM_TYPES[k].test(type));
}

/**
 * The body parsed as form data, after a bounded read (the parser only ever sees at most `limit`
 * bytes). A body of another content type is a 415 naming what to send.
 */
export async function readForm(req: Request, limit: number, kinds: readonly FormKind[] = ["multipart"]): Promise<FormData> {
  if (!isForm(req, kinds)) {
    await req.body?.cancel().catch(() => {});
    const names = kinds.map((k) => (k === "multipart" ? "multipart/form-data" : "application/x-www-form-urlencoded"));
    throw unsupportedMediaType(`Send this as ${names.join(" or ")}.`);
  }
  const bytes = await readBody(req, limit);
  try {
    return await new Response(new Uint8Array(bytes), { headers: { "content-type": req.headers.get("content-type")! } }).formData();
  } catch {
    throw badRequest("The form data could not be read. Try again.");
  }
}
