// Session cookies, security headers, cross-site writes and brute-force limits against the production build.
import { expect, test } from "@playwright/test";
import { generateRegistrationCode } from "@/lib/care/registration-code";
import { ACCOUNTS, APP_URL, fixture, signIn } from "./helpers";

test("the session cookie is HttpOnly and SameSite=Lax, and a new id is issued at every sign-in", async ({ browser }) => {
  const context = await browser.newContext();
  const page = await context.newPage();
  await signIn(page, ACCOUNTS.otherOwner);
  const first = (await context.cookies()).find((c) => c.name === "gw_session")!;
  expect(first.httpOnly).toBe(true);
  expect(first.sameSite).toBe("Lax");
  // Secure is set whenever APP_URL is https (tests/unit/session-cookie.test.ts); this run is http://localhost.
  await page.getByRole("button", { name: "Sign out" }).click();
  await signIn(page, ACCOUNTS.otherOwner);
  const second = (await context.cookies()).find((c) => c.name === "gw_session")!;
  expect(second.value).not.toBe(first.value);
  // The old token signs nobody in.
  const stale = await browser.newContext();
  await stale.addCookies([{ ...first, expires: -1 }]);
  const res = await stale.request.get("/api/me");
  expect(res.status()).toBe(401);
  await Promise.all([context.close(), stale.close()]);
});

test("security headers on pages and API answers", async ({ request }) => {
  for (const path of ["/", "/sign-in", "/api/health"]) {
    const res = await request.get(path);
    const h = res.headers();
    const csp = h["content-security-policy"] ?? "";
    expect(csp, path).toContain("frame-ancestors 'none'");
    expect(csp, path).not.toContain("unsafe-eval");
    expect(csp, path).toContain("object-src 'none'");
    expect(h["x-content-type-options"], path).toBe("nosniff");
    expect(h["referrer-policy"], path).toBe("strict-origin-when-cross-origin");
    expect(h["x-powered-by"], path).toBeUndefined();
  }
});

test("state-changing requests from another origin are refused", async ({ browser }) => {
  const context = await browser.newContext();
  await signIn(await context.newPage(), ACCOUNTS.owner);
  const forged = await context.request.post("/api/registrations", { headers: { origin: "https://elsewhere.example", "content-type": "application/json" }, data: { code: "0000-0000-0000-0" } });
  expect(forged.status()).toBe(403);
  // The refusal names the address to use (APP_URL), not just "another site".
  expect((await forged.json()).error.message).toBe(
    `This was sent from a page at https://elsewhere.example, which isn't an address of this Grainward. Open ${APP_URL} and try again there.`,
  );
  const same = await context.request.post("/api/registrations", { headers: { origin: APP_URL, "content-type": "application/json" }, data: { code: "0000-0000-0000-0" } });
  expect(same.status()).toBeLessThan(500);
  expect(same.status()).not.toBe(403);
  await context.close();
});

test("registration codes are rate-limited per account, and guessing one would take longer than the universe has existed", async ({ browser }) => {
  const context = await browser.newContext();
  await signIn(await context.newPage(), ACCOUNTS.owner);
  const statuses: number[] = [];
  for (let i = 0; i < 12; i++) {
    // Well-formed random codes with a valid check symbol: they match no piece.
    const res = await context.request.post("/api/registrations", { data: { code: generateRegistrationCode() } });
    statuses.push(res.status());
  }
  expect(statuses).toContain(429);
  const limited = statuses.indexOf(429);
  expect(limited).toBeGreaterThan(0);
  // 12 Crockford symbols = 60 bits; at 10 guesses per account per 15 minutes (lib/auth/rate-limit.ts):
  const codes = 2 ** 60;
  const perYear = (10 / (15 * 60)) * 3600 * 24 * 365;
  const years = codes / 2 / perYear;
  console.log(`Guessing a registration code at ${perYear.toFixed(0)} tries per year per account: ~${years.toExponential(2)} years on average`);
  expect(years).toBeGreaterThan(1e12);
  await context.close();
});

function expectSecurityHeaders(h: Record<string, string>, label: string) {
  expect(h["content-security-policy"] ?? "", label).toContain("frame-ancestors 'none'");
  expect(h["x-content-type-options"], label).toBe("nosniff");
  expect(h["x-frame-options"], label).toBe("DENY");
}

test("unknown and malformed paths answer 404 with the security headers", async ({ browser, request }) => {
  const context = await browser.newContext();
  await signIn(await context.newPage(), ACCOUNTS.staff);
  const malformed = ["/pieces/%E0%A4%A", "/studio/pieces/%E0%A4%A", "/%E0%A4%A", "/api/pieces/%E0%A4%A", "/api/files/%C0%AF", "/studio/claims/%ZZ"];
  const unknown = ["/no-such-page", "/studio/no-such-page", "/api/no-such-route"];
  for (const client of [request, context.request]) {
    for (const path of [...malformed, ...unknown]) {
      const res = await client.get(path, { maxRedirects: 0 });
      // Signed out, an unknown page inside a signed-in area may send to the sign-in page first.
      if (client === request && res.status() === 307 && !malformed.includes(path)) continue;
      expect(res.status(), path).toBe(404);
      expectSecurityHeaders(res.headers(), path);
    }
  }
  await context.close();
});

test("a missing record's page answers 404, for staff and for owners", async ({ browser }) => {
  const missing = "0000000000000000000000";
  for (const [who, paths] of [
    [ACCOUNTS.staff, [`/studio/pieces/${missing}`, `/studio/jobs/${missing}`, `/studio/claims/${missing}`]],
    [ACCOUNTS.owner, [`/pieces/${missing}`, `/jobs/${missing}`, `/claims/${missing}`]],
  ] as const) {
    const context = await browser.newContext();
    const page = await context.newPage();
    await signIn(page, who);
    for (const path of paths) {
      const res = (await page.goto(path))!;
      expect(res.status(), `${who} ${path}`).toBe(404);
      expectSecurityHeaders(res.headers(), path);
      await expect(page.getByRole("heading", { name: "We couldn't find that page" }), path).toBeVisible();
    }
    // Someone else's record is a 404 too (it must not tell that it exists).
    if (who === ACCOUNTS.owner) {
      const res = await context.request.get(`/pieces/${fixture().otherPieceId}`);
      expect(res.status(), "another owner's piece").toBe(404);
    }
    await context.close();
  }
});

test("signed-in JSON is never cached and varies by cookie; no HSTS over plain http", async ({ browser, request }) => {
  const context = await browser.newContext();
  await signIn(await context.newPage(), ACCOUNTS.owner);
  for (const path of ["/api/me", "/api/me/pieces"]) {
    const res = await context.request.get(path);
    expect(res.status(), path).toBe(200);
    expect(res.headers()["cache-control"], path).toBe("private, no-store");
    expect(res.headers()["vary"] ?? "", path).toMatch(/\bCookie\b/i);
  }
  // An error answer to a signed-in request is not cached either.
  const missing = await context.request.get("/api/me/pieces/0000000000000000000000");
  expect(missing.headers()["cache-control"]).toBe("private, no-store");
  // HSTS is sent only when APP_URL is https (tests/unit/security-headers.test.ts); this run is http.
  expect((await request.get("/")).headers()["strict-transport-security"]).toBeUndefined();
  await context.close();
});
