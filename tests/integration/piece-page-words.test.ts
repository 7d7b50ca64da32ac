// The staff piece page's care schedule in words (app/studio/pieces/[id]/page.tsx): the loader's schedule
// (getPieceDetail) run through whyNow and howWorkedOut, as the page renders them under each task and its
// "How this was worked out". People read these: dates through lib/format, no ISO dates, no enum values,
// and none of the source labels the code keeps beside its numbers.
import { describe, expect, it } from "vitest";
import { createCatalogProduct } from "@/lib/catalog";
import { formatDate } from "@/lib/format";
import { createPiece, getPieceDetail } from "@/lib/pieces/registry";
import { howWorkedOut, whyNow } from "@/lib/reminders/content";
import { createPieceSchema, layerSchema } from "@/lib/validation/pieces";
import { addLayer } from "@/lib/pieces/layers";
import { createStudio, memberContext } from "../support/fixtures";

const MACHINE = /\d{4}-\d{2}-\d{2}|from memory|common practice|no published source|\b(hardwax_oil|ceramic_topcoat|whole_piece|care_log)\b|\bmo\b|×/;

describe("staff piece page: how each care date was worked out", () => {
  it("says where the interval came from, what sun and the topcoat did, and how overdue, in words", async () => {
    const studio = createStudio();
    const ctx = await memberContext(studio, "staff");
    const { piece } = createPiece(ctx, createPieceSchema.parse({
      kind: "dining_table",
      title: "Oak table (invented)",
      shapeKind: "rectangle",
      lengthMm: 2000,
      widthMm: 900,
      primarySpeciesId: "white_oak",
      use: "heavy",
      sun: "direct",
      deliveredOn: "2025-05-01",
      layers: [
        { surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2025-04-28" },
        { surface: "top", finishClass: "ceramic_topcoat", coats: 1, appliedOn: "2025-04-30" },
        { surface: "base", finishClass: "hardwax_oil", coats: 1, appliedOn: "2025-04-28" },
      ],
    }));
    // A fixed day long after every due date: every task is overdue whatever today is.
    const detail = getPieceDetail(ctx, piece.id, new Date("2030-01-15T12:00:00Z"));
    const tasks = detail.schedule!.tasks;
    expect(tasks.map((t) => t.kind).sort()).toEqual(["annual_check", "reoil", "topcoat_refresh"]);

    for (const t of tasks) {
      const shown = [...whyNow(t, { use: "heavy", sun: "direct" }, "studio"), ...howWorkedOut(t)];
      for (const line of shown) expect(line, `${t.key}: ${line}`).not.toMatch(MACHINE);
      // The studio's page speaks of the piece, not to its owner ("Your piece was delivered…" was shown to staff).
      for (const line of shown) expect(line, `${t.key}: ${line}`).not.toMatch(/\byour\b/i);
      // The engine's own notation keeps its ISO dates for the API and the tests, but no source labels.
      expect(t.reasons.join(" ")).not.toMatch(/from memory|common practice|no published source/);
    }

    const topcoat = howWorkedOut(tasks.find((t) => t.kind === "topcoat_refresh")!);
    expect(topcoat[0]).toMatch(/^The interval, \d+ months for heavy use, is our usual one for ceramic-type topcoat over oil\.$/);
    expect(topcoat.some((l) => /^Direct sun shortens it to \d+ months( and \d+ days)?\.$/.test(l))).toBe(true);
    expect(topcoat.some((l) => l.startsWith("The hardwax oil beneath is protected by the topcoat"))).toBe(true);
    expect(topcoat).toContain(`Counted from 30 April 2025 (when the layer went on), it falls due on ${formatDate(tasks.find((t) => t.kind === "topcoat_refresh")!.dueOn)}.`);
    expect(topcoat.at(-1)).toMatch(/^It is \d+ days overdue\.$/);

    const annual = tasks.find((t) => t.kind === "annual_check")!;
    expect(whyNow(annual, { use: "heavy", sun: "direct" }, "studio")[0]).toMatch(/^The piece was delivered on 1 May 2025; /);
    expect(whyNow(annual, { use: "heavy", sun: "direct" })[0]).toMatch(/^Your piece was delivered on 1 May 2025; /);
    const check = howWorkedOut(tasks.find((t) => t.kind === "annual_check")!);
    expect(check[0]).toBe("A clean and check every 12 months is our usual interval for every piece.");
    expect(check).toContain("Counted from 1 May 2025 (delivery), it falls due on 1 May 2026.");
  });

  it("names the studio's catalog product when its interval set the date", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const p = createCatalogProduct(admin, { name: "Test oil (invented)", finishClass: "hardwax_oil", coverageM2PerL: 24, containers: [{ ml: 250, priceMinor: 1900 }], intervalHeavyMonths: null, intervalModerateMonths: 20, intervalLightMonths: null });
    const { piece } = createPiece(admin, createPieceSchema.parse({ kind: "desk", title: "Desk (invented)", shapeKind: "rectangle", lengthMm: 1200, widthMm: 600, primarySpeciesId: "white_ash", use: "moderate", deliveredOn: "2025-01-10" }));
    addLayer(admin, piece.id, layerSchema.parse({ surface: "top", finishClass: "hardwax_oil", productId: p.id, coats: 2, appliedOn: "2025-01-10" }));
    const reoil = getPieceDetail(admin, piece.id, new Date("2025-02-01T12:00:00Z")).schedule!.tasks.find((t) => t.kind === "reoil")!;
    expect(howWorkedOut(reoil)).toEqual([
      "The interval, 20 months for moderate use, comes from the studio's catalog product Test oil (invented).",
      "Counted from 10 January 2025 (when the layer went on), it falls due on 10 September 2026.",
    ]);
  });
});

