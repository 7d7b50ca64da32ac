// The demo studio. Everything here is invented: the studio, the town, the people,
// the pieces and the product names. Dates are relative to the day the seed runs, so the demo always
// has care coming due.
import { hashPassword } from "@/lib/auth/password";
import type { FinishClass, PieceKind, ResinKind, ShapeKind, SunExposure, Surface, Use } from "@/lib/care/vocabulary";
import { newRegistrationCode } from "@/lib/pieces/registration";
import { seedCareLog } from "./care-log";
import { indexPiece } from "@/lib/pieces/search-index";
import type { Db } from "../client";
import { seedJobs } from "./jobs";
import { seedVisits } from "./visits";
import { seedClaims } from "./claims";
import { seedAftercareHistory } from "./aftercare-history";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { linkOwnersToClients } from "@/lib/clients/link";
import { finishLayers, finishProducts, memberships, ownerships, pieces, studios, users, warrantyPolicies, type ContainerSize } from "../schema";
import { seedPlans } from "./plans";

export const DEMO_PASSWORD = "grainward-demo";
export const DEMO_STUDIO_SLUG = "larchmere";

export const DEMO_ACCOUNTS = {
  maren: { email: "maren@larchmere.example", name: "Maren Okafor", role: "admin" },
  teo: { email: "teo@larchmere.example", name: "Teo Lindqvist", role: "staff" },
  ines: { email: "ines@larchmere.example", name: "Ines Varga", role: "technician" },
  holloway: { email: "holloway@owners.example", name: "The Holloway household", role: "owner" },
  jonah: { email: "jonah@owners.example", name: "Jonah Reyes", role: "owner" },
} as const;

type ProductKey = "oil" | "ceramic" | "wax" | "varnish" | "waterPoly" | "epoxyPolish" | "exteriorOil";

// Invented catalog. Coverage figures are typical label values, from memory; the ceramic-type topcoat's
// 2 ft²/mL (≈186 m²/L) is common practice, no published source.
const PRODUCTS: Record<ProductKey, { name: string; finishClass: FinishClass; coverageM2PerL: number; containers: ContainerSize[] }> = {
  oil: { name: "Studio hardwax oil, satin", finishClass: "hardwax_oil", coverageM2PerL: 24, containers: [{ ml: 125, priceMinor: 1900 }, { ml: 750, priceMinor: 5600 }] },
  ceramic: { name: "Ceramic-type topcoat, matte", finishClass: "ceramic_topcoat", coverageM2PerL: 186, containers: [{ ml: 50, priceMinor: 3400 }, { ml: 100, priceMinor: 5900 }] },
  wax: { name: "Clear paste wax", finishClass: "paste_wax", coverageM2PerL: 20, containers: [{ ml: 200, priceMinor: 1600 }] },
  varnish: { name: "Conversion varnish, satin", finishClass: "film_finish", coverageM2PerL: 10, containers: [{ ml: 1000, priceMinor: 6400 }] },
  waterPoly: { name: "Water-based polyurethane, satin", finishClass: "film_finish", coverageM2PerL: 12, containers: [{ ml: 946, priceMinor: 3900 }] },
  epoxyPolish: { name: "Resin polishing compound", finishClass: "epoxy_surface", coverageM2PerL: 30, containers: [{ ml: 250, priceMinor: 2400 }] },
  exteriorOil: { name: "Exterior penetrating oil", finishClass: "charred_oiled", coverageM2PerL: 12, containers: [{ ml: 1000, priceMinor: 4200 }] },
};

type LayerSpec = { surface: Surface; product: ProductKey; coats: number; monthsAgo: number; by?: "teo" | "ines" | "maren"; lot?: string; notes?: string };
type PieceSpec = {
  title: string;
  kind: PieceKind;
  shape: { kind: ShapeKind; lengthMm?: number; widthMm?: number; diameterMm?: number; areaM2?: number };
  thicknessMm: number;
  primary: string;
  secondary?: string;
  resin?: { kind: ResinKind; volumeMl: number; tint: string };
  base: [string, string];
  use: Use;
  sun: SunExposure;
  deliveredMonthsAgo: number;
  /** Moves the delivery and every layer this many days earlier, so some care falls due within weeks. */
  daysEarlier?: number;
  owner?: "holloway" | "jonah";
  address: string;
  notes?: string;
  layers: LayerSpec[];
};

