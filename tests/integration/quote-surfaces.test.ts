// A quote prices each line from the size of the surface its work is on, against a real SQLite file: a
// re-oil of an oiled base under a topcoated top is not priced from the top's area, the price list's
// per-area tasks read the size of the surface they name, and where the piece's record has no size for
// that surface nothing is proposed (staff are told, and may type the size for this quote).
// Labour hours: lib/care/quote DEFAULT_LABOUR and lib/repairs/price-list REPAIR_HOURS (invented for the
// demo — common practice, no published source). Product: area × coats ÷ coverage in whole containers
// (lib/care/quantity.ts). Prices per m² and per hour are the invented studio's own. A visit whose quote has
// no hour lines is booked from the same surfaces and sizes, or 1 m² where none is known
// (lib/visits/availability.ts UNSIZED_BOOKING_AREA_M2 — common practice, no published source).
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { claims, finishLayers, pieces, studios } from "@/db/schema";
import { createJob, getStudioJob } from "@/lib/repairs/jobs";
import { readLines } from "@/lib/repairs/lines";
import { updateJobQuote } from "@/lib/repairs/payment";
import { alsoSurfaceLabel, pricedPiece, topOnlyWords } from "@/lib/repairs/pricing";
import { updateRepairSettings } from "@/lib/repairs/settings";
import { jobQuoteSchema } from "@/lib/validation/jobs";
import { jobDurationMin, UNSIZED_BOOKING_AREA_M2 } from "@/lib/visits/availability";
import { createAcceptedClaim, createPiece, createProduct, createStudio, createUser, memberContext, unique } from "../support/fixtures";

const SETTINGS = {
  roundingRule: "cent" as const,
  taxMode: "none" as const,
  taxInclusive: false,
  taxRates: { labour: "0", materials: "0", travel: "0", other: "0" },
  taxNumber: "",
  priceList: [
    { key: "flatten_refinish", label: "Flatten and refinish the top", kind: "labour" as const, unit: "m2" as const, surface: "top" as const, price: "30.00" },
    { key: "", label: "Strip and refinish the base (invented)", kind: "labour" as const, unit: "m2" as const, surface: "base" as const, price: "40.00" },
  ],
};

/**
 * A studio at $85.00/h, no travel, no tax; a 2000 × 900 mm top (1.8 m², L × W) under a ceramic topcoat
 * over oil, on an oiled base; an oil at 24 m²/L in 125 mL tins at $19.00; a claim's job on it.
 */
async function pieceWithOiledBase(overrides: Partial<typeof pieces.$inferInsert> = {}) {
  const studio = createStudio({ email: `${unique("studio")}@test.example`, currency: "USD", labourRateMinor: 8500, travelFeeMinor: 0 });
  const admin = await memberContext(studio, "admin");
  updateRepairSettings(admin, SETTINGS);
  const staff = await memberContext(getDb().select().from(studios).where(eq(studios.id, studio.id)).get()!, "staff");
  const owner = await createUser();
  const { piece } = createPiece(studio, { ownerId: owner.id, ...overrides });
  // The fixture's oiled top (position 0) under a ceramic topcoat; an oiled base.
  addLayers(piece, [
    { surface: "top", position: 1, finishClass: "ceramic_topcoat", coats: 1 },
    { surface: "base", position: 0, finishClass: "hardwax_oil", coats: 2 },
  ]);
  const oil = createProduct(studio, { containers: [{ ml: 125, priceMinor: 1900 }] });
  const claim = createAcceptedClaim(studio, piece.id, owner.id, "chargeable");
  getDb().update(claims).set({ category: "crack_gap" }).where(eq(claims.id, claim.id)).run();
  const job = createJob(staff, "claim", claim.id);
  return { staff, job, oil, piece };
}

const quote = (fields: Record<string, unknown>) => jobQuoteSchema.parse({ title: "Base work", tasks: [], repairs: [], productIds: [], coats: 2, travel: false, coveredPct: 0, notes: "", ...fields });

