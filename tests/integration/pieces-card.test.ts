// The drawer card PDF, one per page and in sheets: real PDFs whose pages are checked from the outside —
// pdfinfo's page count and size, every word's box from `pdftotext -bbox` inside its page (and inside its
// card on a sheet), and the QR code decoded (jsqr) from the page rasterised with pdftoppm.
// Page sizes: 4 × 6 in index card = 288 × 432 pt; A6 = 105 × 148 mm and A4 = 210 × 297 mm (ISO 216:2007,
// "Writing paper and certain classes of printed matter — Trimmed sizes — A and B series", table 1, from
// memory); ANSI Letter = 8.5 × 11 in (ANSI/ASME Y14.1, size A, from memory). 1 in = 72 pt (ISO 32000-1:2008,
// 8.3.2.3, default user space unit); react-pdf writes A sizes as mm × 72 / 25.4, e.g. A6 297.64 × 419.53 pt.
import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import jsQR from "jsqr";
import { PNG } from "pngjs";
import sharp from "sharp";
import { afterAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { pieces, studios } from "@/db/schema";
import { localDate } from "@/lib/care/dates";
import { certificatePdf } from "@/lib/owner/certificate";
import { renderDrawerCard, renderDrawerCards, type CardLayout } from "@/lib/pieces/card";
import { CARE_RECORDS_BY, CODE_WHEN_PIECE_CHANGES_HANDS } from "@/lib/pieces/card-words";
import { createPiece, reissueRegistrationCode } from "@/lib/pieces/registry";
import { createPieceSchema } from "@/lib/validation/pieces";
import { storeImage } from "@/lib/storage";
import { createStudio, createUser, memberContext } from "../support/fixtures";

const APP_URL = process.env.APP_URL!;
const tmp = fs.mkdtempSync(path.join(os.tmpdir(), "gw-card-test-"));
afterAll(() => fs.rmSync(tmp, { recursive: true, force: true }));
let files = 0;

type Word = { text: string; xMin: number; yMin: number; xMax: number; yMax: number };
type PdfPage = { width: number; height: number; words: Word[] };

/** Every page's size and words with their boxes, as poppler reads them (origin top left, points). */
function readPdf(pdf: Buffer): { file: string; pages: PdfPage[]; text: string } {
  const file = path.join(tmp, `card-${++files}.pdf`);
  fs.writeFileSync(file, pdf);
  const html = execFileSync("pdftotext", ["-bbox", file, "-"], { encoding: "utf8" });
  const pages: PdfPage[] = [];
  for (const block of html.split("<page ").slice(1)) {
    const [, w, h] = block.match(/width="([\d.]+)" height="([\d.]+)"/)!;
    const words = [...block.matchAll(/<word xMin="([\d.-]+)" yMin="([\d.-]+)" xMax="([\d.-]+)" yMax="([\d.-]+)">([^<]*)<\/word>/g)].map((m) => ({
      xMin: Number(m[1]),
      yMin: Number(m[2]),
      xMax: Number(m[3]),
      yMax: Number(m[4]),
      text: m[5]!.replace(/&amp;/g, "&").replace(/&#39;/g, "'").replace(/&quot;/g, '"'),
    }));
    pages.push({ width: Number(w), height: Number(h), words });
  }
  const info = execFileSync("pdfinfo", [file], { encoding: "utf8" });
  expect(Number(info.match(/Pages:\s+(\d+)/)![1])).toBe(pages.length);
  return { file, pages, text: pages.map((p) => p.words.map((w) => w.text).join(" ")).join("\n") };
}

/** The words not wholly inside [x0, y0, x1, y1] (a page, or one card on a sheet). */
function outside(words: Word[], [x0, y0, x1, y1]: [number, number, number, number]): Word[] {
  return words.filter((w) => w.xMin < x0 - 0.01 || w.yMin < y0 - 0.01 || w.xMax > x1 + 0.01 || w.yMax > y1 + 0.01);
}

/** Page `n` (1-based) rasterised at `dpi`, the region [x0, y0, x1, y1] in points decoded as a QR code. */
const near = (got: number[], want: readonly number[]) => got.forEach((g, i) => expect(g).toBeCloseTo(want[i]!, 1));

function qrOf(file: string, n: number, dpi: number, region?: [number, number, number, number]): string | null {
  const out = path.join(tmp, `page-${++files}`);
  execFileSync("pdftoppm", ["-png", "-r", String(dpi), "-f", String(n), "-l", String(n), "-singlefile", file, out]);
  let img: PNG = PNG.sync.read(fs.readFileSync(`${out}.png`));
  if (region) {
    const k = dpi / 72;
    const [x, y] = [Math.floor(region[0] * k), Math.floor(region[1] * k)];
    const crop = new PNG({ width: Math.min(img.width - x, Math.ceil((region[2] - region[0]) * k)), height: Math.min(img.height - y, Math.ceil((region[3] - region[1]) * k)) });
    PNG.bitblt(img, crop, x, y, crop.width, crop.height, 0, 0);
    img = crop;
  }
  return jsQR(new Uint8ClampedArray(img.data.buffer, img.data.byteOffset, img.data.byteLength), img.width, img.height)?.data ?? null;
}

// A fixed print day: 3 December 2026, 03:00 UTC, which is still 2 December in the studio's zone.
const PRINTED = new Date("2026-12-03T03:00:00Z");
const ZONE = "America/Los_Angeles";

/** A piece whose card says as much as a card can: long names, four finishes, resin, curing, a schedule. */
function crowdedPiece(ctx: Awaited<ReturnType<typeof memberContext>>, title = "Bookmatched live-edge walnut river dining table with a waterfall end and a charred base (invented)") {
  return createPiece(ctx, createPieceSchema.parse({
    kind: "dining_table",
    title,
    shapeKind: "oval",
    lengthMm: 2400,
    widthMm: 1000,
    primarySpeciesId: "american_elm",
    use: "heavy",
    deliveredOn: "2026-11-28",
    resinKind: "deep_pour",
    layers: [
      { surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2026-11-25" },
      { surface: "top", finishClass: "ceramic_topcoat", coats: 1, appliedOn: "2026-11-26" },
      { surface: "base", finishClass: "charred_oiled", coats: 1, appliedOn: "2026-11-20" },
      { surface: "base", finishClass: "paste_wax", coats: 1, appliedOn: "2026-11-21" },
    ],
  }));
}

function plainPiece(ctx: Awaited<ReturnType<typeof memberContext>>, title: string) {
  return createPiece(ctx, createPieceSchema.parse({
    kind: "coffee_table",
    title,
    shapeKind: "rectangle",
    lengthMm: 1200,
    widthMm: 600,
    primarySpeciesId: "white_oak",
    use: "moderate",
    deliveredOn: "2024-05-01",
    layers: [{ surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2024-04-28" }],
  }));
}

async function studioWithStaff(name = "The Long-Named Riverside Workshop of Fine Furniture and Joinery (invented)") {
  const studio = createStudio({ name, timeZone: ZONE });
  return { studio, ctx: await memberContext(studio, "staff") };
}

describe("one drawer card per page", () => {
  for (const [size, pt] of [
    ["4x6", [288, 432]],
    ["a6", [297.64, 419.53]],
  ] as const) {
    it(`a crowded card fits one ${size === "4x6" ? "4 × 6 in (288 × 432 pt)" : "A6 (ISO 216, 105 × 148 mm)"} page: every word inside the page, the QR decodes to APP_URL/r/<code>`, async () => {
      const { ctx } = await studioWithStaff();
      const { piece, registrationCode } = crowdedPiece(ctx);
      const { pdf, filename } = await renderDrawerCard(ctx, piece.id, size, PRINTED);
      expect(pdf.subarray(0, 5).toString()).toBe("%PDF-");
      expect(filename).toMatch(/^drawer-card-bookmatched-live-edge-walnut/);
      const { file, pages, text } = readPdf(pdf);
      expect(pages).toHaveLength(1);
      near([pages[0]!.width, pages[0]!.height], pt);
      expect(outside(pages[0]!.words, [0, 0, pt[0], pt[1]])).toEqual([]);
      // The text a card must keep, however crowded.
      expect(text).toContain(registrationCode);
      expect(text).toMatch(/Oily rags can catch fire by themselves/);
      expect(text).toMatch(/still curing/);
      expect(text.replace(/\s+/g, " ")).toContain(CODE_WHEN_PIECE_CHANGES_HANDS);
      expect(text).toContain(CARE_RECORDS_BY);
      expect(text).not.toMatch(/same code/);
      expect(qrOf(file, 1, 200)).toBe(`${APP_URL}/r/${registrationCode}`);
    });
  }

  it("a single over-wide word (a title or studio name without spaces) is broken so every line stays inside the page, on the card and on a sheet", async () => {
    // 60+ characters without a space: wider than the card at any of its type sizes.
    const word = "Bookmatchedwalnutriverdiningtablewithawaterfallendandcharredbase";
    const { ctx } = await studioWithStaff("Riversideworkshopoffinefurnitureandjoineryandturnery(invented)");
    const { piece, registrationCode } = crowdedPiece(ctx, word);
    for (const size of ["4x6", "a6"] as const) {
      const { pdf } = await renderDrawerCard(ctx, piece.id, size, PRINTED);
      const { pages, file, text } = readPdf(pdf);
      expect(pages).toHaveLength(1);
      const [w, h] = [pages[0]!.width, pages[0]!.height];
      expect(outside(pages[0]!.words, [0, 0, w, h]), `${size}: words outside the page`).toEqual([]);
      // The title is still there, broken over its lines, not dropped.
      expect(text.replace(/[\s\u2026-]+/g, "")).toContain(word.slice(0, 40));
      expect(text).toContain(registrationCode);
      expect(qrOf(file, 1, 200)).toBe(`${APP_URL}/r/${registrationCode}`);
    }
    const sheet = readPdf((await renderDrawerCards(ctx, { ids: [piece.id] }, "letter", PRINTED)).pdf);
    const x0 = (612 - 2 * 288) / 2;
    const y0 = (792 - 432) / 2;
    expect(outside(sheet.pages[0]!.words, [x0, y0, x0 + 288, y0 + 432]), "letter sheet: words outside the card").toEqual([]);
  });

  it("an everyday card keeps its full type and its care basics", async () => {
    const { ctx } = await studioWithStaff("Small Shop (invented)");
    const { piece, registrationCode } = plainPiece(ctx, "Oak coffee table (invented)");
    const { pages, file, text } = readPdf((await renderDrawerCard(ctx, piece.id, "4x6", PRINTED)).pdf);
    expect(pages).toHaveLength(1);
    expect(outside(pages[0]!.words, [0, 0, 288, 432])).toEqual([]);
    expect(text).toMatch(/relative humidity/);
    expect(text).not.toMatch(/More care advice comes/);
    // The instruction says where to type the code, on lines inside the card.
    expect(text).toContain("localhost:3999/register");
    expect(qrOf(file, 1, 200)).toBe(`${APP_URL}/r/${registrationCode}`);
    // A reissued code is the one printed afterwards.
    const { registrationCode: fresh } = reissueRegistrationCode(ctx, piece.id);
    const again = readPdf((await renderDrawerCard(ctx, piece.id, "4x6", PRINTED)).pdf).text;
    expect(again).toContain(fresh);
    expect(again).not.toContain(registrationCode);
  });

  it("'Coming up' lists no date already past on the day the card is printed, in the studio's zone", async () => {
    const { ctx } = await studioWithStaff("Dates Shop (invented)");
    // Delivered 2024-05-01 and never cared for: its first re-oil and annual check are long overdue.
    const { piece } = plainPiece(ctx, "Overdue oak table (invented)");
    const { text } = readPdf((await renderDrawerCard(ctx, piece.id, "4x6", PRINTED)).pdf);
    const today = localDate(PRINTED, ZONE);
    expect(today).toBe("2026-12-02");
    const coming = text.slice(text.indexOf("Coming up"));
    const dates = [...coming.matchAll(/due (\d{1,2}) (\w+) (\d{4})/g)].map((m) => new Date(`${m[1]} ${m[2]} ${m[3]} UTC`).toISOString().slice(0, 10));
    for (const d of dates) expect(d >= today, `${d} is before the print day ${today}`).toBe(true);
    expect(text).not.toMatch(/due \d{1,2} \w+ 2025/);
  });

  it("shows the studio's logo and name when it has a logo, the name alone when not; Grainward's name stays small", async () => {
    const { studio, ctx } = await studioWithStaff("Logo Shop (invented)");
    const { piece } = plainPiece(ctx, "Logo table (invented)");
    const bare = await renderDrawerCard(ctx, piece.id, "4x6", PRINTED);
    expect(bare.pdf.toString("latin1")).not.toMatch(/\/Subtype\s*\/Image/);
    const logo = await sharp({ create: { width: 400, height: 120, channels: 3, background: "#6b4226" } }).png().toBuffer();
    const stored = await storeImage(new Uint8Array(logo), ctx.user.id);
    getDb().update(studios).set({ logoKey: stored.storageKey }).where(eq(studios.id, studio.id)).run();
    const branded = await renderDrawerCard({ ...ctx, studio: { ...studio, logoKey: stored.storageKey } }, piece.id, "4x6", PRINTED);
    expect(branded.pdf.toString("latin1")).toMatch(/\/Subtype\s*\/Image/);
    const { pages } = readPdf(branded.pdf);
    const name = pages[0]!.words.find((w) => w.text === "Logo")!;
    const grainward = pages[0]!.words.find((w) => w.text === "Grainward")!;
    expect(name.yMin).toBeLessThan(40); // at the top
    expect(grainward.yMax - grainward.yMin).toBeLessThan(name.yMax - name.yMin); // smaller than the studio's name
    expect(outside(pages[0]!.words, [0, 0, 288, 432])).toEqual([]);
  });
});

it("leaves the oily-rag and product cautions off a stack without oil that an owner never recoats", async () => {
  const { ctx } = await studioWithStaff("Varnish Shop (invented)");
  const { piece, registrationCode } = createPiece(ctx, createPieceSchema.parse({
    kind: "countertop",
    title: "Varnished top (invented)",
    shapeKind: "rectangle",
    lengthMm: 2000,
    widthMm: 600,
    primarySpeciesId: "white_oak",
    use: "heavy",
    deliveredOn: "2025-05-01",
    layers: [{ surface: "top", finishClass: "film_finish", coats: 3, appliedOn: "2025-04-28" }],
  }));
  const { text } = readPdf((await renderDrawerCard(ctx, piece.id, "4x6", PRINTED)).pdf);
  expect(text).toContain(registrationCode);
  expect(text).not.toMatch(/Oily rags/);
  // A film finish is inspected, not recoated at home: no product goes on, so no label caution either.
  expect(text).not.toMatch(/safety data sheet/);
  expect(text).toMatch(/lift with two people/);
});

it("the warranty certificate carries the studio's logo and name on top, and Grainward's name small", async () => {
  const { studio, ctx } = await studioWithStaff("Certificate Shop (invented)");
  const { piece } = plainPiece(ctx, "Certified table (invented)");
  const owner = await createUser({ name: "Cert Owner (invented)" });
  getDb().update(pieces).set({ ownerId: owner.id, registeredAt: PRINTED }).where(eq(pieces.id, piece.id)).run();
  const me = { id: owner.id, name: owner.name, timeZone: "UTC", unitSystem: "metric" as const };
  const bare = (await certificatePdf(me, piece.id, PRINTED)).buffer;
  expect(bare.toString("latin1")).not.toMatch(/\/Subtype\s*\/Image/);
  const logo = await sharp({ create: { width: 300, height: 90, channels: 3, background: "#3d5c2a" } }).jpeg().toBuffer();
  const stored = await storeImage(new Uint8Array(logo), ctx.user.id);
  getDb().update(studios).set({ logoKey: stored.storageKey }).where(eq(studios.id, studio.id)).run();
  const branded = await certificatePdf(me, piece.id, PRINTED);
  expect(branded.buffer.toString("latin1")).toMatch(/\/Subtype\s*\/Image/);
  const { pages } = readPdf(branded.buffer);
  const top = [...pages[0]!.words].sort((a, b) => a.yMin - b.yMin);
  expect(top.slice(0, 2).map((w) => w.text)).toEqual(["Certificate", "Shop"]);
  const name = top[0]!;
  const small = pages[0]!.words.find((w) => w.text === "Grainward")!;
  expect(small.yMax - small.yMin).toBeLessThan(name.yMax - name.yMin);
});

describe("drawer cards in bulk", () => {
  const sheets: [CardLayout, string, [number, number], [number, number], number, number][] = [
    // layout, name, page (pt), card (pt), columns, rows
    ["letter", "ANSI Letter 8.5 × 11 in (612 × 792 pt), two 4 × 6 in cards", [612, 792], [288, 432], 2, 1],
    ["a4", "ISO 216 A4 210 × 297 mm (595.28 × 841.89 pt), four A6 cards", [595.28, 841.89], [297.64, 419.53], 2, 2],
  ];
  for (const [layout, name, page, card, cols, rows] of sheets) {
    it(`${name}: every card's words inside its own card, cut marks, each QR decodes to its piece`, async () => {
      const { ctx } = await studioWithStaff();
      const made = [crowdedPiece(ctx), plainPiece(ctx, "Second table (invented)"), crowdedPiece(ctx, "Third (invented)"), plainPiece(ctx, "Fourth (invented)"), plainPiece(ctx, "Fifth (invented)")];
      const { pdf, count, filename } = await renderDrawerCards(ctx, { ids: made.map((m) => m.piece.id) }, layout, PRINTED);
      expect(count).toBe(5);
      expect(filename).toBe(`drawer-cards-5-${layout}-sheets.pdf`);
      const { file, pages } = readPdf(pdf);
      const perSheet = cols * rows;
      expect(pages).toHaveLength(Math.ceil(5 / perSheet));
      const x0 = (page[0] - cols * card[0]) / 2;
      const y0 = (page[1] - rows * card[1]) / 2;
      // Cut marks: vector strokes on each sheet.
      expect(pdf.toString("latin1")).toMatch(/\bS\b|\bs\b/);
      for (const [i, m] of made.entries()) {
        const p = Math.floor(i / perSheet);
        const slot = i % perSheet;
        const cell: [number, number, number, number] = [x0 + (slot % cols) * card[0], y0 + Math.floor(slot / cols) * card[1], 0, 0];
        cell[2] = cell[0] + card[0];
        cell[3] = cell[1] + card[1];
        const sheet = pages[p]!;
        near([sheet.width, sheet.height], page);
        const inCell = sheet.words.filter((w) => w.xMin >= cell[0] - 1 && w.xMin < cell[2] && w.yMin >= cell[1] - 1 && w.yMin < cell[3]);
        expect(inCell.map((w) => w.text)).toContain(m.registrationCode);
        expect(outside(inCell, cell)).toEqual([]);
        expect(qrOf(file, p + 1, 150, cell)).toBe(`${APP_URL}/r/${m.registrationCode}`);
      }
      for (const sheet of pages) expect(outside(sheet.words, [0, 0, page[0], page[1]])).toEqual([]);
    });
  }

  it("one card per page for a card printer (4 × 6 in and A6), in the order chosen", async () => {
    const { ctx } = await studioWithStaff();
    const made = [plainPiece(ctx, "First (invented)"), crowdedPiece(ctx), plainPiece(ctx, "Third (invented)")];
    for (const [layout, w, h] of [
      ["4x6", 288, 432],
      ["a6", 297.64, 419.53],
    ] as const) {
      const { file, pages } = readPdf((await renderDrawerCards(ctx, { ids: made.map((m) => m.piece.id) }, layout, PRINTED)).pdf);
      expect(pages).toHaveLength(3);
      for (const [i, p] of pages.entries()) {
        near([p.width, p.height], [w, h]);
        expect(outside(p.words, [0, 0, w, h])).toEqual([]);
        expect(p.words.map((x) => x.text)).toContain(made[i]!.registrationCode);
      }
      expect(qrOf(file, 2, 200)).toBe(`${APP_URL}/r/${made[1]!.registrationCode}`);
    }
  });

  it("'all not yet registered' prints this studio's unregistered, unarchived pieces only", async () => {
    const { ctx } = await studioWithStaff("Batch Shop (invented)");
    const waiting = plainPiece(ctx, "Waiting table (invented)");
    const owned = plainPiece(ctx, "Owned table (invented)");
    const archived = plainPiece(ctx, "Archived table (invented)");
    const owner = await createUser();
    getDb().update(pieces).set({ ownerId: owner.id, registeredAt: PRINTED }).where(eq(pieces.id, owned.piece.id)).run();
    getDb().update(pieces).set({ archivedAt: PRINTED }).where(eq(pieces.id, archived.piece.id)).run();
    const { ctx: other } = await studioWithStaff("Other Shop (invented)");
    const theirs = plainPiece(other, "Their table (invented)");
    const { pdf, count } = await renderDrawerCards(ctx, { unregistered: true }, "4x6", PRINTED);
    expect(count).toBe(1);
    const { text } = readPdf(pdf);
    expect(text).toContain(waiting.registrationCode);
    for (const not of [owned, archived, theirs]) expect(text).not.toContain(not.registrationCode);
  });

  it("another studio's piece among the ids is a 404 and nothing is rendered; an empty or too long list is a 422", async () => {
    const { ctx } = await studioWithStaff("Mine (invented)");
    const { ctx: other } = await studioWithStaff("Theirs (invented)");
    const mine = plainPiece(ctx, "Mine (invented)");
    const theirs = plainPiece(other, "Theirs (invented)");
    await expect(renderDrawerCards(ctx, { ids: [mine.piece.id, theirs.piece.id] }, "letter", PRINTED)).rejects.toMatchObject({ status: 404 });
    await expect(renderDrawerCards(ctx, { ids: [] }, "letter", PRINTED)).rejects.toMatchObject({ status: 422 });
    await expect(renderDrawerCards(ctx, { ids: Array.from({ length: 201 }, (_, i) => `x${i}`) }, "letter", PRINTED)).rejects.toMatchObject({ status: 422 });
    await expect(renderDrawerCard(ctx, theirs.piece.id, "4x6", PRINTED)).rejects.toMatchObject({ status: 404 });
  });
});
