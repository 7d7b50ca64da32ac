// Units follow the reader: CSV import in inches beside millimetres and sizes
// implausible for the piece's kind; the owner's units default from their first studio; paper size.
// 1 in = 25.4 mm exactly (NIST Handbook 44, Appendix C). Against a real SQLite file.
import path from "node:path";
import { eq } from "drizzle-orm";
import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { pieces, users } from "@/db/schema";
import { certificatePdf } from "@/lib/owner/certificate";
import { updatePreferences } from "@/lib/owner/preferences";
import { registerPiece } from "@/lib/owner/registration";
import { importPiecesCsv, parseInches } from "@/lib/pieces/csv";
import { createPiece, createStudio, createUser, memberContext } from "../support/fixtures";

const HEADER = "title,kind,shape,length_mm,width_mm,length_in,width_in,thickness_in,diameter_mm,area_ft2,primary_species,use,delivered_on,finish_stack";

describe("CSV import units", () => {
  it("reads inches as a woodworker writes them", () => {
    expect(parseInches("96")).toBe(96);
    expect(parseInches("37 5/8")).toBe(37.625);
    expect(parseInches("37-5/8 in")).toBe(37.625);
    expect(parseInches('2"')).toBe(2);
    expect(parseInches("5/8")).toBe(0.625);
    expect(parseInches("")).toBeNull();
    expect(parseInches("about a yard")).toBe("about a yard");
  });

  it("accepts length_in, width_in, thickness_in and area_ft2 and stores millimetres and m²", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    const csv = [
      HEADER,
      // 96 in = 2438.4 mm → 2438; 37 5/8 in = 955.675 mm → 956; 2 in = 50.8 → 51.
      "Inch table (invented),dining_table,rectangle,,,96,37 5/8,2,,,black walnut,heavy,2024-05-01,top:hardwax_oil:2:2024-04-28",
      // 21.5 ft² = 21.5 × 0.09290304 m² = 1.99741536 → 1.9974 m².
      "Measured slab (invented),coffee_table,measured,,,,,,,21.5,black walnut,moderate,2024-05-01,top:hardwax_oil:2:2024-04-28",
    ].join("\n");
    const r = importPiecesCsv(ctx, { csv, commit: true });
    expect(r.errors).toEqual([]);
    expect(r.created).toBe(2);
    const rows = getDb().select().from(pieces).where(eq(pieces.studioId, studio.id)).all();
    expect(rows.find((p) => p.title === "Inch table (invented)")).toMatchObject({ lengthMm: 2438, widthMm: 956, thicknessMm: 51 });
    expect(rows.find((p) => p.title === "Measured slab (invented)")!.measuredAreaM2).toBeCloseTo(1.9974, 4);
  });

  it("refuses a dining table 96 mm long (inches typed as mm) with a per-row message, and mm and inches that disagree; writes nothing", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    const csv = [
      HEADER,
      "Fine table (invented),dining_table,rectangle,2400,1000,,,,,,black walnut,heavy,2024-05-01,top:hardwax_oil:2:2024-04-28",
      "Inches as mm (invented),dining_table,rectangle,96,38,,,,,,black walnut,heavy,2024-05-01,top:hardwax_oil:2:2024-04-28",
      "Two units (invented),desk,rectangle,1500,700,70,,,,,black walnut,moderate,2024-05-01,top:hardwax_oil:2:2024-04-28",
      "Huge shelf (invented),shelf,rectangle,12000,300,,,,,,black walnut,light,2024-05-01,top:hardwax_oil:2:2024-04-28",
    ].join("\n");
    const r = importPiecesCsv(ctx, { csv, commit: true });
    expect(r.committed).toBe(false);
    const byRow = (row: number) => r.errors.filter((e) => e.row === row);
    expect(byRow(2)).toEqual([]);
    expect(byRow(3)).toEqual([
      expect.objectContaining({ field: "length_mm", message: expect.stringContaining("A dining table 96 mm long is too small to be right") }),
      expect.objectContaining({ field: "width_mm", message: expect.stringContaining("put 38 in the width_in column instead (38 in = 965 mm)") }),
    ]);
    expect(byRow(3)[0]!.message).toContain("put 96 in the length_in column instead (96 in = 2,438 mm)");
    expect(byRow(4)).toEqual([expect.objectContaining({ field: "length_mm", message: expect.stringContaining("length_mm (1500) and length_in (70 = 1778 mm) disagree") })]);
    expect(byRow(5)).toEqual([expect.objectContaining({ field: "length_mm", message: expect.stringContaining("too large") })]);
    expect(getDb().select().from(pieces).where(eq(pieces.studioId, studio.id)).all()).toHaveLength(0);
  });
});

describe("the owner's units (item 12)", () => {
  it("default from the studio of the first piece registered, until the owner chooses; a later studio doesn't change them", async () => {
    const us = createStudio({ unitSystem: "imperial" });
    const eu = createStudio({ unitSystem: "metric" });
    const owner = await createUser({ emailVerifiedAt: new Date(), unitSystem: "metric" });
    const first = createPiece(us, {});
    await registerPiece(owner, { code: first.code }, "203.0.113.51");
    const units = () => getDb().select({ u: users.unitSystem }).from(users).where(eq(users.id, owner.id)).get()!.u;
    expect(units()).toBe("imperial");
    const second = createPiece(eu, {});
    await registerPiece(owner, { code: second.code }, "203.0.113.52");
    expect(units()).toBe("imperial");

    const chooser = await createUser({ emailVerifiedAt: new Date(), unitSystem: "metric" });
    updatePreferences(chooser, { unitSystem: "metric" });
    await registerPiece(chooser, { code: createPiece(us, {}).code }, "203.0.113.53");
    expect(getDb().select({ u: users.unitSystem }).from(users).where(eq(users.id, chooser.id)).get()!.u).toBe("metric");
  });

  it("the certificate is US Letter for imperial readers and A4 for metric ones", async () => {
    const studio = createStudio();
    for (const [unitSystem, size] of [["imperial", [612, 792]], ["metric", [595, 842]]] as const) {
      const me = await createUser({ emailVerifiedAt: new Date(), unitSystem });
      const { piece } = createPiece(studio, { ownerId: me.id });
      const { buffer } = await certificatePdf({ id: me.id, name: me.name, timeZone: "UTC", unitSystem }, piece.id, new Date("2026-03-15T12:00:00Z"));
      const doc = await getDocument({ data: new Uint8Array(buffer), useSystemFonts: false, isEvalSupported: false, standardFontDataUrl: path.resolve("node_modules/pdfjs-dist/standard_fonts") + "/" }).promise;
      const [, , w, h] = (await doc.getPage(1)).view;
      expect([Math.round(w!), Math.round(h!)]).toEqual(size);
    }
  });
});
