import { expect, test, type Page } from "@playwright/test";
import { ACCOUNTS, APP_URL, PASSWORD, signIn, signOutSaysSo } from "./helpers";

const HOMES = [
  { email: ACCOUNTS.admin, path: "/studio", heading: "Larchmere Slab & Resin" },
  { email: ACCOUNTS.staff, path: "/studio", heading: "Larchmere Slab & Resin" },
  { email: ACCOUNTS.technician, path: "/studio/today", heading: "My day" },
  { email: ACCOUNTS.owner, path: "/pieces", heading: "My pieces" },
  { email: ACCOUNTS.otherOwner, path: "/pieces", heading: "My pieces" },
];

for (const { email, path, heading } of HOMES) {
  test(`${email} signs in through the form and lands on ${path}`, async ({ page }) => {
    await signIn(page, email);
    await expect(page).toHaveURL(new RegExp(`${path}$`));
    await expect(page.getByRole("heading", { level: 1, name: heading })).toBeVisible();
  });
}

test("an owner opening /studio is turned away to their own pieces", async ({ page }) => {
  await signIn(page, ACCOUNTS.owner);
  await page.goto("/studio");
  await expect(page).toHaveURL(/\/pieces\?denied=1$/);
  await expect(page.getByText("That page isn't open to you")).toBeVisible();
});

test("a wrong password keeps what was typed and says so next to the form", async ({ page }) => {
  await page.goto("/sign-in");
  await page.getByLabel("Email").fill(ACCOUNTS.owner);
  await page.getByLabel("Password").fill(`${PASSWORD}-wrong`);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page.getByText("That e-mail and password don't match an account.")).toBeVisible();
  await expect(page.getByLabel("Email")).toHaveValue(ACCOUNTS.owner);
});

test("signing out ends the session", async ({ page }) => {
  await signIn(page, ACCOUNTS.otherOwner);
  // Said where one signs in again (the landing page it went to said nothing).
  await signOutSaysSo(page);
});

test("the form checks on the client once its schema has loaded: a malformed e-mail is flagged on the press, nothing is sent, and the line goes as it is fixed", async ({ page }) => {
  const posts: string[] = [];
  page.on("request", (r) => {
    if (r.method() === "POST") posts.push(r.url());
  });
  await page.goto("/sign-in");
  await page.getByLabel("Email").fill("not-an-address");
  // Leaving the field says nothing yet (components/forms/use-action-form.ts: checked on the press).
  await page.getByLabel("Password").fill("grainward-demo");
  const malformed = page.getByText("Enter an e-mail address like name@example.com.");
  await expect(malformed).toBeHidden();
  await page.getByRole("button", { name: /sign in/i }).click();
  await expect(malformed).toBeVisible();
  await expect(page.getByLabel("Email")).toBeFocused();
  expect(posts).toEqual([]); // the schema came with the page's lazily loaded chunk; nothing was sent
  await page.getByLabel("Email").fill(ACCOUNTS.owner);
  await expect(malformed).toBeHidden();
  expect(posts).toEqual([]);
});

// ---- where sign-in sends you next ----
// Chromium drops tabs and newlines from a URL and reads "\" as "/": "/\t/evil.example" is
// "//evil.example" to it, another host. evil.example is answered here by a stub so a wrong turn shows.

async function signInWithNext(page: Page, next: string) {
  await page.route(/^https?:\/\/evil\.example\//, (route) => route.fulfill({ status: 200, contentType: "text/html", body: "<h1>another site</h1>" }));
  const landing = await page.goto(`/sign-in?next=${encodeURIComponent(next)}`);
  expect(landing?.status()).toBe(200);
  await page.getByLabel("Email").fill(ACCOUNTS.otherOwner);
  await page.getByLabel("Password").fill(PASSWORD);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).not.toHaveURL(/\/sign-in/);
  await page.waitForLoadState();
  return new URL(page.url());
}

for (const [what, next] of [
  ["a tab", "/\t/evil.example"],
  ["a newline", "/\n/evil.example"],
  ["a backslash", "/\\evil.example"],
  ["dot segments", "/..//evil.example"],
] as const) {
  test(`a return path with ${what} that a browser would read as another site leads home instead`, async ({ page }) => {
    const errors: number[] = [];
    page.on("response", (r) => {
      if (r.status() >= 500) errors.push(r.status());
    });
    const url = await signInWithNext(page, next);
    expect(url.origin).toBe(APP_URL);
    expect(url.pathname).toBe("/pieces");
    await expect(page.getByRole("heading", { level: 1, name: "My pieces" })).toBeVisible();
    expect(errors).toEqual([]);
  });
}

test("a same-site return path is kept", async ({ page }) => {
  const url = await signInWithNext(page, "/account");
  expect(`${url.origin}${url.pathname}`).toBe(`${APP_URL}/account`);
});

// ---- per-address limits believe only the proxies they are told to ----
// The e2e server runs with TRUST_PROXY=1, Playwright standing in for that one proxy: the rightmost
// X-Forwarded-For entry is the address it was reached from; whatever a client wrote to its left is not.
test("a made-up X-Forwarded-For entry does not get round the per-address limit on reset links", async ({ page, context }) => {
  const address = `203.0.113.${(Date.now() % 200) + 20}`;
  let limited = false;
  for (let i = 0; i < 12 && !limited; i++) {
    await context.setExtraHTTPHeaders({ "x-forwarded-for": `198.51.100.${i + 1}, ${address}` });
    await page.goto("/forgot-password");
    await page.getByLabel("Email").fill(`nobody-${Date.now()}-${i}@owners.example`);
    await page.getByRole("button", { name: "Send me a reset link" }).click();
    const outcome = page.getByText("Check your inbox").or(page.getByText(/^Too many attempts/));
    await expect(outcome).toBeVisible();
    limited = await page.getByText(/^Too many attempts/).isVisible();
    // The limit is 10 a window per address: the first 10 go through.
    if (i < 10) expect(limited, `request ${i + 1}`).toBe(false);
  }
  expect(limited).toBe(true);
});
