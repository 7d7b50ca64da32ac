// Claims per 100 pieces by species, finish class and resin over a period, and its CSV. The studio is in
// America/New_York; the period 2026-01-01…2026-06-30. Hand counts beside the expectations. Invented data.
import Papa from "papaparse";
import { beforeAll, describe, expect, it } from "vitest";
import { ZodError } from "zod";
import { getDb } from "@/db/client";
import { claims, finishLayers, type Studio } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import type { ClaimCategory } from "@/lib/care/vocabulary";
import { AppError } from "@/lib/errors";
import { claimRates, claimRatesCsv, per100, reportList } from "@/lib/reports";
import { claimRatesQuerySchema, reportListQuerySchema } from "@/lib/reports/query";
import { createPiece, createStudio, createUser, memberContext } from "../support/fixtures";

const NOW = new Date("2026-07-20T16:00:00Z");
const PERIOD = { from: "2026-01-01", to: "2026-06-30" };
let studio: Studio;
let staff: StudioContext;

beforeAll(async () => {
  studio = createStudio({ timeZone: "America/New_York" });
  staff = await memberContext(studio, "staff");
  const owner = await createUser();
  const db = getDb();
  const claim = (pieceId: string, category: ClaimCategory, createdAt: string) =>
    db.insert(claims).values({ studioId: studio.id, pieceId, ownerId: owner.id, category, noticedOn: createdAt.slice(0, 10), description: "Invented.", answers: {}, createdAt: new Date(createdAt) }).run();
  const layer = (pieceId: string, finishClass: "ceramic_topcoat" | "film_finish") =>
    db.insert(finishLayers).values({ studioId: studio.id, pieceId, surface: "top", position: 1, finishClass, coats: 1, appliedOn: "2025-01-01" }).run();

  // Every piece has a hardwax-oil top layer (createPiece).
  const a1 = createPiece(studio, { primarySpeciesId: "black_walnut", resinKind: "deep_pour", deliveredOn: "2025-05-01" }).piece; // + ceramic topcoat
  layer(a1.id, "ceramic_topcoat");
  const a2 = createPiece(studio, { primarySpeciesId: "black_walnut", deliveredOn: "2025-08-01" }).piece;
  const a3 = createPiece(studio, { primarySpeciesId: "white_oak", deliveredOn: "2026-02-01" }).piece; // + film finish
  layer(a3.id, "film_finish");
  createPiece(studio, { primarySpeciesId: "white_oak", resinKind: "tabletop_coat", deliveredOn: "2026-07-15" }); // A4 after the period: not counted
  const a5 = createPiece(studio, { primarySpeciesId: "black_cherry", deliveredOn: "2025-01-01", archivedAt: new Date() }).piece; // archived
  createPiece(studio, { primarySpeciesId: "white_oak", deliveredOn: "2025-01-01" }); // A6, no claims

  claim(a1.id, "finish_wear", "2026-02-10T15:00:00Z"); // K1
  claim(a1.id, "crack_gap", "2026-03-10T15:00:00Z"); // K2
  claim(a2.id, "crack_gap", "2025-12-31T15:00:00Z"); // K3 before the period
  claim(a3.id, "finish_peeling", "2026-07-01T03:30:00Z"); // K4: 2026-06-30 23:30 EDT, inside
  claim(a3.id, "finish_peeling", "2026-07-01T05:00:00Z"); // K5: 2026-07-01 01:00 EDT, outside
  claim(a5.id, "crack_gap", "2026-03-01T15:00:00Z"); // K6 on an archived piece
});

const byKey = (rows: { key: string; pieces: number; claims: number; per100: number | null }[]) => Object.fromEntries(rows.map((r) => [r.key, [r.pieces, r.claims, r.per100]]));