describe("each quote line is priced from the surface its work is on", () => {
  it("a re-oil of the base gets no line from the top's 1.8 m², and staff are told the base has no size", async () => {
    const { staff, job, oil } = await pieceWithOiledBase();
    // Before: labour 0.5 h + 0.5 h/m² × 1.8 m² (the top's) = 1.4 → 1.5 h, and 1.8 m² × 2 ÷ 24 m²/L = 150 mL → 2 tins.
    // Now nothing is proposed; a quote of that alone is refused in words that say why and what to do (400).
    const refused = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id] })).catch((e: unknown) => e);
    expect(refused).toMatchObject({ status: 400, message: "Re-oil: the work is on the base, and the piece's record has no size for the base, so no lines were proposed for it. Type its area for this quote, or add a line." });
    const updated = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil", "annual_check"], productIds: [oil.id] }));
    // The annual check needs no size: 0.5 h × $85.00 = $42.50; the re-oil gets no line.
    expect(updated.lines).toEqual([expect.objectContaining({ ref: "task:annual_check", quantity: 0.5, amountMinor: 4250 })]);
    const view = getStudioJob(staff, job.id);
    expect(view.unsized).toEqual([{ label: "Re-oil", surface: "base" }]);
    // The record has the top's size; the base's and the edges' may be typed on the quote.
    expect(view.sizeFields).toEqual(["base", "edges"]);
  });

  it("with the base's size typed on the quote, labour and product are worked from it", async () => {
    const { staff, job, oil } = await pieceWithOiledBase();
    const updated = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id], areasM2: { base: 0.6 } }));
    // Labour: 0.5 h + 0.5 h/m² × 0.6 m² = 0.8 h → 1.0 h (quarter hours, rounded up) × $85.00 = $85.00
    // (lib/care/quote DEFAULT_LABOUR, common practice, no published source).
    expect(updated.lines.find((l) => l.kind === "labour")).toMatchObject({ ref: "task:reoil", quantity: 1, unitPriceMinor: 8500, amountMinor: 8500 });
    // Product: 0.6 m² × 2 coats ÷ 24 m²/L = 0.05 L = 50 mL → one 125 mL tin at $19.00 (lib/care/quantity.ts).
    expect(updated.lines.find((l) => l.kind === "materials")).toMatchObject({ quantity: 1, unitPriceMinor: 1900, amountMinor: 1900 });
    expect(updated.totalMinor).toBe(8500 + 1900);
    const view = getStudioJob(staff, job.id);
    expect(view.unsized).toEqual([]);
    expect(view.job.quoteInput.areasM2).toEqual({ base: 0.6 });
  });

  it("the price list's per-area tasks read the area of the surface they name: area × rate", async () => {
    const { staff, job } = await pieceWithOiledBase();
    const repairs = ["flatten_refinish", "strip_and_refinish_the_base_invented"];
    const without = await updateJobQuote(staff, job.id, quote({ repairs }));
    // The top: 2.0 m × 0.9 m = 1.80 m² × $30.00/m² = $54.00. The base has no size: no line (before: 1.8 m² × $40.00 = $72.00).
    expect(without.lines).toEqual([expect.objectContaining({ ref: "list:flatten_refinish", quantity: 1.8, unit: "m2", unitPriceMinor: 3000, amountMinor: 5400 })]);
    expect(getStudioJob(staff, job.id).unsized).toEqual([{ label: "Strip and refinish the base (invented)", surface: "base" }]);
    const typed = await updateJobQuote(staff, job.id, quote({ repairs, areasM2: { base: 0.75 } }));
    // The base as typed: 0.75 m² × $40.00/m² = $30.00.
    expect(typed.lines.find((l) => l.ref === "list:strip_and_refinish_the_base_invented")).toMatchObject({ quantity: 0.75, unitPriceMinor: 4000, amountMinor: 3000 });
    expect(typed.totalMinor).toBe(5400 + 3000);
  });

  it("the record's top size wins over a typed one; a top with no size on record gets no made-up 1 m²", async () => {
    const sized = await pieceWithOiledBase();
    const kept = await updateJobQuote(sized.staff, sized.job.id, quote({ repairs: ["flatten_refinish"], areasM2: { top: 3 } }));
    expect(kept.lines[0]).toMatchObject({ quantity: 1.8, amountMinor: 5400 });
    // A live-edge top whose measured area was never recorded.
    const { staff, job } = await pieceWithOiledBase({ shapeKind: "measured", lengthMm: null, widthMm: null, measuredAreaM2: null });
    const none = await updateJobQuote(staff, job.id, quote({ repairs: ["flatten_refinish"], tasks: ["annual_check"] }));
    // Before: 1 m² × $30.00 = $30.00 from no size at all. The annual check needs no size: 0.5 h × $85.00 = $42.50.
    expect(none.lines).toEqual([expect.objectContaining({ ref: "task:annual_check", quantity: 0.5, amountMinor: 4250 })]);
    expect(getStudioJob(staff, job.id).unsized).toEqual([{ label: "Flatten and refinish the top", surface: "top" }]);
    const typed = await updateJobQuote(staff, job.id, quote({ repairs: ["flatten_refinish"], areasM2: { top: 1.25 } }));
    // 1.25 m² × $30.00/m² = $37.50.
    expect(typed.lines[0]).toMatchObject({ quantity: 1.25, amountMinor: 3750 });
  });

  it("a re-oil where the top and the base both end in oil prices the top, and staff are told the base is not in it", async () => {
    const { staff, job, oil, piece } = await pieceWithOiledBase();
    oilTopAndBase(piece);
    const updated = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil", "annual_check"], productIds: [oil.id] }));
    // The top's 1.8 m²: 0.5 h + 0.5 h/m² × 1.8 m² = 1.4 → 1.5 h (lib/care/quote DEFAULT_LABOUR, common practice, no published source).
    expect(updated.lines.find((l) => l.ref === "task:reoil")).toMatchObject({ quantity: 1.5, amountMinor: 12750 });
    const view = getStudioJob(staff, job.id);
    expect(view.unsized).toEqual([]);
    // Before: nothing said the base's oil was left out of the price. The annual check needs no size, so no note.
    // The base has no size yet (the record keeps none for it): null, the top's 2.0 m × 0.9 m = 1.8 m².
    expect(view.topOnly).toEqual([{ task: "reoil", label: "Re-oil", surfaces: ["top", "base"], also: [], areasM2: { top: 1.8, base: null } }]);
    expect(topOnlyWords(view.topOnly[0]!)).toBe("Re-oil: the top and the base both have this finish as their outer coat, and the lines price the top only. If the work covers the base too, tick it below.");
    expect(topOnlyWords({ label: "Re-oil", surfaces: ["top", "base", "edges"], also: [], areasM2: { top: 1.8 } })).toBe(
      "Re-oil: the top, the base and the edges all have this finish as their outer coat, and the lines price the top only. If the work covers the base and the edges too, tick them below.",
    );
    // A piece whose base ends in another finish gets no note (the first case's piece: topcoat over the top's oil).
    const other = await pieceWithOiledBase();
    await updateJobQuote(other.staff, other.job.id, quote({ tasks: ["topcoat_refresh"] }));
    expect(getStudioJob(other.staff, other.job.id).topOnly).toEqual([]);
  });

  it("refuses a typed size that is no area, naming the field", () => {
    const bad = jobQuoteSchema.safeParse({ title: "x", tasks: ["reoil"], productIds: [], coats: 1, travel: false, coveredPct: 0, areasM2: { base: -1 } });
    expect(bad.success).toBe(false);
    expect(bad.error!.issues[0]!.path).toEqual(["areasM2", "base"]);
  });
});

