// Pricing of a repair job: the care engine's quote() and the studio's repair price list propose the
// lines, staff may change them, and lib/repairs/lines prices what is sent. The one place a job's money
// is computed. No server-only import: the demo seed prices its jobs with it too.
import { and, eq } from "drizzle-orm";
import { finishLayers, type FinishLayer, type finishProducts, type Piece, type Studio } from "@/db/schema";
import type { DbOrTx } from "@/lib/pieces/search-index";
import { DEFAULT_LABOUR, quote, quoteProductFromCatalog } from "@/lib/care/quote";
import { CARE_TASK_LABELS, REFRESH_TASK_KINDS, SURFACE_LABELS, TASK_KIND_BY_FINISH_CLASS, type CareTaskKind, type FinishClass, type Surface } from "@/lib/care/vocabulary";
import { formatAndList, formatArea, formatVolume } from "@/lib/format";
import { recordedAreaM2, refreshedSurface, surfacesEndingIn, toCatalog } from "@/lib/pieces/care-inputs";
import type { JobQuoteInput } from "@/lib/validation/jobs";
import { priceLines, type JobLine, type LineDraft, type PlanDiscount, type PricedLines, type PricingRules, type StudioTax } from "./lines";
import { entryNeedsArea, entrySurface, priceListOf, proposedQuantity } from "./price-list";
import { reproposeLines, type LineBefore } from "./repropose";

type Product = typeof finishProducts.$inferSelect;

export function studioTax(studio: Pick<Studio, "taxMode" | "taxInclusive" | "taxRateBp" | "taxRatesBp" | "taxNumber">): StudioTax {
  return { mode: studio.taxMode, inclusive: studio.taxInclusive, rateBp: studio.taxRateBp, ratesBp: studio.taxRatesBp, number: studio.taxNumber };
}

export function pricingRulesOf(studio: Studio, planDiscount: PlanDiscount | null = null): PricingRules {
  return { rounding: studio.roundingRule, taxMode: studio.taxMode, taxInclusive: studio.taxInclusive, ...(planDiscount ? { planDiscount } : {}) };
}

/** A piece as a quote prices it: its record and the finish stack that says which surface a task is on. */
export type PricedPiece = Piece & { layers: readonly Pick<FinishLayer, "surface" | "position" | "finishClass">[] };

/** The piece with its finish stack (every layer of every surface), read in the caller's transaction. */
export function pricedPiece(db: DbOrTx, piece: Piece): PricedPiece {
  const layers = db.select({ surface: finishLayers.surface, position: finishLayers.position, finishClass: finishLayers.finishClass }).from(finishLayers).where(and(eq(finishLayers.studioId, piece.studioId), eq(finishLayers.pieceId, piece.id))).all();
  return { ...piece, layers };
}

/** Work the proposal priced nothing for: its size depends on a surface the piece's record has no size for. */
export interface UnsizedWork {
  /** The task or price-list entry, as the quote builder names it ("Re-oil", "Refinish the base"). */
  label: string;
  surface: Surface;
}

/** One unsized piece of work in staff's words, for the quote builder's notice and a refused quote. */
export function unsizedWords(u: UnsizedWork): string {
  const surface = SURFACE_LABELS[u.surface].toLowerCase();
  return `${u.label}: the work is on the ${surface}, and the piece's record has no size for the ${surface}, so no lines were proposed for it.`;
}

/**
 * A task whose finish is the outer coat of the top and of other surfaces too (an oiled top and base): the
 * proposal prices the top, and each other surface staff chose (JobQuoteInput.alsoSurfaces).
 */
export interface TopOnlyWork {
  task: CareTaskKind;
  label: string;
  /** Every surface whose outermost layer is the task's finish, the top first. */
  surfaces: Surface[];
  /** The other surfaces staff chose to price too. */
  also: Surface[];
  /** Each of those surfaces' size for this quote (quoteAreaM2), m², null where none is known: the top's too. */
  areasM2: Partial<Record<Surface, number | null>>;
}

/** "the top", "the top and the base", "the top, the base and the edges". */
function surfaceList(surfaces: readonly Surface[]): string {
  return formatAndList(surfaces.map((s) => `the ${SURFACE_LABELS[s].toLowerCase()}`));
}

