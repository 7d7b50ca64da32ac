// The technician's "What to bring" in the studio's units, from the engine's exact amount: the amount
// is rounded once, for display, and the containers to open are written in the studio's units.
// 1 US fl oz = 29.5735295625 mL exactly (NIST Handbook 44, Appendix C); figures worked by hand below.
// The amount is area × coats ÷ coverage per coat, as lib/care/quantity.ts productNeeded works it
// (lib/care/SOURCES.md, quantity.ts row); the coverage rates here are invented test figures.
// The area is the one the piece's record gives the surface the layer goes on: its top's (2000 × 900 mm,
// tests/support/fixtures createPiece); the record keeps none for the base or the edges.
// Real SQLite file.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { finishLayers, finishProducts, pieces, studios } from "@/db/schema";
import { formatArea, formatVolume } from "@/lib/format";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { technicianDay } from "@/lib/visits/technician-day";
import { staffActor, visitWorld } from "./visits-helpers";

const NOW = Date.parse("2027-05-03T12:00:00Z"); // Monday 3 May 2027, 08:00 in New York

/** Books the job's first free slot on Monday or Tuesday. */
async function bookFirstSlot(w: Awaited<ReturnType<typeof visitWorld>>) {
  const slot = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-03T12:00:00Z", to: "2027-05-05T00:00:00Z" }, NOW).slots[0]!;
  await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW);
  return slot;
}

describe("technician's day: what to bring", () => {
  it("carries the exact amount and writes containers in an imperial studio's units", async () => {
    const w = await visitWorld();
    // 2000 × 900 mm top = 1.8 m²; one coat at 61.5 m²/L = 1.8 / 61.5 L = 29.268 mL exact.
    getDb().update(finishProducts).set({ coverageM2PerL: 61.5 }).where(eq(finishProducts.id, w.product.id)).run();
    getDb().update(studios).set({ unitSystem: "imperial" }).where(eq(studios.id, w.studio.id)).run();
    const tech = { ...w.tech, studio: { ...w.tech.studio, unitSystem: "imperial" as const } };
    const slot = await bookFirstSlot(w);

    const bring = technicianDay(tech, { date: slot.localDate }, NOW).items[0]!.bring[0]!;
    // The piece's one stack is an oiled top: the oil goes there, and the amount is the top's.
    expect(bring).toMatchObject({ surface: "top", amountFor: "top", amount: { areaM2: 1.8 } });
    expect(bring.amount!.exactMl).toBeCloseTo(29.2683, 4);
    expect(bring.amount!.ml).toBe(30);
    // The page writes formatVolume(exactMl): 29.268 mL = 0.98968 fl oz → 1 fl oz; from the rounded
    // 30 mL it would have read 1.01442 → 1.1 fl oz.
    expect(formatVolume(bring.amount!.exactMl, "imperial")).toBe("1 US fl oz (30 mL)");
    // One 125 mL container (createProduct's size): 125 mL = 4.2268 fl oz → 4.3.
    expect(bring.amount!.containers).toBe("1 × 4.3 US fl oz (125 mL)");
    // One coat on 10 ft² (0.9290304 m², NIST Handbook 44 App. C): 0.9290304 ÷ 61.5 L = 15.106 mL = 0.5108 fl oz.
    expect(bring.perArea.exactMl).toBeCloseTo(15.1062, 4);
    expect([formatVolume(bring.perArea.exactMl, "imperial"), formatArea(bring.perArea.areaM2, "imperial")]).toEqual(["0.6 US fl oz (16 mL)", "10.0 ft²"]);
  });

  it("a layer that goes on the base gets no amount worked out from the top's area: the record has no base area", async () => {
    const w = await visitWorld();
    getDb().update(finishProducts).set({ coverageM2PerL: 61.5 }).where(eq(finishProducts.id, w.product.id)).run();
    // Film over the oiled top, oil on the base: the oil the job brings refreshes the base (refreshedSurface).
    getDb().insert(finishLayers).values([
      { studioId: w.studio.id, pieceId: w.piece.id, surface: "top", position: 1, finishClass: "film_finish", coats: 1, appliedOn: w.piece.deliveredOn },
      { studioId: w.studio.id, pieceId: w.piece.id, surface: "base", position: 0, finishClass: "hardwax_oil", coats: 1, appliedOn: w.piece.deliveredOn },
    ]).run();
    const slot = await bookFirstSlot(w);

    const item = technicianDay(w.tech, { date: slot.localDate }, NOW).items[0]!;
    // Not the top's 1.8 m² × 1 coat ÷ 61.5 m²/L = 29.268 mL: no figure, and what one coat takes on a
    // square metre (the studio's units) to work one out on site: 1 m² × 1 ÷ 61.5 m²/L = 16.260 mL.
    const [oil] = item.bring;
    expect(oil).toMatchObject({ productId: w.product.id, coats: 1, surface: "base", amountFor: "base", amount: null, perArea: { areaM2: 1 } });
    expect(oil!.perArea.exactMl).toBeCloseTo(16.2602, 4);
    expect([formatVolume(oil!.perArea.exactMl, "metric"), formatArea(oil!.perArea.areaM2, "metric")]).toEqual(["17 mL", "1.00 m²"]);
    expect(item.defaultLayers).toEqual([{ surface: "base", finishClass: "hardwax_oil", productId: w.product.id, coats: 1 }]);
    // A layer the technician adds by hand starts as the top's outer coat (the film over the oil), not as oil.
    expect(item.addLayerClass).toBe("film_finish");
    // The oil's cautions still come with it.
    expect(item.cautions.map((c) => c.text).join(" ")).toMatch(/metal can, cover them with water/);
  });

  it("a top without its sizes on record: the product is still listed, with no amount", async () => {
    const w = await visitWorld();
    getDb().update(pieces).set({ shapeKind: "measured", lengthMm: null, widthMm: null, measuredAreaM2: null }).where(eq(pieces.id, w.piece.id)).run();
    const slot = await bookFirstSlot(w);

    const item = technicianDay(w.tech, { date: slot.localDate }, NOW).items[0]!;
    expect(item.bring).toEqual([expect.objectContaining({ productId: w.product.id, surface: "top", amountFor: "top", amount: null })]);
    expect(item.cautions.map((c) => c.text).join(" ")).toMatch(/metal can, cover them with water/);
  });
});
