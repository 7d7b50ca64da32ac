// The staff claim page's coverage panel in words (components/claims/coverage-panel.tsx): claims filed
// through lib/claims against a real SQLite file, read back as the page reads them (getStaffClaim) and
// rendered to markup. "How this was worked out" speaks plain lines: dates through lib/format, no ISO
// dates, no enum values, none of the source labels or equation numbers the engine keeps in code.
// All data is invented.
import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { CoveragePanel } from "@/components/claims/coverage-panel";
import { getDb } from "@/db/client";
import { ownerships, pieces, warrantyPolicies } from "@/db/schema";
import type { WarrantyPolicy } from "@/lib/care/coverage";
import { addMonths, diffDays } from "@/lib/care/dates";
import { getStaffClaim } from "@/lib/claims/view-claim";
import { ownerActor } from "@/lib/auth/actor";
import { formatDate, formatTimeLeft } from "@/lib/format";
import { createUser } from "../support/fixtures";
import { claimWorld, fileClaim, NO_ANSWERS, todayUtc } from "./claims-helpers";

const ISO_DATE = /\d{4}-\d{2}-\d{2}/;
const SOURCE_LABEL = /from memory|common practice|no published source|not re-read|Wood Handbook|FPL-GTR|\bEq\. ?\d|Table \d|Western Australian Museum/i;
const ENUM_VALUE = /\b[a-z]+_[a-z_]+\b/;

