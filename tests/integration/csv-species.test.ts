// CSV import and ambiguous wood names: a trade name that can mean more than one wood
// is never mapped silently; its row is refused with the question and the values to write instead.
// Against a real SQLite file.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { pieces } from "@/db/schema";
import { importPiecesCsv } from "@/lib/pieces/csv";
import { createStudio, memberContext } from "../support/fixtures";

const HEADER = "title,kind,shape,length_mm,width_mm,primary_species,secondary_species,use,delivered_on,finish_stack";
const row = (title: string, primary: string, secondary = "") =>
  `${title},dining_table,rectangle,2000,900,${primary},${secondary},heavy,2024-05-01,top:hardwax_oil:2:2024-04-28`;

describe("CSV import: species names", () => {
  it("refuses hickory, red cedar, poplar and tulipwood per row, asking which wood and naming the values to write; writes nothing", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    const csv = [
      HEADER,
      row("Walnut table (invented)", "walnut"),
      row("Hickory table (invented)", "hickory"),
      row("Cedar table (invented)", "Red Cedar"),
      row("Poplar table (invented)", "poplar"),
      row("Tulipwood table (invented)", "tulipwood"),
      row("Oak and cedar table (invented)", "white oak", "cedar"),
    ].join("\n");
    const r = importPiecesCsv(ctx, { csv, commit: true });
    expect(r.committed).toBe(false);
    const byRow = (n: number) => r.errors.filter((e) => e.row === n);
    expect(byRow(2)).toEqual([]);

    // One message per refused cell (not also the schema's generic "Pick a species from the list.").
    expect(byRow(3)).toEqual([{ row: 3, field: "primary_species", message: expect.stringContaining("“Hickory” can mean a true hickory") }]);
    expect(byRow(3)[0]!.message).toContain("Write one of these in primary_species: true_hickory (Hickory (true hickories)) or pecan_hickory (Pecan hickory).");
    expect(byRow(4)).toEqual([{ row: 4, field: "primary_species", message: expect.stringContaining("western redcedar or eastern redcedar") }]);
    expect(byRow(4)[0]!.message).toContain("western_redcedar (Western redcedar) or eastern_redcedar (Eastern redcedar)");
    expect(byRow(5)).toEqual([{ row: 5, field: "primary_species", message: expect.stringContaining("If it is, write yellow_poplar (Yellow-poplar) in primary_species.") }]);
    expect(byRow(5)[0]!.message).toContain("true poplar or aspen");
    expect(byRow(6)).toEqual([{ row: 6, field: "primary_species", message: expect.stringContaining("Brazilian rosewood") }]);
    expect(byRow(7)).toEqual([{ row: 7, field: "secondary_species", message: expect.stringContaining("Write one of these in secondary_species:") }]);
    for (const n of [3, 4, 5, 6, 7]) expect(r.rows.find((x) => x.row === n)!.ok).toBe(false);
    expect(getDb().select().from(pieces).where(eq(pieces.studioId, studio.id)).all()).toHaveLength(0);
  });

  it("imports the woods once they are named: ids, common names and unambiguous aliases", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    const csv = [
      HEADER,
      row("Shagbark table (invented)", "true_hickory"),
      row("Pecan table (invented)", "pecan"),
      row("Bench top (invented)", "Western red cedar"),
      row("Tulip tree table (invented)", "tulip poplar", "black_walnut"),
    ].join("\n");
    const r = importPiecesCsv(ctx, { csv, commit: true });
    expect(r.errors).toEqual([]);
    expect(r.created).toBe(4);
    const rows = getDb().select().from(pieces).where(eq(pieces.studioId, studio.id)).all();
    const speciesOf = (t: string) => rows.find((p) => p.title === t)!;
    expect(speciesOf("Shagbark table (invented)").primarySpeciesId).toBe("true_hickory");
    expect(speciesOf("Pecan table (invented)").primarySpeciesId).toBe("pecan_hickory");
    expect(speciesOf("Bench top (invented)").primarySpeciesId).toBe("western_redcedar");
    expect(speciesOf("Tulip tree table (invented)")).toMatchObject({ primarySpeciesId: "yellow_poplar", secondarySpeciesId: "black_walnut" });
  });
});