/** One such task in staff's words, for the quote builder's note: which surfaces share the finish, which the lines price. */
export function topOnlyWords(w: Pick<TopOnlyWork, "label" | "surfaces" | "also" | "areasM2">): string {
  const priced = w.surfaces.filter((s) => (s === "top" || w.also.includes(s)) && w.areasM2[s] != null);
  const left = w.surfaces.filter((s) => s !== "top" && !w.also.includes(s));
  const share = `${w.label}: ${surfaceList(w.surfaces)} ${w.surfaces.length === 2 ? "both" : "all"} have this finish as their outer coat`;
  const lines = priced.length === 0 ? "no surface is priced yet" : priced.length === 1 ? `the lines price ${surfaceList(priced)} only` : `the lines price ${surfaceList(priced)}`;
  return `${share}, and ${lines}.${left.length ? ` If the work covers ${surfaceList(left)} too, tick ${left.length === 1 ? "it" : "them"} below.` : ""}`;
}

/** The note's choice for one other surface, its size in the studio's units: "Also price the base (6.5 ft²)". */
export function alsoSurfaceLabel(surface: Surface, areaM2: number | null | undefined, units: Studio["unitSystem"]): string {
  return `Also price the ${SURFACE_LABELS[surface].toLowerCase()} (${areaM2 == null ? "no size yet" : formatArea(areaM2, units)})`;
}

/**
 * Whether a task puts product on the piece: a refresh renews its finish and uses the finish's product
 * (REFRESH_TASK_KINDS in lib/care/vocabulary.ts); an inspection of a film finish and the yearly check
 * look and clean, and use none. A product of the task's finish class chosen on the quote is priced only
 * for a task that uses it.
 */
export function taskUsesProduct(kind: CareTaskKind): boolean {
  return REFRESH_TASK_KINDS.includes(kind);
}

/** The products a first quote starts with for its tasks: one of a finish class whose task is quoted and uses product. */
export function defaultProductIds(tasks: readonly CareTaskKind[], products: readonly Pick<Product, "id" | "finishClass">[]): string[] {
  const wanted = new Set(tasks.filter(taskUsesProduct));
  return products.filter((p) => wanted.has(TASK_KIND_BY_FINISH_CLASS[p.finishClass])).map((p) => p.id).slice(0, 1);
}

const CLASS_BY_TASK = Object.fromEntries(Object.entries(TASK_KIND_BY_FINISH_CLASS).map(([cls, task]) => [task, cls])) as Partial<Record<CareTaskKind, FinishClass>>;

/**
 * The surface a maintenance task works on: the one whose outermost layer is of the task's finish class
 * (lib/pieces/care-inputs refreshedSurface, as the technician's "What to bring" reads it), else the top
 * where the stack does not say which. The visit's booked length uses it too (lib/visits/availability.ts).
 */
export function taskSurface(layers: PricedPiece["layers"], kind: CareTaskKind): Surface {
  const cls = CLASS_BY_TASK[kind];
  return (cls && refreshedSurface(layers, cls)) || "top";
}

/** Where the task's finish is the outer coat of the top and of other surfaces too: all of them, the top first; else none. */
export function sharedFinishSurfaces(layers: PricedPiece["layers"], kind: CareTaskKind): Surface[] {
  const cls = CLASS_BY_TASK[kind];
  const ending = cls ? surfacesEndingIn(layers, cls) : [];
  return ending.length > 1 && ending.includes("top") ? ["top", ...ending.filter((s) => s !== "top")] : [];
}

/**
 * The surfaces a task is priced on: the one its work is on (taskSurface), then each other surface staff
 * chose to price beside the top where they share its finish (JobQuoteInput.alsoSurfaces). The visit's
 * booked length (lib/visits/availability.ts) and the technician's "What to bring"
 * (lib/visits/technician-day.ts) read the same surfaces.
 */
export function taskSurfaces(layers: PricedPiece["layers"], kind: CareTaskKind, input: Pick<JobQuoteInput, "alsoSurfaces">): Surface[] {
  const chosen = input.alsoSurfaces?.[kind] ?? [];
  return [taskSurface(layers, kind), ...sharedFinishSurfaces(layers, kind).filter((s) => s !== "top" && chosen.includes(s))];
}

/** The ref of a task's labour line on a surface: the first surface's plain (as before surfaces could be added), the others' named. */
export const taskLineRef = (kind: CareTaskKind, surface: Surface, first: Surface) => (surface === first ? `task:${kind}` : `task:${kind}:${surface}`);