/** Layers added to a piece's finish stack, applied on its delivery day. */
function addLayers(piece: typeof pieces.$inferSelect, layers: Pick<typeof finishLayers.$inferInsert, "surface" | "position" | "finishClass" | "coats">[]) {
  getDb().insert(finishLayers).values(layers.map((l) => ({ ...l, studioId: piece.studioId, pieceId: piece.id, appliedOn: piece.deliveredOn }))).run();
}

/** The top's ceramic topcoat taken off the record: the top's outermost layer is its oil, as the base's is. */
function oilTopAndBase(piece: typeof pieces.$inferSelect) {
  getDb().delete(finishLayers).where(eq(finishLayers.pieceId, piece.id)).run();
  addLayers(piece, [
    { surface: "top", position: 0, finishClass: "hardwax_oil", coats: 2 },
    { surface: "base", position: 0, finishClass: "hardwax_oil", coats: 2 },
  ]);
}

// Pricing the base beside the top. Labour on each surface by the same rule as the top's: 0.5 h + 0.5 h/m²,
// rounded up to the quarter hour (lib/care/quote DEFAULT_LABOUR and LABOUR_INCREMENT_HOURS, invented for
// the demo — common practice, no published source). Product: area × coats ÷ coverage per coat (lib/care/quantity.ts,
// lib/care/SOURCES.md) in whole containers, worked once on the surfaces' summed area (our choice: one tin
// opened on the visit serves both surfaces — common practice, no published source).
describe("staff price the base too where it ends in the top's finish", () => {
  it("the base's typed 0.6 m² adds its own labour line, and the oil is worked on 1.8 + 0.6 m² at once", async () => {
    const { staff, job, oil, piece } = await pieceWithOiledBase();
    oilTopAndBase(piece);
    const updated = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id], areasM2: { base: 0.6 }, alsoSurfaces: { reoil: ["base"] } }));
    // Top: 0.5 h + 0.5 h/m² × 1.8 m² = 1.4 → 1.5 h × $85.00 = $127.50. Base: 0.5 h + 0.5 h/m² × 0.6 m² = 0.8 → 1.0 h × $85.00 = $85.00.
    expect(updated.lines.filter((l) => l.kind === "labour")).toEqual([
      expect.objectContaining({ ref: "task:reoil", description: "Re-oil — top", quantity: 1.5, unitPriceMinor: 8500, amountMinor: 12750 }),
      expect.objectContaining({ ref: "task:reoil:base", description: "Re-oil — base", quantity: 1, unitPriceMinor: 8500, amountMinor: 8500 }),
    ]);
    // Oil: (1.8 + 0.6) m² × 2 coats ÷ 24 m²/L = 0.2 L = 200 mL → two 125 mL tins (250 mL) × $19.00 = $38.00.
    // Rounded up a surface at a time it would be 150 mL → 2 tins and 50 mL → 1 tin: 3 tins, $57.00.
    expect(updated.lines.filter((l) => l.kind === "materials")).toEqual([expect.objectContaining({ ref: `product:${oil.id}:125`, description: "Test hardwax oil (invented), 125 mL — top and base", quantity: 2, unitPriceMinor: 1900, amountMinor: 3800 })]);
    expect(updated.totalMinor).toBe(12750 + 8500 + 3800);
    // Read back: the choice is kept with the quote's input, and the note says both surfaces are priced.
    const view = getStudioJob(staff, job.id);
    expect(view.job.quoteInput.alsoSurfaces).toEqual({ reoil: ["base"] });
    expect(view.topOnly).toEqual([{ task: "reoil", label: "Re-oil", surfaces: ["top", "base"], also: ["base"], areasM2: { top: 1.8, base: 0.6 } }]);
    expect(topOnlyWords(view.topOnly[0]!)).toBe("Re-oil: the top and the base both have this finish as their outer coat, and the lines price the top and the base.");
    expect(view.unsized).toEqual([]);
  });

  it("where pooling saves no tin the containers match the per-surface count; a larger base takes the next tin", async () => {
    const { staff, job, oil, piece } = await pieceWithOiledBase();
    oilTopAndBase(piece);
    // One coat: (1.8 + 0.6) m² ÷ 24 m²/L = 100 mL → one 125 mL tin (alone: 75 mL and 25 mL, a tin each: 2 tins).
    const one = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id], coats: 1, areasM2: { base: 0.6 }, alsoSurfaces: { reoil: ["base"] } }));
    expect(one.lines.find((l) => l.kind === "materials")).toMatchObject({ quantity: 1, amountMinor: 1900 });
    // One coat, base 1.2 m²: (1.8 + 1.2) ÷ 24 = 125 mL exactly → one tin, no float overshoot to a second.
    const exact = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id], coats: 1, areasM2: { base: 1.2 }, alsoSurfaces: { reoil: ["base"] } }));
    expect(exact.lines.find((l) => l.kind === "materials")).toMatchObject({ quantity: 1, amountMinor: 1900 });
    // Base 1.3 m²: (1.8 + 1.3) ÷ 24 = 129.17 mL → two tins. Base labour 0.5 + 0.65 = 1.15 → 1.25 h = $106.25.
    const more = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id], coats: 1, areasM2: { base: 1.3 }, alsoSurfaces: { reoil: ["base"] } }));
    expect(more.lines.find((l) => l.kind === "materials")).toMatchObject({ quantity: 2, amountMinor: 3800 });
    expect(more.lines.find((l) => l.ref === "task:reoil:base")).toMatchObject({ quantity: 1.25, amountMinor: 10625 });
  });

  it("a chosen base with no size is listed as unsized; the top alone is priced", async () => {
    const { staff, job, oil, piece } = await pieceWithOiledBase();
    oilTopAndBase(piece);
    const updated = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id], alsoSurfaces: { reoil: ["base"] } }));
    // The top's 1.8 m² only: 1.5 h = $127.50; 1.8 × 2 ÷ 24 = 150 mL → two tins, $38.00. Named for the top, as the base was asked for.
    expect(updated.lines.map((l) => [l.description, l.quantity, l.amountMinor])).toEqual([
      ["Re-oil — top", 1.5, 12750],
      ["Test hardwax oil (invented), 125 mL — top", 2, 3800],
    ]);
    const view = getStudioJob(staff, job.id);
    expect(view.unsized).toEqual([{ label: "Re-oil", surface: "base" }]);
    expect(topOnlyWords(view.topOnly[0]!)).toBe("Re-oil: the top and the base both have this finish as their outer coat, and the lines price the top only.");
    // Cleared again: back to the top's lines as before, unnamed.
    const cleared = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id], alsoSurfaces: { reoil: [] } }));
    expect(cleared.lines.map((l) => l.description)).toEqual(["Re-oil — labour", "Test hardwax oil (invented), 125 mL"]);
    expect(getStudioJob(staff, job.id).unsized).toEqual([]);
  });

  it("a choice for a surface that does not end in the task's finish prices nothing more", async () => {
    // The first piece: a topcoated top over oil and an oiled base. The re-oil is on the base alone; asking for the edges changes nothing.
    const { staff, job, oil } = await pieceWithOiledBase();
    const updated = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id], areasM2: { base: 0.6, edges: 0.2 }, alsoSurfaces: { reoil: ["edges"], topcoat_refresh: ["base"] } }));
    // Base: 0.8 → 1.0 h = $85.00; 0.6 × 2 ÷ 24 = 50 mL → one tin, $19.00 (as in "with the base's size typed on the quote").
    expect(updated.lines.map((l) => [l.description, l.quantity, l.amountMinor])).toEqual([
      ["Re-oil — labour", 1, 8500],
      ["Test hardwax oil (invented), 125 mL", 1, 1900],
    ]);
    expect(getStudioJob(staff, job.id).topOnly).toEqual([]);
  });

  it("a quote saved before the choice existed reads as the top alone", async () => {
    const { staff, job, oil, piece } = await pieceWithOiledBase();
    oilTopAndBase(piece);
    await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id], areasM2: { base: 0.6 } }));
    const stored = getStudioJob(staff, job.id);
    expect("alsoSurfaces" in stored.job.quoteInput).toBe(false);
    expect(stored.topOnly[0]).toMatchObject({ also: [], areasM2: { top: 1.8, base: 0.6 } });
  });

  it("the choice is bounded: another surface than the top, at most two, for a known task", () => {
    const parse = (alsoSurfaces: unknown) => jobQuoteSchema.safeParse({ title: "x", tasks: ["reoil"], productIds: [], coats: 1, travel: false, coveredPct: 0, alsoSurfaces });
    expect(parse({ reoil: ["base", "edges"] }).success).toBe(true);
    expect(parse({ reoil: ["top"] }).error!.issues[0]!.path).toEqual(["alsoSurfaces", "reoil", 0]);
    expect(parse({ reoil: ["base", "edges", "base"] }).error!.issues[0]!.path).toEqual(["alsoSurfaces", "reoil"]);
    expect(parse({ sand_everything: ["base"] }).success).toBe(false);
  });

  it("a worn or scratched finish's first quote renews the top's own finish: a waxed desk is re-waxed, not re-oiled", async () => {
    const studio = createStudio({ email: `${unique("studio")}@test.example`, currency: "USD", labourRateMinor: 8500, travelFeeMinor: 0 });
    const staff = await memberContext(studio, "staff");
    const owner = await createUser();
    const { piece } = createPiece(studio, { ownerId: owner.id });
    getDb().update(finishLayers).set({ finishClass: "paste_wax" }).where(eq(finishLayers.pieceId, piece.id)).run();
    addLayers(piece, [{ surface: "base", position: 0, finishClass: "paste_wax", coats: 1 }]);
    const wax = createProduct(studio, { name: "Test paste wax (invented)", finishClass: "paste_wax", coverageM2PerL: 20, containers: [{ ml: 200, priceMinor: 1600 }] });
    for (const category of ["finish_wear", "scratch_dent", "finish_peeling"] as const) {
      const claim = createAcceptedClaim(studio, piece.id, owner.id, "chargeable");
      getDb().update(claims).set({ category }).where(eq(claims.id, claim.id)).run();
      const job = createJob(staff, "claim", claim.id);
      // Before: "reoil" (or "topcoat_refresh" for peeling) whatever the finish, and an oil from the catalog.
      expect([category, job.quoteInput.tasks, job.quoteInput.productIds]).toEqual([category, ["rewax"], [wax.id]]);
      expect(getStudioJob(staff, job.id).topOnly).toMatchObject([{ task: "rewax", surfaces: ["top", "base"], also: [] }]);
    }
  });

  it("the note's choice reads the area in the studio's units", () => {
    expect(alsoSurfaceLabel("base", 0.6, "metric")).toBe("Also price the base (0.60 m²)");
    // 0.6 m² ÷ 0.09290304 m²/ft² (1 ft = 0.3048 m exactly, NIST SP 811 (2008), App. B.9) = 6.458 ft² → 6.5 ft².
    expect(alsoSurfaceLabel("base", 0.6, "imperial")).toBe("Also price the base (6.5 ft²)");
    expect(alsoSurfaceLabel("edges", null, "imperial")).toBe("Also price the edges (no size yet)");
  });
});

