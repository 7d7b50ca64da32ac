// The demo's (invented) quotes read right: the island's film-finish inspection proposes no product (an
// inspection uses none: common practice, no published source; lib/repairs/pricing taskUsesProduct), and
// the desk's re-wax visit is priced on the waxed top and legs both, so the technician's "What to bring"
// names the base beside the top instead of saying "on this top" alone.
import { and, eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { pieces, repairJobs, studios, visits } from "@/db/schema";
import { localDate } from "@/lib/care/dates";
import { readLines } from "@/lib/repairs/lines";
import { technicianDay } from "@/lib/visits/technician-day";
import { memberContextOf, seededDemoStudio } from "../support/demo-studio";

let studio: typeof studios.$inferSelect;

beforeAll(async () => {
  studio = await seededDemoStudio();
}, 60_000);

const jobOn = (pieceTitle: string, title: string) =>
  getDb()
    .select({ job: repairJobs })
    .from(repairJobs)
    .innerJoin(pieces, eq(pieces.id, repairJobs.pieceId))
    .where(and(eq(repairJobs.studioId, studio.id), eq(pieces.title, pieceTitle), eq(repairJobs.title, title)))
    .get()!.job;

describe("the demo's quotes", () => {
  it("the island's film-finish inspection proposes labour and travel, no tin of varnish", () => {
    const job = jobOn("White oak kitchen island top", "Inspect the island's film finish");
    expect(job.quoteInput.tasks).toEqual(["film_inspect"]);
    expect(job.quoteInput.productIds).toEqual([]);
    // Before: a 1 L tin of the demo's conversion varnish was proposed beside the inspection's hours.
    expect(readLines(job.lines).map((l) => l.kind)).toEqual(["labour", "travel"]);
  });

  it("the desk's re-wax visit prices the top and the legs, and the technician's sheet names both", () => {
    const job = jobOn("Cherry writing desk", "Re-wax the desk legs and top");
    // Re-wax labour: 0.25 h + 0.5 h/m² (lib/care/quote DEFAULT_LABOUR, invented for the demo — common practice, no
    // published source), quarter hours rounded up. Top 1,500 × 700 mm = 1.05 m²: 0.775 → 1 h. Base as typed, 0.5 m²: 0.5 h.
    expect(readLines(job.lines).filter((l) => l.kind === "labour").map((l) => [l.description, l.quantity])).toEqual([
      ["Re-wax — top", 1],
      ["Re-wax — base", 0.5],
    ]);
    const visit = getDb().select().from(visits).where(eq(visits.jobId, job.id)).get()!;
    const ctx = memberContextOf(studio, visit.technicianId);
    const day = technicianDay(ctx, { date: localDate(visit.startAt.getTime(), studio.timeZone) });
    const item = day.items.find((i) => i.job.id === job.id)!;
    // Before: amountFor "top" alone ("for 1 coat on this top"), the legs left out.
    expect(item.bring.map((b) => [b.amountFor, b.alsoFor, b.unsized])).toEqual([["top", ["base"], []]]);
    // Wax for (1.05 + 0.5) m² × 1 coat (lib/care/quantity.ts).
    expect(item.bring[0]!.amount?.areaM2).toBeCloseTo(1.55, 6);
  });
});
