import fs from "node:fs";
import { expect, type Locator, type Page } from "@playwright/test";
import { E2E_APP_URL, E2E_DATABASE, E2E_PORTS, E2E_SINK_URL } from "../../scripts/e2e-config.mjs";

/** Where the e2e server and its fakes listen (scripts/e2e-config.mjs; E2E_PORT_BASE moves them). */
export const APP_URL = E2E_APP_URL;
export const SINK_URL = E2E_SINK_URL;
export const PORTS = E2E_PORTS;

// The fake's own key (lib/fakes/stripe-fake-cli.ts; the e2e server leaves STRIPE_SECRET_KEY at its default).
const STRIPE_FAKE_KEY = process.env.STRIPE_SECRET_KEY ?? "sk_test_grainward_demo";

/** One of the Stripe fake's test knobs (POST /_test/…, lib/fakes/stripe-fake.ts), with a form body. */
export function fakeKnob(path: string, form: Record<string, string>) {
  return fetch(`http://127.0.0.1:${PORTS.stripe}/_test/${path}`, {
    method: "POST",
    headers: { authorization: `Bearer ${STRIPE_FAKE_KEY}`, "content-type": "application/x-www-form-urlencoded" },
    body: new URLSearchParams(form).toString(),
  });
}
/** The e2e server's SQLite file (the empty-install run has one of its own). */
export const DATABASE_FILE = E2E_DATABASE;
export const PASSWORD = "grainward-demo";

export const ACCOUNTS = {
  admin: "maren@larchmere.example",
  staff: "teo@larchmere.example",
  technician: "ines@larchmere.example",
  owner: "holloway@owners.example",
  otherOwner: "jonah@owners.example",
  otherStudioStaff: "staff@other-studio.example",
} as const;
export type Role = keyof typeof ACCOUNTS;

/** Ids written by tests/support/seed-e2e.ts. `unregistered` are demo pieces no owner holds yet, with their codes. */
export function fixture(): { demoPieceId: string; otherPieceId: string; unregistered: { pieceId: string; title: string; code: string }[]; jobs: Record<string, string> } {
  return JSON.parse(fs.readFileSync("tests/.tmp/e2e-fixture.json", "utf8"));
}

/**
 * The page's address ends with `path`, taken literally, as written or with its %-escapes decoded: a
 * card code's check symbol may be one of Crockford's `*~$=U` (lib/care/registration-code.ts), and the
 * address may carry "=" and "$" as %3D and %24.
 */
export function urlEndingWith(path: string): (url: URL) => boolean {
  return (url) => {
    let decoded = url.href;
    try {
      decoded = decodeURIComponent(url.href);
    } catch {
      // not decodable: compared as written only
    }
    return url.href.endsWith(path) || decoded.endsWith(path);
  };
}

export async function signIn(page: Page, email: string, password = PASSWORD) {
  await submitSignIn(page, "/sign-in", email, password);
}

/**
 * Signs in with `next`, so the first page after signing in is `path` (as `signIn` and then
 * `page.goto(path)`, without rendering the account's home page on the way), and waits for its load.
 */
export async function signInTo(page: Page, email: string, path: string) {
  await submitSignIn(page, `/sign-in?next=${encodeURIComponent(path)}`, email, PASSWORD);
  await page.waitForLoadState();
}

async function submitSignIn(page: Page, signInPath: string, email: string, password: string) {
  await page.goto(signInPath);
  await page.getByLabel("Email").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await expect(page).not.toHaveURL(/\/sign-in/);
}

/**
 * Signs out with the header's button (someone signed in, on any page): it says so where one signs in
 * again, and an owner's page then asks for signing in.
 */
export async function signOutSaysSo(page: Page) {
  await page.getByRole("button", { name: "Sign out" }).click();
  await expect(page).toHaveURL(/\/sign-in\?signed-out=1$/);
  await expect(page.getByText("You are signed out on this device.")).toBeVisible();
  await page.goto("/pieces");
  await expect(page).toHaveURL(/\/sign-in\?next=%2Fpieces/);
}

/**
 * The selects under `scope` whose words do not fit: the chosen option's text ("selected") or the longest
 * option's ("widest"), measured in the select's own font, plus its side paddings and about 24 px for the
 * arrow, against its inner width. Each as "label: -N px" (N px short), so a failure says which and by how much.
 */
export async function selectsCutShort(scope: Locator, which: "selected" | "widest"): Promise<string[]> {
  return scope.locator("select").evaluateAll((selects: HTMLSelectElement[], which) => {
    const pen = document.createElement("canvas").getContext("2d")!;
    return selects.flatMap((el) => {
      const cs = getComputedStyle(el);
      pen.font = `${cs.fontWeight} ${cs.fontSize} ${cs.fontFamily}`;
      const texts = which === "selected" ? [el.selectedOptions[0]?.text ?? ""] : [...el.options].map((o) => o.text);
      const room = el.clientWidth - (Math.max(...texts.map((t) => pen.measureText(t).width)) + parseFloat(cs.paddingLeft) + parseFloat(cs.paddingRight) + 24);
      // A label may wrap the select: its words less the options'.
      const label = (el.labels?.[0]?.textContent ?? "").replace(el.textContent ?? "", "").trim() || el.name || "select";
      return room < 0 ? [`${label}: ${Math.round(room)} px`] : [];
    });
  }, which);
}