const PIECES: PieceSpec[] = [
  {
    title: "Walnut river dining table", kind: "dining_table", shape: { kind: "rectangle", lengthMm: 2440, widthMm: 1020 }, thicknessMm: 50,
    primary: "black_walnut", resin: { kind: "deep_pour", volumeMl: 18000, tint: "clear" }, base: ["blackened steel trestle", "powder coat"],
    use: "heavy", sun: "indirect", deliveredMonthsAgo: 26, owner: "holloway", address: "14 Quarry Lane, Port Alder",
    notes: "Slab pair from one log; resin poured in two lifts.",
    layers: [
      { surface: "top", product: "oil", coats: 2, monthsAgo: 26, by: "teo", lot: "HO-2211" },
      { surface: "top", product: "ceramic", coats: 1, monthsAgo: 26, by: "teo", lot: "CT-0940" },
      { surface: "top", product: "ceramic", coats: 1, monthsAgo: 13, by: "ines", notes: "Refresh at the owner's home." },
      { surface: "base", product: "oil", coats: 1, monthsAgo: 26, by: "teo" },
    ],
  },
  {
    title: "White oak kitchen island top", kind: "countertop", shape: { kind: "rectangle", lengthMm: 2800, widthMm: 1100 }, thicknessMm: 45,
    primary: "white_oak", base: ["cabinetry by others", "—"], use: "heavy", sun: "direct", deliveredMonthsAgo: 18, owner: "holloway",
    address: "14 Quarry Lane, Port Alder", notes: "Sink cut-out sealed on all end grain.",
    layers: [{ surface: "top", product: "varnish", coats: 3, monthsAgo: 18, by: "teo", lot: "CV-5521" }, { surface: "edges", product: "varnish", coats: 3, monthsAgo: 18, by: "teo" }],
  },
  {
    title: "Cherry writing desk", kind: "desk", shape: { kind: "rectangle", lengthMm: 1500, widthMm: 700 }, thicknessMm: 32, primary: "black_cherry",
    base: ["cherry legs", "paste wax"], use: "moderate", sun: "indirect", deliveredMonthsAgo: 9, owner: "jonah", address: "3 Ferry Row, Port Alder",
    layers: [{ surface: "top", product: "wax", coats: 2, monthsAgo: 9, by: "maren" }, { surface: "base", product: "wax", coats: 1, monthsAgo: 9, by: "maren" }],
  },
  {
    title: "Spalted maple coffee table, blue resin", kind: "coffee_table", shape: { kind: "round", diameterMm: 900 }, thicknessMm: 45,
    primary: "red_maple", resin: { kind: "deep_pour", volumeMl: 6500, tint: "ocean blue" }, base: ["white oak pedestal", "hardwax oil"],
    use: "moderate", sun: "none", deliveredMonthsAgo: 14, owner: "jonah", address: "3 Ferry Row, Port Alder",
    layers: [{ surface: "top", product: "oil", coats: 2, monthsAgo: 14, by: "teo", lot: "HO-2302" }, { surface: "base", product: "oil", coats: 2, monthsAgo: 14, by: "teo" }],
  },
  {
    title: "Charred cedar garden bench", kind: "bench", shape: { kind: "rectangle", lengthMm: 1800, widthMm: 400 }, thicknessMm: 70,
    primary: "western_redcedar", base: ["charred cedar legs", "exterior oil"], use: "outdoor_covered", sun: "direct", deliveredMonthsAgo: 30, owner: "holloway",
    address: "14 Quarry Lane, Port Alder", notes: "Under the porch roof; owner told to keep it off the lawn.",
    layers: [
      { surface: "top", product: "exteriorOil", coats: 2, monthsAgo: 30, by: "teo" },
      { surface: "top", product: "exteriorOil", coats: 1, monthsAgo: 17, by: "ines", notes: "Re-oiled after the wet season." },
      { surface: "base", product: "exteriorOil", coats: 2, monthsAgo: 30, by: "teo" },
    ],
  },
  {
    title: "Burl-top buckeye console", kind: "console", shape: { kind: "rectangle", lengthMm: 1400, widthMm: 380 }, thicknessMm: 38, primary: "yellow_buckeye",
    resin: { kind: "tabletop_coat", volumeMl: 1200, tint: "clear" }, base: ["steel hairpin legs", "clear lacquer"], use: "light", sun: "indirect", deliveredMonthsAgo: 4,
    address: "88 Harbour Road, Port Alder",
    layers: [{ surface: "top", product: "epoxyPolish", coats: 1, monthsAgo: 4, by: "teo", notes: "Flood coat polished to satin." }],
  },
  {
    title: "Walnut live-edge bench", kind: "bench", shape: { kind: "rectangle", lengthMm: 1600, widthMm: 380 }, thicknessMm: 55, primary: "black_walnut",
    base: ["walnut legs", "hardwax oil"], use: "moderate", sun: "none", deliveredMonthsAgo: 2, address: "9 Mill Street, Port Alder",
    layers: [{ surface: "top", product: "oil", coats: 2, monthsAgo: 2, by: "teo" }, { surface: "base", product: "oil", coats: 2, monthsAgo: 2, by: "teo" }],
  },
  {
    title: "Ash standing desk top", kind: "desk", shape: { kind: "rectangle", lengthMm: 1600, widthMm: 800 }, thicknessMm: 30, primary: "white_ash",
    base: ["motorised frame by others", "—"], use: "moderate", sun: "indirect", deliveredMonthsAgo: 11, daysEarlier: 12, address: "21 Pier Street, Port Alder",
    layers: [{ surface: "top", product: "oil", coats: 1, monthsAgo: 11, by: "teo" }, { surface: "top", product: "ceramic", coats: 1, monthsAgo: 11, by: "teo" }],
  },
  {
    title: "Elm live-edge dining table", kind: "dining_table", shape: { kind: "oval", lengthMm: 2200, widthMm: 1100 }, thicknessMm: 55, primary: "american_elm",
    base: ["elm sled base", "hardwax oil"], use: "heavy", sun: "direct", deliveredMonthsAgo: 34, address: "2 Lookout Terrace, Port Alder",
    notes: "South-facing bay window.",
    layers: [
      { surface: "top", product: "oil", coats: 2, monthsAgo: 34, by: "maren" },
      { surface: "top", product: "ceramic", coats: 1, monthsAgo: 34, by: "maren" },
      { surface: "top", product: "ceramic", coats: 1, monthsAgo: 22, by: "ines" },
      { surface: "base", product: "oil", coats: 2, monthsAgo: 34, by: "maren" },
    ],
  },
  {
    title: "Sycamore bar countertop", kind: "countertop", shape: { kind: "rectangle", lengthMm: 3000, widthMm: 600 }, thicknessMm: 40, primary: "american_sycamore",
    base: ["—", "—"], use: "heavy", sun: "none", deliveredMonthsAgo: 20, address: "The Net Loft, 5 Quay Street, Port Alder", notes: "Commercial bar; wiped with mild soap only.",
    layers: [{ surface: "top", product: "waterPoly", coats: 4, monthsAgo: 20, by: "teo", lot: "WP-1188" }],
  },
  {
    title: "Red oak wall shelf", kind: "shelf", shape: { kind: "rectangle", lengthMm: 1200, widthMm: 250 }, thicknessMm: 38, primary: "red_oak",
    base: ["hidden steel brackets", "—"], use: "light", sun: "indirect", deliveredMonthsAgo: 7, address: "40 Chapel Hill, Port Alder",
    layers: [{ surface: "top", product: "wax", coats: 2, monthsAgo: 7, by: "maren" }],
  },
  {
    title: "Walnut and maple resin coffee table", kind: "coffee_table", shape: { kind: "measured", areaM2: 0.95 }, thicknessMm: 45, primary: "black_walnut", secondary: "sugar_maple",
    resin: { kind: "deep_pour", volumeMl: 9000, tint: "smoke grey" }, base: ["walnut waterfall legs", "hardwax oil"], use: "moderate", sun: "indirect", deliveredMonthsAgo: 5, owner: "jonah",
    address: "3 Ferry Row, Port Alder",
    layers: [{ surface: "top", product: "epoxyPolish", coats: 1, monthsAgo: 5, by: "teo" }, { surface: "base", product: "oil", coats: 2, monthsAgo: 5, by: "teo" }],
  },
  {
    title: "Cherry console with resin inlay", kind: "console", shape: { kind: "rectangle", lengthMm: 1300, widthMm: 400 }, thicknessMm: 32, primary: "black_cherry",
    resin: { kind: "deep_pour", volumeMl: 800, tint: "amber" }, base: ["cherry frame", "hardwax oil"], use: "light", sun: "none", deliveredMonthsAgo: 1, address: "17 Rope Walk, Port Alder",
    layers: [{ surface: "top", product: "oil", coats: 2, monthsAgo: 1, by: "teo" }, { surface: "base", product: "oil", coats: 2, monthsAgo: 1, by: "teo" }],
  },
  {
    title: "Beech children's desk", kind: "desk", shape: { kind: "rectangle", lengthMm: 1000, widthMm: 600 }, thicknessMm: 28, primary: "american_beech",
    base: ["beech legs", "hardwax oil"], use: "heavy", sun: "indirect", deliveredMonthsAgo: 23, daysEarlier: 9, address: "6 School Lane, Port Alder",
    layers: [
      { surface: "top", product: "oil", coats: 2, monthsAgo: 23, by: "teo" },
      { surface: "top", product: "oil", coats: 1, monthsAgo: 11, by: "ines", notes: "Felt-tip marks sanded back locally before re-oiling." },
      { surface: "base", product: "oil", coats: 2, monthsAgo: 23, by: "teo" },
    ],
  },
];

