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
import { updateJobQuote } from "@/lib/repairs/payment";
import { pricedPiece, topOnlyWords } from "@/lib/repairs/pricing";
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
  getDb()
    .insert(finishLayers)
    .values([
      { studioId: studio.id, pieceId: piece.id, surface: "top", position: 1, finishClass: "ceramic_topcoat", coats: 1, appliedOn: piece.deliveredOn },
      { studioId: studio.id, pieceId: piece.id, surface: "base", position: 0, finishClass: "hardwax_oil", coats: 2, appliedOn: piece.deliveredOn },
    ])
    .run();
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
    // The top's ceramic topcoat taken off the record: the top's outermost layer is now its oil, as the base's is.
    getDb().delete(finishLayers).where(eq(finishLayers.pieceId, piece.id)).run();
    getDb()
      .insert(finishLayers)
      .values([
        { studioId: piece.studioId, pieceId: piece.id, surface: "top", position: 0, finishClass: "hardwax_oil", coats: 2, appliedOn: piece.deliveredOn },
        { studioId: piece.studioId, pieceId: piece.id, surface: "base", position: 0, finishClass: "hardwax_oil", coats: 2, appliedOn: piece.deliveredOn },
      ])
      .run();
    const updated = await updateJobQuote(staff, job.id, quote({ tasks: ["reoil", "annual_check"], productIds: [oil.id] }));
    // The top's 1.8 m²: 0.5 h + 0.5 h/m² × 1.8 m² = 1.4 → 1.5 h (lib/care/quote DEFAULT_LABOUR, common practice, no published source).
    expect(updated.lines.find((l) => l.ref === "task:reoil")).toMatchObject({ quantity: 1.5, amountMinor: 12750 });
    const view = getStudioJob(staff, job.id);
    expect(view.unsized).toEqual([]);
    // Before: nothing said the base's oil was left out of the price. The annual check needs no size, so no note.
    expect(view.topOnly).toEqual([{ label: "Re-oil", surfaces: ["top", "base"] }]);
    expect(topOnlyWords(view.topOnly[0]!)).toBe("Re-oil: the top and the base both have this finish as their outer coat; the lines price the top only. If the work covers the base too, add lines for it.");
    expect(topOnlyWords({ label: "Re-oil", surfaces: ["top", "base", "edges"] })).toBe("Re-oil: the top, the base and the edges all have this finish as their outer coat; the lines price the top only. If the work covers them too, add lines for it.");
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

  it("a top with no size on record is booked at the plain 1 m², or at the size typed for it", async () => {
    const unmeasured = { shapeKind: "measured" as const, lengthMm: null, widthMm: null, measuredAreaM2: null };
    // Topcoat refresh at 1 m²: 0.5 h + 0.4 h = 0.9 → 1.0 h = 60 minutes (before: the top's 0 m², 30 minutes).
    expect(await bookedMinutes({ tasks: ["topcoat_refresh"] }, unmeasured)).toBe(60);
    // Typed 2.5 m²: 0.5 h + 0.4 h/m² × 2.5 m² = 1.5 h = 90 minutes.
    expect(await bookedMinutes({ tasks: ["topcoat_refresh"], areasM2: { top: 2.5 } }, unmeasured)).toBe(90);
  });
});