/** A quote from these tasks whose only line is a flat typed one: no hours, so the tasks set the visit's length. */
const flatQuote = (fields: Record<string, unknown>) =>
  jobQuoteSchema.parse({
    title: "Base work",
    repairs: [],
    productIds: [],
    coats: 2,
    travel: false,
    coveredPct: 0,
    notes: "",
    lines: [{ kind: "other", source: "typed", description: "Agreed flat price (invented)", quantity: 1, unit: "each", unitPriceMinor: 12000 }],
    ...fields,
  });

async function bookedMinutes(fields: Record<string, unknown>, overrides: Partial<typeof pieces.$inferInsert> = {}) {
  const { staff, job, piece } = await pieceWithOiledBase(overrides);
  const saved = await updateJobQuote(staff, job.id, flatQuote(fields));
  expect(saved.lines.some((l) => l.unit === "h")).toBe(false);
  // Read back from the file: the stored quote input and the piece's finish stack.
  const stored = getStudioJob(staff, job.id).job;
  return jobDurationMin(stored, pricedPiece(getDb(), getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!));
}

describe("a visit is booked for the surface its work is on", () => {
  it("a re-oil of a base with no size is booked at the plain 1 m², not the top's 1.8 m²", async () => {
    expect(UNSIZED_BOOKING_AREA_M2).toBe(1);
    // Before: 0.5 h + 0.5 h/m² × 1.8 m² (the top's) = 1.4 → 1.5 h = 90 minutes.
    // Now: 0.5 h + 0.5 h/m² × 1 m² = 1.0 h = 60 minutes.
    expect(await bookedMinutes({ tasks: ["reoil"] })).toBe(60);
  });

  it("a base area typed on the quote sets the re-oil's length", async () => {
    // 0.5 h + 0.5 h/m² × 0.3 m² = 0.65 → 0.75 h = 45 minutes.
    expect(await bookedMinutes({ tasks: ["reoil"], areasM2: { base: 0.3 } })).toBe(45);
  });

  it("each task takes its own surface: the top's topcoat at 1.8 m², the base's re-oil at its typed size", async () => {
    // Topcoat refresh on the top: 0.5 h + 0.4 h/m² × 1.8 m² = 1.22 → 1.25 h = 75 minutes;
    // re-oil on the base: 0.5 h + 0.5 h/m² × 0.3 m² = 0.65 → 0.75 h = 45 minutes; 75 + 45 = 120.
    expect(await bookedMinutes({ tasks: ["topcoat_refresh", "reoil"], areasM2: { base: 0.3 } })).toBe(120);
  });

  it("a quote with hours for some tasks still books time for a task it priced nothing for (no size for its surface)", async () => {
    const { staff, job, piece } = await pieceWithOiledBase();
    const saved = await updateJobQuote(staff, job.id, jobQuoteSchema.parse({ title: "Check and base", tasks: ["annual_check", "reoil"], repairs: [], productIds: [], coats: 1, travel: false, coveredPct: 0, notes: "" }));
    const hours = saved.lines.filter((l) => l.unit === "h");
    expect(hours.map((l) => l.ref)).toEqual(["task:annual_check"]);
    const stored = getStudioJob(staff, job.id).job;
    // The check's quoted hours, plus the base's re-oil at the plain 1 m²: 0.5 h + 0.5 h/m² × 1 m² = 60 minutes
    // (before: the check's hours alone).
    expect(jobDurationMin(stored, pricedPiece(getDb(), getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!))).toBe(Math.round(hours[0]!.quantity * 60) + 60);
  });

  it("a base priced beside the top is booked too: at its typed size, or at the plain 1 m² where it has none", async () => {
    // No hour lines (a flat typed line): the re-oil on the top's 1.8 m², 0.5 + 0.9 = 1.4 → 1.5 h = 90 minutes, and on the
    // base's typed 0.3 m², 0.5 + 0.15 = 0.65 → 0.75 h = 45 minutes: 135 (before: the top's 90 alone).
    const flat = await pieceWithOiledBase();
    oilTopAndBase(flat.piece);
    await updateJobQuote(flat.staff, flat.job.id, flatQuote({ tasks: ["reoil"], areasM2: { base: 0.3 }, alsoSurfaces: { reoil: ["base"] } }));
    expect(jobDurationMin(getStudioJob(flat.staff, flat.job.id).job, pricedPiece(getDb(), flat.piece))).toBe(135);
    // Proposed lines: the top's 1.5 h quoted; the base chosen with no size has no line, so it is booked at
    // 1 m²: 0.5 + 0.5 = 1.0 h = 60 minutes; 90 + 60 = 150 (before: 90).
    const { staff, job, piece } = await pieceWithOiledBase();
    oilTopAndBase(piece);
    const saved = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], alsoSurfaces: { reoil: ["base"] } }));
    expect(saved.lines.filter((l) => l.unit === "h").map((l) => [l.ref, l.quantity])).toEqual([["task:reoil", 1.5]]);
    expect(jobDurationMin(getStudioJob(staff, job.id).job, pricedPiece(getDb(), piece))).toBe(150);
    // Sized: both hour lines are quoted (1.5 h + 0.5 + 0.3 = 0.8 → 1.0 h), and nothing more is added: 150 minutes.
    await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], areasM2: { base: 0.6 }, alsoSurfaces: { reoil: ["base"] } }));
    expect(jobDurationMin(getStudioJob(staff, job.id).job, pricedPiece(getDb(), piece))).toBe(150);
  });

  it("a top with no size on record is booked at the plain 1 m², or at the size typed for it", async () => {
    const unmeasured = { shapeKind: "measured" as const, lengthMm: null, widthMm: null, measuredAreaM2: null };
    // Topcoat refresh at 1 m²: 0.5 h + 0.4 h = 0.9 → 1.0 h = 60 minutes (before: the top's 0 m², 30 minutes).
    expect(await bookedMinutes({ tasks: ["topcoat_refresh"] }, unmeasured)).toBe(60);
    // Typed 2.5 m²: 0.5 h + 0.4 h/m² × 2.5 m² = 1.5 h = 90 minutes.
    expect(await bookedMinutes({ tasks: ["topcoat_refresh"], areasM2: { top: 2.5 } }, unmeasured)).toBe(90);
  });
});

