// Money, dates and sizes read one way on the staff pages and in the mail, for an imperial studio in
// US dollars (en-US, New York) and a metric studio in euros (Germany, Berlin). Real SQLite file, the
// real SMTP sink; the pages are the real server components rendered to HTML (only the session lookup
// is replaced, by a staff context of the studio). The clock is fixed: 3 December 2026, 15:00 UTC.
//
// Expected forms are ECMA-402 Intl.NumberFormat (currency style) and Intl.DateTimeFormat output with
// Unicode CLDR data: en-US "$85.00"; de-DE "85,00 €" (decimal comma, the symbol after the amount,
// U+00A0 between); en-GB day-month-year "3 December 2026" (the one date form, lib/format/dates).
// 1 in = 25.4 mm exactly (NIST Handbook 44, Appendix C).
import { AppRouterContext } from "next/dist/shared/lib/app-router-context.shared-runtime";
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { Providers } from "@/components/providers";
import type { StudioContext } from "@/lib/auth/guards";
import { createJob } from "@/lib/repairs/jobs";
import { sendQuote } from "@/lib/repairs/payment";
import { createAcceptedClaim, createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { waitForMail } from "../support/mail";

let asStaff: StudioContext | null = null;
vi.mock("@/lib/auth/guards", async (importOriginal) => ({
  ...(await importOriginal<typeof import("@/lib/auth/guards")>()),
  requireStaff: async () => asStaff,
}));

const NOW = Date.parse("2026-12-03T15:00:00Z");
beforeAll(() => {
  vi.useFakeTimers({ toFake: ["Date"] });
  vi.setSystemTime(NOW);
});
afterAll(() => vi.useRealTimers());

const NBSP = "\u00a0";

const STUDIOS = {
  us: { country: "US", currency: "USD", unitSystem: "imperial" as const, timeZone: "America/New_York", labour: "$85.00", size: "96 × 37 5/8 in (2,438 × 956 mm)", thickness: "2 in (8/4) thick" },
  de: { country: "DE", currency: "EUR", unitSystem: "metric" as const, timeZone: "Europe/Berlin", labour: `85,00${NBSP}€`, size: "2,438 × 956 mm (96 × 37 5/8 in)", thickness: "51 mm thick" },
};

async function world(kind: keyof typeof STUDIOS) {
  const s = STUDIOS[kind];
  const studio = createStudio({ country: s.country, currency: s.currency, unitSystem: s.unitSystem, timeZone: s.timeZone, email: `${unique("studio")}@test.example`, labourRateMinor: 8500, taxRateBp: 0 });
  const staff = await memberContext(studio, "admin");
  const owner = await createUser();
  // 2438 × 956 mm = 96 × 37 5/8 in; 51 mm = 2.008 in, within 1/32 in of 2 in = 8/4.
  const { piece } = createPiece(studio, { ownerId: owner.id, lengthMm: 2438, widthMm: 956, thicknessMm: 51 });
  const claim = createAcceptedClaim(studio, piece.id, owner.id, "chargeable");
  return { s, studio, staff, owner, piece, claim };
}

async function renderPage(staff: StudioContext, page: () => Promise<React.ReactElement>): Promise<string> {
  asStaff = staff;
  // Client components on the page (charts, the message form) ask for the App Router; none navigates here.
  const router = { back() {}, forward() {}, refresh() {}, push() {}, replace() {}, prefetch() {}, bfcacheId: "test" };
  // The root layout's providers (TanStack Query, the toaster) wrap every page in the app; they do here too.
  return renderToStaticMarkup(createElement(AppRouterContext.Provider, { value: router }, createElement(Providers, null, await page()))).replace(/<[^>]+>/g, " ").replace(/&amp;/g, "&").replace(/&#x27;|&#39;/g, "'").replace(/\s+/g, " ");
}

describe.each(["us", "de"] as const)("a %s studio", (kind) => {
  it("the overview writes today and the window's start as dates, not ISO", async () => {
    const { staff } = await world(kind);
    const { default: StudioOverviewPage } = await import("@/app/studio/page");
    const text = await renderPage(staff, () => StudioOverviewPage());
    // 15:00 UTC is 10:00 in New York and 16:00 in Berlin: Thursday 3 December 2026 in both.
    expect(text).toContain("Today is Thursday, 3 December 2026");
    expect(text).toContain("since 1 January 2026");
    expect(text.match(/.{60}\b20\d\d-\d\d-\d\d\b.{20}/g) ?? []).toEqual([]);
  });

  it("the staff claim page writes the piece's size in the studio's units first, the other in brackets", async () => {
    const { s, staff, claim } = await world(kind);
    const { default: StudioClaimPage } = await import("@/app/studio/claims/[id]/page");
    const text = await renderPage(staff, () => StudioClaimPage({ params: Promise.resolve({ id: claim.id }) }));
    expect(text).toContain(`${s.size}, ${s.thickness}`);
    // decidedAt is the fixed now: 3 December 2026 in both zones.
    expect(text).toContain("Decided 3 December 2026");
  });

  it("the quote mail writes money by Intl for the studio's country", async () => {
    const { s, staff, claim, owner } = await world(kind);
    const job = createJob(staff, "claim", claim.id);
    await sendQuote(staff, job.id);
    const mail = await waitForMail({ to: owner.email, subject: /quote/i });
    expect(mail.text).toContain(s.labour);
    expect(mail.text).not.toMatch(/\d[.,]\d\d ?(USD|EUR)\b/);
  });
});
