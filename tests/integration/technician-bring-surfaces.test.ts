// The technician's "What to bring" for the surfaces the quote priced: where the top and the base end in
// the same finish and staff priced the base too (JobQuoteInput.alsoSurfaces, lib/repairs/pricing
// proposeLines), the amount is for both, summed, as the quote's product line is; a size typed on the
// quote counts as the quote priced it (quoteAreaM2). Amount = area × coats ÷ coverage per coat
// (lib/care/quantity.ts productNeeded; lib/care/SOURCES.md, quantity.ts row), in whole containers; the
// coverage (24 m²/L) and the 125 mL tin are invented test figures (tests/support/fixtures createProduct).
// The top is 2000 × 900 mm = 1.8 m² (createPiece). Real SQLite file.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { finishLayers, repairJobs } from "@/db/schema";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { technicianDay } from "@/lib/visits/technician-day";
import type { StoredJobQuote } from "@/db/schema";
import { createProduct } from "../support/fixtures";
import { staffActor, visitWorld } from "./visits-helpers";

const NOW = Date.parse("2027-05-03T12:00:00Z"); // Monday 3 May 2027, 08:00 in New York

/** The visit world's oiled-top piece, its quote changed as given, booked in its first free slot: what the technician is told to bring. */
async function bringFor(quote: Partial<StoredJobQuote>, stack: "oiled base" | "film top over oiled base", catalog?: (w: Awaited<ReturnType<typeof visitWorld>>) => void) {
  const w = await visitWorld();
  catalog?.(w);
  if (stack === "oiled base") getDb().insert(finishLayers).values({ studioId: w.studio.id, pieceId: w.piece.id, surface: "base", position: 0, finishClass: "hardwax_oil", coats: 1, appliedOn: w.piece.deliveredOn }).run();
  else
    getDb().insert(finishLayers).values([
      { studioId: w.studio.id, pieceId: w.piece.id, surface: "top", position: 1, finishClass: "film_finish", coats: 1, appliedOn: w.piece.deliveredOn },
      { studioId: w.studio.id, pieceId: w.piece.id, surface: "base", position: 0, finishClass: "hardwax_oil", coats: 1, appliedOn: w.piece.deliveredOn },
    ]).run();
  getDb().update(repairJobs).set({ quoteInput: { ...w.job.quoteInput, ...quote } }).where(eq(repairJobs.id, w.job.id)).run();
  const slot = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-03T12:00:00Z", to: "2027-05-05T00:00:00Z" }, NOW).slots[0]!;
  await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW);
  return technicianDay(w.tech, { date: slot.localDate }, NOW).items[0]!.bring;
}

describe("what to bring covers the surfaces the quote priced", () => {
  it("the top and the base priced together: the oil for both, summed", async () => {
    const [oil] = await bringFor({ areasM2: { base: 0.6 }, alsoSurfaces: { reoil: ["base"] } }, "oiled base");
    // (1.8 + 0.6) m² × 1 coat ÷ 24 m²/L = 0.1 L = 100 mL → one 125 mL tin. Before: the top's 1.8 ÷ 24 = 75 mL "on this top".
    expect(oil).toMatchObject({ surface: null, amountFor: "top", alsoFor: ["base"], unsized: [], amount: { ml: 100, containers: "1 × 125 mL" } });
    expect(oil!.amount!.areaM2).toBeCloseTo(2.4, 9);
    expect(oil!.amount!.exactMl).toBeCloseTo(100, 9);
  });

  it("the base chosen with no size anywhere: no amount, and the base named as the one without a size", async () => {
    const [oil] = await bringFor({ alsoSurfaces: { reoil: ["base"] } }, "oiled base");
    expect(oil).toMatchObject({ amountFor: "top", alsoFor: ["base"], unsized: ["base"], amount: null });
  });

  it("the top alone where the base was not chosen: the top's amount, as before", async () => {
    const [oil] = await bringFor({ areasM2: { base: 0.6 } }, "oiled base");
    // 1.8 m² ÷ 24 m²/L = 75 mL → one 125 mL tin.
    expect(oil).toMatchObject({ amountFor: "top", alsoFor: [], unsized: [], amount: { ml: 75, containers: "1 × 125 mL" } });
  });

  it("a base size typed on the quote gives the base's oil an amount (the record keeps none)", async () => {
    const [oil] = await bringFor({ areasM2: { base: 0.6 } }, "film top over oiled base");
    // The oil refreshes the base (the top ends in film): 0.6 m² ÷ 24 m²/L = 25 mL. Before: no amount, "measure it on site".
    expect(oil).toMatchObject({ surface: "base", amountFor: "base", alsoFor: [], unsized: [], amount: { ml: 25, containers: "1 × 125 mL" } });
  });

  // An inspection uses no product (common practice, no published source; lib/repairs/pricing taskUsesProduct).
  it("an inspection of the film top with no product chosen: nothing to bring, not the catalog's varnish", async () => {
    const bring = await bringFor({ tasks: ["film_inspect"], productIds: [] }, "film top over oiled base", (w) => {
      createProduct(w.studio, { name: "Test conversion varnish (invented)", finishClass: "film_finish", coverageM2PerL: 12, containers: [{ ml: 1000, priceMinor: 4800 }] });
    });
    // Before: the varnish, found by the top's finish class, "for 1 coat on this top".
    expect(bring).toEqual([]);
  });
});