// Which tasks use product: a refresh (re-oil, re-wax, topcoat refresh, resin polish, charred re-oil) puts the
// finish's product on the piece; an inspection of a film finish looks along it and uses none (lib/repairs/pricing
// taskUsesProduct; common practice, no published source).
describe("an inspection proposes no product, a refresh does", () => {
  /** The oiled-base piece's finish stack replaced by a film-finished top (a varnished island), with a conversion varnish in the catalog. */
  async function varnishedTop() {
    const made = await pieceWithOiledBase();
    getDb().delete(finishLayers).where(eq(finishLayers.pieceId, made.piece.id)).run();
    addLayers(made.piece, [{ surface: "top", position: 0, finishClass: "film_finish", coats: 2 }]);
    const studio = getDb().select().from(studios).where(eq(studios.id, made.piece.studioId)).get()!;
    const varnish = createProduct(studio, { name: "Test conversion varnish (invented)", finishClass: "film_finish", coverageM2PerL: 12, containers: [{ ml: 1000, priceMinor: 4800 }] });
    return { ...made, studio, varnish };
  }

  it("a worn film finish's first quote inspects it with no tin of varnish", async () => {
    const { studio, piece, varnish } = await varnishedTop();
    const staff = await memberContext(studio, "staff");
    const claim = createAcceptedClaim(studio, piece.id, piece.ownerId!, "chargeable");
    getDb().update(claims).set({ category: "finish_wear" }).where(eq(claims.id, claim.id)).run();
    const job = createJob(staff, "claim", claim.id);
    expect(job.quoteInput.tasks).toEqual(["film_inspect"]);
    // Before: the varnish was chosen by its finish class, and 1.8 m² × 1 coat ÷ 12 m²/L = 150 mL → one 1 L tin at $48.00 was proposed.
    expect(job.quoteInput.productIds).not.toContain(varnish.id);
    expect(job.quoteInput.productIds).toEqual([]);
    // Labour only: 0.5 h + 0.1 h/m² × 1.8 m² = 0.68 → 0.75 h × $85.00 = $63.75 (lib/care/quote DEFAULT_LABOUR).
    expect(readLines(job.lines).map((l) => [l.ref, l.quantity, l.amountMinor])).toEqual([["task:film_inspect", 0.75, 6375]]);
  });

  it("a varnish ticked on an inspection is not priced; an oil ticked beside it for a re-oil is", async () => {
    const { staff, job, oil, varnish } = await varnishedTop();
    const inspect = await updateJobQuote(staff, job.id, quote({ tasks: ["film_inspect"], productIds: [varnish.id], coats: 1 }));
    // Before: a 1 L tin of varnish at $48.00 beside the 0.75 h.
    expect(inspect.lines.map((l) => [l.ref, l.quantity, l.amountMinor])).toEqual([["task:film_inspect", 0.75, 6375]]);
    expect(inspect.totalMinor).toBe(6375);
    const both = await updateJobQuote(staff, job.id, quote({ tasks: ["film_inspect", "reoil"], productIds: [varnish.id, oil.id], coats: 1 }));
    // The re-oil, on the top (no surface ends in oil): 0.5 h + 0.5 h/m² × 1.8 m² = 1.4 → 1.5 h × $85.00 = $127.50; the oil,
    // 1.8 m² × 1 coat ÷ 24 m²/L = 75 mL → one 125 mL tin at $19.00 (lib/care/quantity.ts). No varnish.
    expect(both.lines.map((l) => [l.ref, l.quantity, l.amountMinor])).toEqual([
      ["task:film_inspect", 0.75, 6375],
      ["task:reoil", 1.5, 12750],
      [`product:${oil.id}:125`, 1, 1900],
    ]);
  });
});