describe("claims per 100 pieces", () => {
  it("by species, finish class and resin (hand-counted)", () => {
    const r = claimRates(staff, claimRatesQuerySchema.parse(PERIOD), NOW);
    // Pieces delivered by 2026-06-30, not archived: A1 A2 A3 A6 = 4. Claims in the period on them: K1 K2 K4 = 3.
    expect([r.totalPieces, r.totalClaims]).toEqual([4, 3]);
    // Walnut A1 A2: 2 claims / 2 pieces = 100.0; white oak A3 A6: 1 / 2 = 50.0.
    expect(byKey(r.bySpecies)).toEqual({ black_walnut: [2, 2, 100], white_oak: [2, 1, 50] });
    expect(r.bySpecies.map((x) => x.label)).toEqual(["Black walnut", "White oak"]);
    // Hardwax oil all 4: 3 / 4 = 75.0; ceramic A1: 2 / 1 = 200.0; film A3: 1 / 1 = 100.0.
    expect(byKey(r.byFinishClass)).toEqual({ hardwax_oil: [4, 3, 75], ceramic_topcoat: [1, 2, 200], film_finish: [1, 1, 100] });
    // Deep pour A1: 2 / 1 = 200.0; none A2 A3 A6: 1 / 3 = 33.3; tabletop coat only on A4 (after the period): no row.
    expect(byKey(r.byResin)).toEqual({ none: [3, 1, 33.3], deep_pour: [1, 2, 200] });
  });

  it("one kind of claim only", () => {
    const r = claimRates(staff, claimRatesQuerySchema.parse({ ...PERIOD, category: "crack_gap" }), NOW);
    // Only K2 (K3 before the period, K6 archived): walnut 1 / 2 = 50.0, white oak 0 / 2 = 0.
    expect(byKey(r.bySpecies)).toEqual({ black_walnut: [2, 1, 50], white_oak: [2, 0, 0] });
    expect(r.totalClaims).toBe(1);
  });

  it("defaults to the 365 days up to today", () => {
    const r = claimRates(staff, claimRatesQuerySchema.parse({}), NOW);
    expect([r.from, r.to]).toEqual(["2025-07-21", "2026-07-20"]);
    // A4 is delivered by 07-20 now; K3 (2025-12-31), K4 and K5 fall in: walnut 3 claims on 2, oak 2 on 3 (A3 A4 A6).
    expect(byKey(r.bySpecies).white_oak).toEqual([3, 2, 66.7]);
    expect(byKey(r.bySpecies).black_walnut).toEqual([2, 3, 150]);
  });

  it("exports the same figures as CSV", () => {
    const { csv } = claimRatesCsv(staff, claimRatesQuerySchema.parse(PERIOD), NOW);
    const parsed = Papa.parse<Record<string, string>>(csv, { header: true, skipEmptyLines: true });
    expect(parsed.errors).toEqual([]);
    expect(parsed.meta.fields).toEqual(["dimension", "group", "pieces", "claims", "claims_per_100_pieces", "from", "to", "claim_kind"]);
    expect(parsed.data).toHaveLength(2 + 3 + 2);
    expect(parsed.data.find((d) => d.group === "Deep-pour casting")).toEqual({ dimension: "resin", group: "Deep-pour casting", pieces: "1", claims: "2", claims_per_100_pieces: "200", from: "2026-01-01", to: "2026-06-30", claim_kind: "all" });
  });

  it("refuses a backwards period and unknown kinds, and technicians", async () => {
    expect(() => claimRates(staff, claimRatesQuerySchema.parse({ from: "2026-06-30", to: "2026-01-01" }), NOW)).toThrow(ZodError);
    expect(() => claimRates(staff, claimRatesQuerySchema.parse({ category: "termites" }), NOW)).toThrow(ZodError);
    expect(() => claimRates(staff, claimRatesQuerySchema.parse({ from: "2026-02-30" }), NOW)).toThrow(ZodError);
    const tech = await memberContext(studio, "technician");
    expect(() => claimRates(tech, claimRatesQuerySchema.parse(PERIOD), NOW)).toThrow(AppError);
  });

  it("another studio's report is empty", async () => {
    const other = await memberContext(createStudio(), "admin");
    const r = claimRates(other, claimRatesQuerySchema.parse(PERIOD), NOW);
    expect([r.totalPieces, r.totalClaims, r.bySpecies.length]).toEqual([0, 0, 0]);
    expect(reportList(other, "answers", reportListQuerySchema.parse({}), NOW).rows).toEqual([]);
  });

  it("per100 rounds to one decimal and has no rate without pieces", () => {
    expect(per100(1, 3)).toBe(33.3);
    expect(per100(2, 3)).toBe(66.7);
    expect(per100(0, 0)).toBeNull();
  });

  it("the report lists: unknown names are a 404", () => {
    try {
      reportList(staff, "secrets", reportListQuerySchema.parse({}), NOW);
      throw new Error("expected a 404");
    } catch (e) {
      expect((e as AppError).status).toBe(404);
    }
  });
});
