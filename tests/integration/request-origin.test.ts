// Any address of an install works (lib/http/origin.ts, lib/env.ts ALLOWED_ORIGINS, next.config.mjs):
// a write from a page at APP_URL, at one of ALLOWED_ORIGINS or at the address the request was sent
// to is accepted; one from any other page is a 403 that names the address to use. Real route
// handlers built with lib/http/route.ts, called with real requests.
import { NextRequest } from "next/server";
import { beforeAll, describe, expect, it, vi } from "vitest";
import { z } from "zod";

const SECOND = "http://192.168.1.20:3000";
const THIRD = "https://care.studio.example";

// lib/env.ts parses the environment once, at first import: set the list before anything loads it.
let route: typeof import("@/lib/http/route").route;
beforeAll(async () => {
  process.env.ALLOWED_ORIGINS = ` ${SECOND} , ${THIRD}/ `;
  vi.resetModules();
  ({ route } = await import("@/lib/http/route"));
});

const post = (url: string, origin?: string, body = "{}") =>
  new NextRequest(url, { method: "POST", body, headers: { "content-type": "application/json", ...(origin ? { origin } : {}) } });
const call = (h: (req: NextRequest, ctx: { params: Promise<unknown> }) => Promise<Response>, req: NextRequest, params: unknown = {}) =>
  h(req, { params: Promise.resolve(params) });

describe("origins", () => {
  it("accepts writes from APP_URL, from every ALLOWED_ORIGINS entry, from the address itself, and from clients that send no Origin", async () => {
    const h = route({}, () => ({ ok: true }));
    for (const origin of ["http://localhost:3999", SECOND, THIRD, undefined]) {
      const res = await call(h, post("http://localhost:3999/api/x", origin));
      expect(res.status, String(origin)).toBe(200);
    }
    // Reached under a name of its own (a LAN name the install was not told about), from its own pages.
    expect((await call(h, post("http://workshop.lan:3000/api/x", "http://workshop.lan:3000"))).status).toBe(200);
  });

  it("refuses a write from another page with a 403 that names APP_URL, in the one error shape", async () => {
    const h = route({}, () => ({ ok: true }));
    const res = await call(h, post("http://localhost:3999/api/x", "https://elsewhere.example"));
    expect(res.status).toBe(403);
    const body = (await res.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe("forbidden");
    expect(body.error.message).toBe(
      "This was sent from a page at https://elsewhere.example, which isn't an address of this Grainward. Open http://localhost:3999 and try again there.",
    );
    expect(body.error.message).not.toMatch(/another site/);
    // A port of an allowed name is another origin.
    expect((await call(h, post("http://localhost:3999/api/x", "http://192.168.1.20:3001"))).status).toBe(403);
  });

  it("reads never need an origin check", async () => {
    const h = route({}, () => ({ ok: true }));
    const res = await call(h, new NextRequest("http://localhost:3999/api/x", { headers: { origin: "https://elsewhere.example" } }));
    expect(res.status).toBe(200);
  });

  it("server actions accept the same addresses (next.config.mjs gives Next.js their hosts)", async () => {
    const { actionOrigins } = await import("@/lib/http/action-origins.mjs");
    expect(actionOrigins({ APP_URL: "http://localhost:3999", ALLOWED_ORIGINS: ` ${SECOND} , ${THIRD}/ ` })).toEqual(["localhost:3999", "192.168.1.20:3000", "care.studio.example"]);
    expect(actionOrigins({ APP_URL: "https://care.studio.example" })).toEqual(["care.studio.example"]);
  });

  it("an ALLOWED_ORIGINS entry that is not an origin stops the start with a line saying how to write it", async () => {
    const before = process.env.ALLOWED_ORIGINS;
    process.env.ALLOWED_ORIGINS = "https://care.studio.example/studio";
    vi.resetModules();
    await expect(import("@/lib/env")).rejects.toThrow('ALLOWED_ORIGINS: "https://care.studio.example/studio" is not an origin: write it as https://name[:port], without a path');
    process.env.ALLOWED_ORIGINS = before;
    vi.resetModules();
  });
});

describe("route({ params, query, body }, handler)", () => {
  const params = z.object({ id: z.uuid("That link is not right.") });
  const query = z.object({ n: z.coerce.number().int().max(10) });
  const body = z.object({ name: z.string().min(1, "Give it a name.") });

  it("parses each part once and hands the handler typed values; a value is answered as JSON with the route's status", async () => {
    const h = route({ params, query, body, status: 201 }, ({ params, query, body }) => ({ id: params.id, n: query.n + 1, name: body.name }));
    const id = "0b6f8f3e-4a8e-4c1a-9a53-3f9b3c1d2e10";
    const res = await call(h, post(`http://localhost:3999/api/x/${id}?n=2`, undefined, JSON.stringify({ name: "Oak" })), { id });
    expect(res.status).toBe(201);
    expect(await res.json()).toEqual({ id, n: 3, name: "Oak" });
    expect(res.headers.get("cache-control")).toBe("private, no-store");
  });

  it("bad input is a 400 with every field's message", async () => {
    const h = route({ params, query, body }, () => ({ ok: true }));
    const bad = await call(h, post("http://localhost:3999/api/x/1?n=2", undefined, JSON.stringify({ name: "" })), { id: "nope" });
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors).toEqual({ id: ["That link is not right."] });
    const id = "0b6f8f3e-4a8e-4c1a-9a53-3f9b3c1d2e10";
    const noName = await call(h, post(`http://localhost:3999/api/x/${id}?n=2`, undefined, JSON.stringify({ name: "" })), { id });
    expect(((await noName.json()) as { error: { fieldErrors: Record<string, string[]> } }).error.fieldErrors).toEqual({ name: ["Give it a name."] });
  });

  it("the body is read through the bounded reader: over the route's limit is a 413", async () => {
    const h = route({ body, bodyLimit: 100 }, () => ({ ok: true }));
    const res = await call(h, post("http://localhost:3999/api/x", undefined, JSON.stringify({ name: "x".repeat(200) })));
    expect(res.status).toBe(413);
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe("payload_too_large");
  });
});