/**
 * The size of one face of a surface for a quote, m²: the piece's record's (recordedAreaM2: the top's,
 * from its shape), else the size staff typed on this quote for a surface the record has none for; null
 * where neither is known. Never one surface's size for another. The visit's booked length reads it too
 * (lib/visits/availability.ts jobDurationMin).
 */
export function quoteAreaM2(piece: Piece, input: Pick<JobQuoteInput, "areasM2">, surface: Surface): number | null {
  return recordedAreaM2(piece, surface) ?? input.areasM2?.[surface] ?? null;
}

/**
 * The lines the care engine and the price list propose for the input's tasks, each from the size of the
 * surface its work is on (taskSurface, entrySurface; quoteAreaM2): labour from that area and the task (at
 * the labour rate), product from area × coats ÷ coverage in whole containers (catalog prices), the travel
 * fee, and each chosen repair from the studio's price list. Work whose size depends on a surface with no
 * known size gets no line (a made-up size would be a made-up price) and is listed in `unsized`, for staff
 * to type the size or the lines.
 *
 * A task whose finish is the outer coat of the top and of other surfaces (an oiled top and base) is
 * priced on the top, and on each other surface staff chose (`alsoSurfaces`), by the same rules: one
 * labour line a surface, named for it ("Re-oil — base"), its hours from that surface's size; the product
 * once, on the surfaces' summed area, so a tin opened for the top serves the base and the containers are
 * rounded up once for the visit, not once a surface. Those it is not priced on are listed in `topOnly`.
 */
export function proposeLines(studio: Studio, piece: PricedPiece, input: JobQuoteInput, products: Product[]): { lines: LineDraft[]; unsized: UnsizedWork[]; topOnly: TopOnlyWork[] } {
  const labour: LineDraft[] = [];
  const materials: LineDraft[] = [];
  const unsized: UnsizedWork[] = [];
  const topOnly: TopOnlyWork[] = [];
  const chosen = toCatalog(products.filter((p) => input.productIds.includes(p.id)));
  const engine = (task: CareTaskKind, areaM2: number, withProducts: boolean) =>
    quote({
      tasks: [task],
      areaM2,
      rates: { labourPerHourMinor: studio.labourRateMinor },
      products: withProducts ? chosen.map((entry) => ({ ...quoteProductFromCatalog(entry, TASK_KIND_BY_FINISH_CLASS[entry.finishClass]), label: entry.id, coats: input.coats })) : [],
      taxRatePct: 0,
      coveredPct: 0,
      currency: studio.currency,
    }).lines;
  for (const task of input.tasks) {
    const label = CARE_TASK_LABELS[task];
    // An inspection prices no product even where one of its finish class is chosen (taskUsesProduct).
    const withProduct = taskUsesProduct(task);
    const needsArea = DEFAULT_LABOUR[task].hoursPerM2 > 0 || (withProduct && chosen.some((e) => TASK_KIND_BY_FINISH_CLASS[e.finishClass] === task));
    // Where the top and other surfaces end in this finish: the top, and the others staff chose.
    const shared = sharedFinishSurfaces(piece.layers, task);
    const surfaces = taskSurfaces(piece.layers, task, input);
    const [surface] = surfaces as [Surface, ...Surface[]];
    const also = surfaces.slice(1);
    const areas = surfaces.map((s) => (needsArea ? quoteAreaM2(piece, input, s) : 0));
    if (needsArea && shared.length) topOnly.push({ task, label, surfaces: shared, also, areasM2: Object.fromEntries(shared.map((s) => [s, quoteAreaM2(piece, input, s)])) });
    const sized = surfaces.flatMap((s, i) => {
      const areaM2 = areas[i]!;
      if (areaM2 === null) unsized.push({ label, surface: s });
      return areaM2 === null ? [] : [{ surface: s, areaM2 }];
    });
    if (sized.length === 0) continue;
    // Lines name their surface once more than the top is chosen: "Re-oil — top", "Re-oil — base".
    const named = also.length > 0;
    for (const { surface: s, areaM2 } of sized) {
      for (const l of engine(task, areaM2, false)) {
        const ref = taskLineRef(task, s, surface);
        labour.push({ kind: "labour", source: "labour_rate", ref, description: named ? `${label} — ${SURFACE_LABELS[s].toLowerCase()}` : l.description, quantity: l.quantity, unit: "h", unitPriceMinor: l.unitPriceMinor });
      }
    }
    const totalM2 = sized.reduce((t, x) => t + x.areaM2, 0);
    const on = named ? ` — ${formatAndList(sized.map((x) => SURFACE_LABELS[x.surface].toLowerCase()))}` : "";
    for (const l of totalM2 > 0 && withProduct ? engine(task, totalM2, true) : []) {
      if (l.kind !== "materials" || !l.product || l.sizeMl === undefined) continue;
      // The engine's product label is the product's id (set above).
      const productId = l.product;
      const name = products.find((p) => p.id === productId)?.name ?? productId;
      // The container size in the studio's units (the quote is the studio's document): "4.3 US fl oz (125 mL)".
      materials.push({ kind: "materials", source: "catalog", ref: `product:${productId}:${l.sizeMl}`, description: `${name}, ${formatVolume(l.sizeMl, studio.unitSystem)}${on}`, quantity: l.quantity, unit: "container", unitPriceMinor: l.unitPriceMinor });
    }
  }
  const out: LineDraft[] = [...labour, ...materials];
  const list = priceListOf(studio);
  for (const key of input.repairs ?? []) {
    const entry = list.find((e) => e.key === key);
    if (!entry) continue;
    const surface = entrySurface(entry);
    const quantity = proposedQuantity(entry, entryNeedsArea(entry) ? quoteAreaM2(piece, input, surface) : null);
    if (quantity === null) {
      unsized.push({ label: entry.label, surface });
      continue;
    }
    const hourly = entry.unitPriceMinor === null;
    out.push({
      kind: entry.kind,
      source: hourly ? "labour_rate" : "price_list",
      ref: `list:${entry.key}`,
      description: entry.label,
      quantity,
      unit: entry.unit,
      unitPriceMinor: hourly ? studio.labourRateMinor : entry.unitPriceMinor!,
    });
  }
  if (input.travel && studio.travelFeeMinor > 0) out.push({ kind: "travel", source: "price_list", ref: "travel", description: "Travel", quantity: 1, unit: "trip", unitPriceMinor: studio.travelFeeMinor });
  return { lines: out, unsized, topOnly };
}

