// Every JSON route × fast-check generated bodies and query strings (wrong types, huge strings,
// unicode, deep nesting, missing fields): never a 5xx; a 4xx always carries a JSON error.
import { expect, test, type APIRequestContext } from "@playwright/test";
import fc from "fast-check";
import { ACCOUNTS, signIn } from "./helpers";
import { apiRoutes, fill } from "./routes";

const RUNS = 8;

const nasty = fc.oneof(
  fc.string({ maxLength: 40 }),
  fc.string({ unit: "grapheme", maxLength: 40 }),
  fc.constant("x".repeat(200_000)),
  fc.constant("\u0000\u202e💥' OR 1=1 --\"*NEAR"),
  fc.integer(),
  fc.double(),
  fc.boolean(),
  fc.constant(null),
  fc.letrec((tie) => ({ deep: fc.oneof({ depthSize: "small" }, fc.constant(1), fc.array(tie("deep"), { maxLength: 2 }), fc.dictionary(fc.string({ maxLength: 5 }), tie("deep"), { maxKeys: 2 })) })).deep,
  fc.constant(JSON.parse("[".repeat(500) + "]".repeat(500))),
);
const body = fc.oneof(fc.dictionary(fc.string({ maxLength: 12 }), nasty, { maxKeys: 6 }), nasty, fc.anything());
const query = fc.dictionary(fc.constantFrom("q", "state", "page", "sort", "from", "to", "technician", "kind", "limit", "thumb", "t", "pageSize"), fc.string({ maxLength: 30 }), { maxKeys: 4 });
// Path segments: ids of every shape but a "/", which would address another route entirely.
const param = fc.oneof(fc.uuid(), fc.string({ minLength: 1, maxLength: 30 }).filter((s) => !s.includes("/") && s.trim() !== "" && s !== "." && s !== ".."), fc.constant("ü💥"));

async function probe(request: APIRequestContext, method: string, url: string, data: unknown) {
  const res = await request.fetch(url, {
    method,
    headers: { "content-type": "application/json" },
    data: method === "GET" || method === "DELETE" ? undefined : JSON.stringify(data),
    maxRedirects: 0,
    failOnStatusCode: false,
  });
  const status = res.status();
  const where = `${method} ${url.slice(0, 200)} → ${status}`;
  expect(status, where).toBeLessThan(500);
  if (status >= 400 && status !== 405) {
    expect(res.headers()["content-type"] ?? "", where).toContain("application/json");
    const json = await res.json();
    expect(typeof json?.error?.message, where).toBe("string");
  }
}

for (const who of ["anonymous", "admin", "owner"] as const) {
  test(`fuzz every JSON route as ${who}`, async ({ browser }) => {
    test.setTimeout(240_000);
    const context = await browser.newContext();
    if (who !== "anonymous") await signIn(await context.newPage(), who === "admin" ? ACCOUNTS.admin : ACCOUNTS.owner);
    const request = context.request;
    for (const route of apiRoutes()) {
      for (const method of route.methods) {
        await fc.assert(
          fc.asyncProperty(param, query, body, async (p, q, b) => {
            const url = `${fill(route.pattern, () => p)}?${new URLSearchParams(q)}`;
            await probe(request, method, url, b);
          }),
          { numRuns: RUNS, endOnFailure: true },
        );
      }
    }
    await context.close();
  });
}
