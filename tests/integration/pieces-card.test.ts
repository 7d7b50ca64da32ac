// The drawer card PDF: a real PDF (parsed with pdfjs-dist) whose text carries the code and the care
// basics, and whose QR code (the embedded image, and the rasterized page) decodes to APP_URL/r/<code>.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import jsQR from "jsqr";
import { PNG } from "pngjs";
import { getDocument } from "pdfjs-dist/legacy/build/pdf.mjs";
import { describe, expect, it } from "vitest";
import { qrDataUrl, renderDrawerCard } from "@/lib/pieces/card";
import { createPiece, reissueRegistrationCode } from "@/lib/pieces/registry";
import { createStudio, memberContext } from "../support/fixtures";

async function pdfText(pdf: Buffer): Promise<{ text: string; pages: number; size: [number, number] }> {
  const doc = await getDocument({ data: new Uint8Array(pdf), useSystemFonts: false, isEvalSupported: false, standardFontDataUrl: path.resolve("node_modules/pdfjs-dist/standard_fonts") + "/" }).promise;
  let text = "";
  for (let i = 1; i <= doc.numPages; i++) {
    const page = await doc.getPage(i);
    const content = await page.getTextContent();
    text += content.items.map((it) => ("str" in it ? it.str : "")).join(" ") + "\n";
  }
  const first = await doc.getPage(1);
  const [, , w, h] = first.view;
  return { text: text.replace(/\s+/g, " "), pages: doc.numPages, size: [Math.round(w!), Math.round(h!)] };
}

function decodePng(png: Buffer): string | null {
  const img = PNG.sync.read(png);
  return jsQR(new Uint8ClampedArray(img.data.buffer, img.data.byteOffset, img.data.byteLength), img.width, img.height)?.data ?? null;
}

const APP_URL = process.env.APP_URL!;

describe("drawer card", () => {
  it("is a PDF with the studio, title, code, care basics and oily-rag caution; its QR decodes to APP_URL/r/<code>", async () => {
    const studio = createStudio({ name: "Card Test Studio (invented)" });
    const ctx = await memberContext(studio, "staff");
    const { piece, registrationCode } = createPiece(ctx, {
      kind: "dining_table",
      title: "Oiled elm table (invented)",
      shapeKind: "oval",
      lengthMm: 2000,
      widthMm: 1000,
      primarySpeciesId: "american_elm",
      use: "heavy",
      deliveredOn: "2025-05-01",
      resinKind: "deep_pour",
      layers: [
        { surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2025-04-28" },
        { surface: "top", finishClass: "ceramic_topcoat", coats: 1, appliedOn: "2025-04-29" },
        { surface: "base", finishClass: "hardwax_oil", coats: 1, appliedOn: "2025-04-28" },
      ],
    });
    const { pdf, filename } = await renderDrawerCard(ctx, piece.id);
    expect(pdf.subarray(0, 5).toString()).toBe("%PDF-");
    expect(filename).toBe("drawer-card-oiled-elm-table-invented.pdf");
    const { text, size, pages } = await pdfText(pdf);
    expect(size).toEqual([288, 432]); // 4 × 6 in
    expect(text).toContain(registrationCode);
    expect(registrationCode).toMatch(/^.{4}-.{4}-.{4}-.$/);
    expect(text).toContain("Card Test Studio (invented)".toUpperCase());
    expect(text).toContain("Oiled elm table (invented)");
    expect(text).toMatch(/Oily rags can catch fire by themselves/);
    expect(text).toMatch(/closed metal can of water with a little detergent/);
    expect(pages).toBe(1);
    expect(text).toMatch(/Keep hot mugs, pans, laptops and heaters off and away from the resin/);
    expect(text).toMatch(/safety data sheet/);
    expect(text).toMatch(/relative humidity/); // an indoor piece keeps its room-climate line

    const expected = `${APP_URL}/r/${registrationCode}`;
    const dataUrl = await qrDataUrl(registrationCode);
    expect(decodePng(Buffer.from(dataUrl.split(",")[1]!, "base64"))).toBe(expected);

    // And the printed page itself: rasterize with poppler and decode the QR from the pixels.
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "gw-card-"));
    try {
      fs.writeFileSync(path.join(dir, "card.pdf"), pdf);
      execFileSync("pdftoppm", ["-png", "-r", "200", "-singlefile", path.join(dir, "card.pdf"), path.join(dir, "page")]);
      expect(decodePng(fs.readFileSync(path.join(dir, "page.png")))).toBe(expected);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }

    // A6 variant, and a reissued code is the one printed afterwards.
    const a6 = await pdfText((await renderDrawerCard(ctx, piece.id, "a6")).pdf);
    expect(a6.size).toEqual([298, 420]);
    const { registrationCode: fresh } = reissueRegistrationCode(ctx, piece.id);
    const again = await pdfText((await renderDrawerCard(ctx, piece.id)).pdf);
    expect(again.text).toContain(fresh);
    expect(again.text).not.toContain(registrationCode);
  });

  it("leaves the oily-rag and product cautions off a stack without oil that an owner never recoats", async () => {
    const ctx = await memberContext(createStudio(), "staff");
    const { piece, registrationCode } = createPiece(ctx, {
      kind: "countertop",
      title: "Varnished top (invented)",
      shapeKind: "rectangle",
      lengthMm: 2000,
      widthMm: 600,
      primarySpeciesId: "white_oak",
      use: "heavy",
      deliveredOn: "2025-05-01",
      layers: [{ surface: "top", finishClass: "film_finish", coats: 3, appliedOn: "2025-04-28" }],
    });
    const { text } = await pdfText((await renderDrawerCard(ctx, piece.id)).pdf);
    expect(text).toContain(registrationCode);
    expect(text).not.toMatch(/Oily rags/);
    // A film finish is inspected, not recoated at home: no product goes on, so no label caution either.
    expect(text).not.toMatch(/safety data sheet/);
    expect(text).toMatch(/lift with two people/);
  });
});
