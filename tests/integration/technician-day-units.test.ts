// The technician's "What to bring" in the studio's units, from the engine's exact amount: the amount
// is rounded once, for display, and the containers to open are written in the studio's units.
// 1 US fl oz = 29.5735295625 mL exactly (NIST Handbook 44, Appendix C); figures worked by hand below.
// Real SQLite file.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { finishProducts, studios } from "@/db/schema";
import { formatVolume } from "@/lib/format";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { technicianDay } from "@/lib/visits/technician-day";
import { staffActor, visitWorld } from "./visits-helpers";

const NOW = Date.parse("2027-05-03T12:00:00Z"); // Monday 3 May 2027, 08:00 in New York

describe("technician's day: what to bring", () => {
  it("carries the exact amount and writes containers in an imperial studio's units", async () => {
    const w = await visitWorld();
    // 2000 × 900 mm top = 1.8 m²; one coat at 61.5 m²/L = 1.8 / 61.5 L = 29.268 mL exact.
    getDb().update(finishProducts).set({ coverageM2PerL: 61.5 }).where(eq(finishProducts.id, w.product.id)).run();
    getDb().update(studios).set({ unitSystem: "imperial" }).where(eq(studios.id, w.studio.id)).run();
    const tech = { ...w.tech, studio: { ...w.tech.studio, unitSystem: "imperial" as const } };
    const slot = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-03T12:00:00Z", to: "2027-05-05T00:00:00Z" }, NOW).slots[0]!;
    await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW);

    const bring = technicianDay(tech, { date: slot.localDate }, NOW).items[0]!.bring[0]!;
    expect(bring.exactMl).toBeCloseTo(29.2683, 4);
    expect(bring.ml).toBe(30);
    // The page writes formatVolume(exactMl): 29.268 mL = 0.98968 fl oz → 1 fl oz; from the rounded
    // 30 mL it would have read 1.01442 → 1.1 fl oz.
    expect(formatVolume(bring.exactMl, "imperial")).toBe("1 US fl oz (30 mL)");
    // One 125 mL container (createProduct's size): 125 mL = 4.2268 fl oz → 4.3.
    expect(bring.containers).toBe("1 × 4.3 US fl oz (125 mL)");
  });
});