/** The panel's text as staff read it, and its "How this was worked out" lines. */
function panel(actor: Parameters<typeof getStaffClaim>[0], claimId: string) {
  const { coverage } = getStaffClaim(actor, claimId);
  const html = renderToStaticMarkup(createElement(CoveragePanel, { coverage }));
  const text = html.replace(/<[^>]+>/g, " ").replace(/&amp;/g, "&").replace(/&#x27;|&#39;/g, "'").replace(/&quot;/g, '"').replace(/\s+/g, " ");
  const list = html.match(/<ol data-testid="coverage-worked-out"[^>]*>([\s\S]*?)<\/ol>/)?.[1] ?? "";
  const lines = [...list.matchAll(/<li>([\s\S]*?)<\/li>/g)].map((m) => m[1]!.replace(/&#x27;|&#39;/g, "'").replace(/&amp;/g, "&").replace(/&quot;/g, '"'));
  return { text, lines };
}

function expectPlain(text: string) {
  expect(text).not.toMatch(ISO_DATE);
  expect(text).not.toMatch(SOURCE_LABEL);
  expect(text).not.toMatch(ENUM_VALUE);
}

describe("staff claim page: how the coverage suggestion was worked out", () => {
  it("a crack inside its term, room inside the care guide: the term with its dates in words, the room, the slab's movement, the suggestion", async () => {
    const delivered = addMonths(todayUtc(), -6);
    const w = await claimWorld({ piece: { deliveredOn: delivered } });
    const claim = await fileClaim(w.ownerV, w.piece.id);
    const { text, lines } = panel(w.staffCtx, claim.id);
    expectPlain(text);

    const ends = addMonths(delivered, 24);
    const left = formatTimeLeft(diffDays(todayUtc(), ends));
    expect(lines).toContain(
      `The “Cracks, gaps and resin separation” line runs 24 months from delivery on ${formatDate(delivered)}, to ${formatDate(ends)}; the claim was filed on ${formatDate(todayUtc())}, with ${left} left.`,
    );
    expect(lines).toContain("The owner's room goes from 45 % relative humidity at 20 °C at its driest to 55 % at 22 °C at its dampest.");
    expect(lines).toContain("The care guide for wood asks for 40–60 % relative humidity, changing no more than about 5 % or 4 °C in a day; this room is inside it.");
    expect(lines).toContain("The owner did not say how much the humidity or temperature changes within a day.");
    expect(lines.some((l) => /^Between those two rooms this 900 mm wide black walnut top should swell or shrink by about \d+\.\d mm \(\d+\.\d\d in\); across the care guide's range it would move \d+\.\d mm \(\d+\.\d\d in\)\.$/.test(l))).toBe(true);
    expect(lines.at(-1)).toBe("The check suggests: covered; staff decide.");
  });

  it("an exclusion, a missed care-log entry and a later owner are each said in words", async () => {
    const w = await claimWorld({ piece: { deliveredOn: addMonths(todayUtc(), -20) } });
    const policy: WarrantyPolicy = {
      version: "words-test (invented)",
      lines: { finish_wear: { label: "Finish (invented terms)", termMonths: 36, exclusions: ["heat"], careLog: { graceDays: 30, onMissed: "not_covered" }, partlyCoveredPct: 40, transfersToNewOwner: false } },
    };
    const row = getDb().insert(warrantyPolicies).values({ studioId: w.studio.id, version: 3, effectiveFrom: "2000-01-01", policy }).returning().get();
    getDb().update(pieces).set({ warrantyPolicyId: row.id }).where(eq(pieces.id, w.piece.id)).run();

    const hot = await fileClaim(w.ownerV, w.piece.id, { category: "finish_wear", answers: { ...NO_ANSWERS, heat: "yes" } });
    const h = panel(w.staffCtx, hot.id);
    expectPlain(h.text);
    expect(h.lines).toContain("The owner said heat was near the damage, and heat damage is excluded.");
    // The oil layer from delivery was due for re-oiling long before the claim, and nothing was logged.
    expect(h.lines.some((l) => /^Re-oil fell due on \d{1,2} [A-Z][a-z]+ \d{4} \(counted from the care on \d{1,2} [A-Z][a-z]+ \d{4}\), and none was logged within 30 days of it\.$/.test(l))).toBe(true);
    expect(h.lines.at(-1)).toBe("The check suggests: not covered; staff decide.");
    // The terms are named by the deliveries they apply from, as the warranty settings list them, not by their stored label.
    expect(h.text).toContain("Warranty terms Warranty terms for deliveries from 1 January 2000");
    expect(h.text).not.toContain("words-test");

    const buyer = await createUser({ name: "Second owner (invented)" });
    getDb().update(pieces).set({ ownerId: buyer.id }).where(eq(pieces.id, w.piece.id)).run();
    getDb().insert(ownerships).values({ studioId: w.studio.id, pieceId: w.piece.id, userId: buyer.id, via: "transfer", startedAt: new Date() }).run();
    const later = await fileClaim(ownerActor(buyer), w.piece.id, { category: "finish_wear" });
    const l = panel(w.staffCtx, later.id);
    expectPlain(l.text);
    expect(l.lines).toContain("This line stays with the first owner, and the claim comes from a later owner.");
  });

  it("a room outside the care guide, in the studio's imperial units, and a category with no line", async () => {
    const w = await claimWorld({ piece: { deliveredOn: addMonths(todayUtc(), -4) }, studio: { unitSystem: "imperial" } });
    const dry = await fileClaim(w.ownerV, w.piece.id, { answers: { ...NO_ANSWERS, room: { unit: "F", driestTemp: 68, driestRh: 25, dampestTemp: 75, dampestRh: 55 } } });
    const d = panel(w.staffCtx, dry.id);
    expectPlain(d.text);
    expect(d.lines).toContain("The owner's room goes from 25 % relative humidity at 68 °F at its driest to 55 % at 75 °F at its dampest.");
    expect(d.lines).toContain("The room was outside the care guide, so movement beyond what the piece was built for may have played a part.");
    expect(d.lines.some((l) => /^Between those two rooms this 35 7\/16 in wide black walnut top should swell or shrink by about \d+\.\d\d in \(\d+\.\d mm\)/.test(l))).toBe(true);
    expect(d.lines.at(-1)).toBe("The check suggests: partly covered (50 %); staff decide.");

    const scratch = await fileClaim(w.ownerV, w.piece.id, { category: "scratch_dent" });
    const s = panel(w.staffCtx, scratch.id);
    expectPlain(s.text);
    expect(s.lines).toEqual(["The warranty terms have no line for this kind of damage, so it is not covered."]);
  });
});
