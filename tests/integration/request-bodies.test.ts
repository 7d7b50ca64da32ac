// The bounded body reader (lib/http/body.ts) and the routes that read bodies without a session (the
// payment webhook, one-click unsubscribe), called with real streams: an over-limit body is a 413
// after at most the limit has been pulled from the stream, with or without a Content-Length.
// tests/e2e/request-limits.spec.ts does the same over HTTP against the production build.
import { NextRequest } from "next/server";
import { describe, expect, it } from "vitest";
import { POST as stripeWebhook } from "@/app/api/webhooks/stripe/route";
import { POST as unsubscribe } from "@/app/api/unsubscribe/route";
import { AppError } from "@/lib/errors";
import { BODY_LIMITS, readBody, readForm, readJson } from "@/lib/http/body";

const CHUNK = 64 * 1024;

/** A body of `total` bytes (default: endless) served in 64 KB chunks; `pulled()` says how many bytes the reader took. */
function stream(total = Infinity, prefix = "") {
  let pulled = 0;
  const head = new TextEncoder().encode(prefix);
  const body = new ReadableStream<Uint8Array>({
    pull(c) {
      if (pulled >= total) return c.close();
      const chunk = pulled === 0 ? new Uint8Array([...head, ...new Uint8Array(CHUNK - head.length).fill(0x61)]) : new Uint8Array(CHUNK).fill(0x61);
      pulled += chunk.byteLength;
      c.enqueue(chunk);
    },
  });
  return { body, pulled: () => pulled };
}

function request(path: string, body: ReadableStream<Uint8Array> | string, headers: Record<string, string> = {}) {
  return new NextRequest(`http://localhost:3999${path}`, { method: "POST", body, headers, duplex: "half" } as ConstructorParameters<typeof NextRequest>[1]);
}

async function caught(p: Promise<unknown>): Promise<AppError> {
  try {
    await p;
  } catch (e) {
    if (e instanceof AppError) return e;
    throw e;
  }
  throw new Error("expected an AppError, got success");
}

const call = (handler: (req: NextRequest, ctx: { params: Promise<never> }) => Promise<Response>, req: NextRequest) =>
  handler(req, { params: Promise.resolve({} as never) });

describe("the bounded body reader", () => {
  it("reads a body up to its limit, and refuses one byte more with a 413 naming the limit", async () => {
    const exact = await readBody(new Request("http://x/", { method: "POST", body: "a".repeat(1000) }), 1000);
    expect(exact.byteLength).toBe(1000);
    const e = await caught(readBody(new Request("http://x/", { method: "POST", body: "a".repeat(1001) }), 1000));
    expect(e.status).toBe(413);
    expect(e.code).toBe("payload_too_large");
    const json = await caught(readJson(request("/x", stream().body)));
    expect(json.message).toBe("That is too large: we take up to 1 MB at a time. Send a smaller one.");
  });

  it("an endless chunked body is cancelled just past the limit", async () => {
    const s = stream();
    const e = await caught(readJson(request("/x", s.body, { "content-type": "application/json" })));
    expect(e.status).toBe(413);
    expect(s.pulled()).toBeLessThanOrEqual(BODY_LIMITS.json + 2 * CHUNK);
  });

  it("a declared Content-Length over the limit is refused before the body is read", async () => {
    const s = stream();
    const req = request("/x", s.body, { "content-length": String(10 * 1024 ** 3) });
    expect((await caught(readBody(req, BODY_LIMITS.json))).status).toBe(413);
    expect(s.pulled()).toBeLessThanOrEqual(CHUNK); // a stream may pre-pull one chunk; nothing more is read
  });

  it("JSON: not JSON is a 400; an empty body is a 400 unless the route allows none", async () => {
    expect((await caught(readJson(request("/x", "{nope")))).status).toBe(400);
    expect((await caught(readJson(request("/x", "")))).status).toBe(400);
    expect(await readJson(request("/x", ""), { optional: true })).toBeUndefined();
    expect(await readJson(request("/x", '{"a":1}'))).toEqual({ a: 1 });
  });

  it("forms: the wrong content type is a 415 saying what to send; the parser sees only a bounded body", async () => {
    const e = await caught(readForm(request("/x", "a=1", { "content-type": "text/plain" }), BODY_LIMITS.form, ["urlencoded", "multipart"]));
    expect(e.status).toBe(415);
    expect(e.code).toBe("unsupported_media_type");
    expect(e.message).toMatch(/application\/x-www-form-urlencoded/);
    const s = stream(Infinity, "--b\r\nContent-Disposition: form-data; name=\"file\"; filename=\"a.jpg\"\r\n\r\n");
    expect((await caught(readForm(request("/x", s.body, { "content-type": "multipart/form-data; boundary=b" }), 1024 * 1024))).status).toBe(413);
    expect(s.pulled()).toBeLessThanOrEqual(1024 * 1024 + 2 * CHUNK);
    const ok = await readForm(request("/x", "a=1&b=two", { "content-type": "application/x-www-form-urlencoded" }), BODY_LIMITS.form, ["urlencoded"]);
    expect(ok.get("b")).toBe("two");
  });
});

describe("routes that read a body without a session", () => {
  it("the payment webhook: 64 MB of chunked text is a 413 after at most 1 MB, before any signature check", async () => {
    const s = stream(64 * 1024 * 1024, '{"id":"evt_1","data":"');
    const res = await call(stripeWebhook, request("/api/webhooks/stripe", s.body, { "content-type": "application/json", "stripe-signature": "t=1,v1=00" }));
    expect(res.status).toBe(413);
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe("payload_too_large");
    expect(s.pulled()).toBeLessThanOrEqual(BODY_LIMITS.webhook + 2 * CHUNK);
  });

  it("the payment webhook: a declared 10 GB is a 413 before reading", async () => {
    const s = stream(8 * 1024 * 1024);
    const res = await call(stripeWebhook, request("/api/webhooks/stripe", s.body, { "content-length": String(10 * 1024 ** 3), "stripe-signature": "t=1,v1=00" }));
    expect(res.status).toBe(413);
    expect(s.pulled()).toBeLessThanOrEqual(CHUNK);
  });

  it("one-click unsubscribe: a 64 MB form is a 413 after at most its 64 KB limit; a wrong content type is one 415", async () => {
    const s = stream(64 * 1024 * 1024, "List-Unsubscribe=One-Click&x=");
    const res = await call(unsubscribe, request("/api/unsubscribe?t=not-a-real-token-0123", s.body, { "content-type": "application/x-www-form-urlencoded" }));
    expect(res.status).toBe(413);
    expect(s.pulled()).toBeLessThanOrEqual(BODY_LIMITS.form + 2 * CHUNK);
    const wrong = await call(unsubscribe, request("/api/unsubscribe?t=not-a-real-token-0123", "{}", { "content-type": "application/json" }));
    expect(wrong.status).toBe(415);
    expect(((await wrong.json()) as { error: { code: string } }).error.code).toBe("unsupported_media_type");
  });
});
