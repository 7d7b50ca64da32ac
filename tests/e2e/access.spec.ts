// The role matrix: every studio page and API route present so far × every role.
import { expect, test, type Browser, type BrowserContext } from "@playwright/test";
import { ACCOUNTS, fixture, signIn, type Role } from "./helpers";

type Who = Exclude<Role, "otherOwner"> | "anonymous";
const WHO: Who[] = ["anonymous", "owner", "technician", "staff", "admin", "otherStudioStaff"];

// What a page does for each role: "ok" renders it, "sign-in" sends to the sign-in page,
// "denied" sends to the person's own home with a notice, "404" shows the not-found page.
type PageOutcome = "ok" | "sign-in" | "denied" | "404";
const staffOnly = { anonymous: "sign-in", owner: "denied", technician: "denied", staff: "ok", admin: "ok", otherStudioStaff: "ok" } as const;

function pages(): { path: string; expect: Record<Who, PageOutcome> }[] {
  const { demoPieceId } = fixture();
  return [
    { path: "/studio", expect: staffOnly },
    { path: "/studio/pieces", expect: staffOnly },
    { path: "/studio/clients", expect: staffOnly },
    { path: "/studio/inbox", expect: staffOnly },
    { path: `/studio/pieces/${demoPieceId}`, expect: { ...staffOnly, otherStudioStaff: "404" } },
    { path: "/studio/today", expect: { ...staffOnly, technician: "ok" } },
    { path: "/studio/team", expect: { ...staffOnly, staff: "denied", otherStudioStaff: "denied" } },
    { path: "/studio/outbox", expect: { ...staffOnly, staff: "denied", otherStudioStaff: "denied" } },
    { path: "/pieces", expect: { anonymous: "sign-in", owner: "ok", technician: "ok", staff: "ok", admin: "ok", otherStudioStaff: "ok" } },
  ];
}

function apis(): { path: string; expect: Record<Who, number> }[] {
  const { demoPieceId, otherPieceId } = fixture();
  return [
    { path: "/api/me", expect: { anonymous: 401, owner: 200, technician: 200, staff: 200, admin: 200, otherStudioStaff: 200 } },
    { path: `/api/pieces/${demoPieceId}`, expect: { anonymous: 401, owner: 403, technician: 403, staff: 200, admin: 200, otherStudioStaff: 404 } },
    { path: `/api/pieces/${otherPieceId}`, expect: { anonymous: 401, owner: 403, technician: 403, staff: 404, admin: 404, otherStudioStaff: 200 } },
    { path: "/api/pieces/does-not-exist", expect: { anonymous: 401, owner: 403, technician: 403, staff: 404, admin: 404, otherStudioStaff: 404 } },
  ];
}

async function contextFor(browser: Browser, who: Who): Promise<BrowserContext> {
  const context = await browser.newContext();
  if (who !== "anonymous") await signIn(await context.newPage(), ACCOUNTS[who]);
  return context;
}

for (const who of WHO) {
  test(`role matrix: ${who}`, async ({ browser }) => {
    const context = await contextFor(browser, who);
    const page = await context.newPage();
    for (const entry of pages()) {
      const outcome = entry.expect[who];
      await page.goto(entry.path);
      // Redirects from inside a streamed page finish on the client: wait (polling) for where each
      // outcome ends, rather than a fixed pause after the load.
      await page.waitForLoadState("load");
      if (outcome === "denied") await expect(page).toHaveURL(/denied=1/);
      if (outcome === "sign-in") await expect(page).toHaveURL(/\/sign-in\?/);
      if (outcome === "404") await expect(page.getByText("We couldn't find that page")).toBeVisible();
      if (outcome === "ok") await expect(page.getByRole("heading", { level: 1 })).toBeVisible();
      const url = new URL(page.url());
      const where = `${who} → ${entry.path} (ended at ${url.pathname}${url.search})`;
      if (outcome === "ok") {
        expect(url.pathname, where).toBe(entry.path);
        await expect(page.getByRole("heading", { level: 1 }), where).toBeVisible();
        await expect(page.getByText("We couldn't find that page"), where).toHaveCount(0);
      } else if (outcome === "sign-in") {
        expect(url.pathname, where).toBe("/sign-in");
        expect(url.searchParams.get("next"), where).toBe(entry.path);
      } else if (outcome === "denied") {
        expect(url.searchParams.get("denied"), where).toBe("1");
        expect(url.pathname, where).not.toBe(entry.path);
      } else {
        await expect(page.getByText("We couldn't find that page"), where).toBeVisible();
      }
    }
    for (const entry of apis()) {
      const res = await context.request.get(entry.path, { maxRedirects: 0 });
      expect(res.status(), `${who} → GET ${entry.path}`).toBe(entry.expect[who]);
      if (res.status() >= 400) expect((await res.json()).error.message, entry.path).toEqual(expect.any(String));
    }
    await context.close();
  });
}

test("API answers: bad ids are 4xx JSON, cross-site writes refused", async ({ browser }) => {
  const context = await contextFor(browser, "staff");
  const long = await context.request.get(`/api/pieces/${"x".repeat(500)}`);
  expect(long.status()).toBe(400);
  expect((await long.json()).error.code).toBe("bad_request");
  const forged = await context.request.fetch("/api/me", { method: "POST", headers: { origin: "https://evil.example" } });
  expect(forged.status()).toBeGreaterThanOrEqual(400);
  expect(forged.status()).toBeLessThan(500);
  await context.close();
});