export interface PricedJob extends PricedLines {
  proposedLines: JobLine[];
  pricingRules: PricingRules;
  /** Work the proposal could not size (proposeLines). */
  unsized: UnsizedWork[];
}

/**
 * Prices a job: the proposal, and the lines as sent — `input.lines` when staff edited them, else the
 * proposal over the lines the job already had (`before`): a proposed line staff had edited keeps their
 * quantity and price where its ref is proposed again (lib/repairs/repropose.ts), and the typed lines stay.
 * Each sent line carries what was proposed for it (matched by ref), so the quote keeps both. A paid repair on a piece under a running
 * care plan with a repair discount (`planDiscount`, lib/plans/repair-discount) takes it off every line
 * after the warranty's share; the pricing rules name the plan so the quote can say so.
 */
export function priceJob(studio: Studio, piece: PricedPiece, input: JobQuoteInput, products: Product[], before: readonly (LineDraft & LineBefore)[] = [], planDiscount: PlanDiscount | null = null): PricedJob {
  const opts = { currency: studio.currency, rounding: studio.roundingRule, tax: studioTax(studio), coveredPct: input.coveredPct, discountPct: planDiscount?.pct ?? 0 };
  const { lines: proposal, unsized } = proposeLines(studio, piece, input, products);
  const proposedLines = priceLines(proposal, opts).lines;
  const sent = input.lines ?? [...reproposeLines(before, proposal).map((r) => r.line), ...before.filter((l) => l.source === "typed")];
  const withProposed = sent.map((l) => {
    const p = l.ref ? proposal.find((x) => x.ref === l.ref) : undefined;
    const { kind, source, ref, description, quantity, unit, unitPriceMinor } = l;
    return { kind, source, ...(ref ? { ref } : {}), description, quantity, unit, unitPriceMinor, proposed: p ? { quantity: p.quantity, unitPriceMinor: p.unitPriceMinor } : null };
  });
  return { ...priceLines(withProposed, opts), proposedLines, pricingRules: pricingRulesOf(studio, planDiscount), unsized };
}

/** The job's money columns from a priced job. */
export function totals(q: PricedJob) {
  return { lines: q.lines, proposedLines: q.proposedLines, pricingRules: q.pricingRules, subtotalMinor: q.subtotalMinor, coveredMinor: q.coveredMinor, netMinor: q.netMinor, taxMinor: q.taxMinor, totalMinor: q.totalMinor };
}