// Proposing again (no lines sent) lays the proposal over the lines last saved (lib/repairs/repropose.ts).
describe("proposing again keeps the hours and prices staff changed", () => {
  it("the base ticked after the top's hours were changed and saved: the top keeps them, the base is proposed", async () => {
    const { staff, job, oil, piece } = await pieceWithOiledBase();
    oilTopAndBase(piece);
    const first = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id] }));
    // Top: 0.5 h + 0.5 h/m² × 1.8 m² = 1.4 → 1.5 h proposed; staff make it 2 h and the tin $17.50, and save.
    const edited = first.lines.map(({ kind, source, ref, description, quantity, unit, unitPriceMinor }) => ({ kind, source, ref, description, unit, quantity: ref === "task:reoil" ? 2 : quantity, unitPriceMinor: kind === "materials" ? 1750 : unitPriceMinor }));
    await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id], lines: edited }));
    const again = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id], areasM2: { base: 0.6 }, alsoSurfaces: { reoil: ["base"] } }));
    // Before: the top went back to 1.5 h and the tin to $19.00. Base: 0.5 + 0.3 = 0.8 → 1 h. Oil: (1.8 + 0.6) m² × 2 ÷ 24 = 200 mL → 2 tins, at staff's $17.50.
    expect(again.lines.map((l) => [l.ref, l.description, l.quantity, l.unitPriceMinor, l.proposed])).toEqual([
      ["task:reoil", "Re-oil — top", 2, 8500, { quantity: 1.5, unitPriceMinor: 8500 }],
      ["task:reoil:base", "Re-oil — base", 1, 8500, { quantity: 1, unitPriceMinor: 8500 }],
      [`product:${oil.id}:125`, "Test hardwax oil (invented), 125 mL — top and base", 2, 1750, { quantity: 2, unitPriceMinor: 1900 }],
    ]);
    expect(again.totalMinor).toBe(17_000 + 8500 + 3500);
    // Lines left as proposed follow the proposal: the base's 1 h goes to 1.25 h at a typed 1.2 m² (0.5 + 0.6 = 1.1 → 1.25 h).
    const bigger = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil"], productIds: [oil.id], areasM2: { base: 1.2 }, alsoSurfaces: { reoil: ["base"] } }));
    expect(bigger.lines.filter((l) => l.kind === "labour").map((l) => [l.ref, l.quantity])).toEqual([["task:reoil", 2], ["task:reoil:base", 1.25]]);
  });
});
