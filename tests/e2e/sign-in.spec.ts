import { expect, test } from "@playwright/test";
import { ACCOUNTS, PASSWORD, signIn } from "./helpers";

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
  await page.getByRole("button", { name: "Sign out" }).click();
  await expect(page).toHaveURL(/\/$/);
  await page.goto("/pieces");
  await expect(page).toHaveURL(/\/sign-in\?next=%2Fpieces/);
});

test("the form checks on the client once its schema has loaded: a malformed e-mail is flagged on leaving the field, before any submit", async ({ page }) => {
  const posts: string[] = [];
  page.on("request", (r) => {
    if (r.method() === "POST") posts.push(r.url());
  });
  await page.goto("/sign-in");
  await page.getByLabel("Email").fill("not-an-address");
  await page.getByLabel("Password").focus();
  await expect(page.getByText("Enter an e-mail address like name@example.com.")).toBeVisible();
  expect(posts).toEqual([]); // the schema came with the page's lazily loaded chunk; nothing was sent
  await page.getByLabel("Email").fill(ACCOUNTS.owner);
  await page.getByLabel("Password").focus();
  await expect(page.getByText("Enter an e-mail address like name@example.com.")).toBeHidden();
});