/** "YYYY-MM-DD" a whole number of months before `today` (day clamped to the month's end). */
export function monthsBefore(today: Date, months: number): string {
  const y = today.getUTCFullYear();
  const m = today.getUTCMonth() - months;
  const first = new Date(Date.UTC(y, m, 1));
  const last = new Date(Date.UTC(first.getUTCFullYear(), first.getUTCMonth() + 1, 0)).getUTCDate();
  const d = Math.min(today.getUTCDate(), last);
  return new Date(Date.UTC(first.getUTCFullYear(), first.getUTCMonth(), d)).toISOString().slice(0, 10);
}

function daysBefore(day: string, days: number): string {
  return days ? new Date(Date.parse(`${day}T00:00:00Z`) - days * 86_400_000).toISOString().slice(0, 10) : day;
}

export class AlreadySeededError extends Error {}

export async function seedDemo(db: Db, { today = new Date() }: { today?: Date } = {}) {
  const exists = db.$client.prepare("SELECT id FROM studios WHERE slug = ?").get(DEMO_STUDIO_SLUG);
  if (exists) throw new AlreadySeededError("The demo studio is already in this database.");

  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const now = new Date();
  const result = db.transaction((tx) => {
    const studio = tx
      .insert(studios)
      .values({
        slug: DEMO_STUDIO_SLUG,
        name: "Larchmere Slab & Resin",
        address: "Unit 4, Old Cannery Yard, Port Alder (an invented town)",
        email: "studio@larchmere.example",
        timeZone: "America/Los_Angeles",
        currency: "USD",
        unitSystem: "imperial",
        taxRateBp: 850,
        labourRateMinor: 8500,
        travelFeeMinor: 4500,
        // The demo studio opens set up (lib/studio/setup.ts SETUP_STEPS), as it always has.
        setupDone: ["details", "brand", "warranty", "catalog", "reminders", "visits", "team", "payments", "mail"],
      })
      .returning()
      .get();

    const people = Object.fromEntries(
      Object.entries(DEMO_ACCOUNTS).map(([key, a]) => {
        const user = tx
          .insert(users)
          .values({ email: a.email, name: a.name, passwordHash, emailVerifiedAt: now, timeZone: "America/Los_Angeles", unitSystem: "imperial" })
          .returning()
          .get();
        if (a.role !== "owner") tx.insert(memberships).values({ studioId: studio.id, userId: user.id, role: a.role }).run();
        return [key, user];
      }),
    ) as unknown as Record<keyof typeof DEMO_ACCOUNTS, { id: string }>;

    const productIds = Object.fromEntries(
      Object.entries(PRODUCTS).map(([key, p]) => [key, tx.insert(finishProducts).values({ ...p, studioId: studio.id }).returning().get().id]),
    ) as Record<ProductKey, string>;

    // One policy version from before the oldest delivery, so every demo piece carries it.
    const policy = tx
      .insert(warrantyPolicies)
      .values({ studioId: studio.id, version: 1, effectiveFrom: monthsBefore(today, 48), policy: DEFAULT_WARRANTY_POLICY, createdById: people.maren.id })
      .returning()
      .get();

    const codes: { pieceId: string; title: string; code: string }[] = [];
    for (const spec of PIECES) {
      const { code, hash, enc } = newRegistrationCode();
      const ago = (months: number) => daysBefore(monthsBefore(today, months), spec.daysEarlier ?? 0);
      const deliveredOn = ago(spec.deliveredMonthsAgo);
      const piece = tx
        .insert(pieces)
        .values({
          studioId: studio.id,
          kind: spec.kind,
          title: spec.title,
          shapeKind: spec.shape.kind,
          lengthMm: spec.shape.lengthMm ?? null,
          widthMm: spec.shape.widthMm ?? null,
          diameterMm: spec.shape.diameterMm ?? null,
          measuredAreaM2: spec.shape.areaM2 ?? null,
          thicknessMm: spec.thicknessMm,
          primarySpeciesId: spec.primary,
          secondarySpeciesId: spec.secondary ?? null,
          resinKind: spec.resin?.kind ?? "none",
          resinPouredOn: spec.resin ? ago(spec.deliveredMonthsAgo + 1) : null,
          resinVolumeMl: spec.resin?.volumeMl ?? null,
          resinTint: spec.resin?.tint ?? null,
          baseMaterial: spec.base[0],
          baseFinish: spec.base[1],
          use: spec.use,
          sun: spec.sun,
          deliveredOn,
          deliveryAddress: spec.address,
          internalNotes: spec.notes ?? "",
          ownerId: spec.owner ? people[spec.owner].id : null,
          registeredAt: spec.owner ? new Date(`${ago(Math.max(0, spec.deliveredMonthsAgo - 1))}T17:00:00Z`) : null,
          registrationCodeHash: hash,
          registrationCodeEnc: enc,
          warrantyPolicyId: policy.id,
        })
        .returning()
        .get();
      if (piece.ownerId && piece.registeredAt) {
        tx.insert(ownerships).values({ studioId: studio.id, pieceId: piece.id, userId: piece.ownerId, via: "registration", startedAt: piece.registeredAt }).run();
      }
      if (!spec.owner) codes.push({ pieceId: piece.id, title: spec.title, code });
      const positions: Partial<Record<Surface, number>> = {};
      for (const layer of spec.layers) {
        const position = positions[layer.surface] ?? 0;
        positions[layer.surface] = position + 1;
        tx.insert(finishLayers)
          .values({
            studioId: studio.id,
            pieceId: piece.id,
            surface: layer.surface,
            position,
            finishClass: PRODUCTS[layer.product].finishClass,
            productId: productIds[layer.product],
            productLabel: PRODUCTS[layer.product].name,
            coats: layer.coats,
            appliedOn: ago(layer.monthsAgo),
            appliedById: layer.by ? people[layer.by].id : null,
            batchLot: layer.lot ?? "",
            notes: layer.notes ?? "",
          })
          .run();
      }
      indexPiece(tx, piece.id);
    }
    seedCareLog(tx, studio.id, today);
    return { studioId: studio.id, pieces: PIECES.length, codes };
  });
  const jobs = seedJobs(db, result.studioId, today);
  await seedVisits(db, result.studioId, today, jobs.done);
  await seedClaims(db, result.studioId, today);
  seedAftercareHistory(db, result.studioId, today);
  // The studio's people as clients, as the migration that introduced clients did for existing data.
  linkOwnersToClients(db, result.studioId);
  seedPlans(db, result.studioId, today);
  return { ...result, jobs };
}
