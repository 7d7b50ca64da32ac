// Maps database rows to the care engine's plain inputs — the one place this happens, so the studio
// pages, the owner pages and the scheduler all compute the same schedule. No server-only import:
// the scheduler process uses it too.
import type { CareLogRow, FinishLayer, FinishProduct, Piece } from "@/db/schema";
import { topArea, type TopShape } from "@/lib/care/area";
import type { FinishClass, Surface } from "@/lib/care/vocabulary";
import { careSchedule, type CareFinishLayer, type CareLogEntry, type CarePiece, type CareSchedule, type CatalogEntry } from "@/lib/care/schedule";
import { clampStoredDate } from "@/lib/validation/dates";

// Dates are read back within 1900–2199 (clampStoredDate): a row written before the input ranges
// existed (9999-12-31) would otherwise take the engine past year 9999 and break every page listing it.

type PieceShapeRow = Pick<Piece, "shapeKind" | "lengthMm" | "widthMm" | "diameterMm" | "measuredAreaM2">;

/** The top's shape, or undefined when the record lacks the sizes its shape needs. */
export function topShape(row: PieceShapeRow): TopShape | undefined {
  switch (row.shapeKind) {
    case "rectangle":
    case "oval":
      return row.lengthMm && row.widthMm ? { kind: row.shapeKind, lengthMm: row.lengthMm, widthMm: row.widthMm } : undefined;
    case "round":
      return row.diameterMm ? { kind: "round", diameterMm: row.diameterMm } : undefined;
    case "measured":
      return row.measuredAreaM2 ? { kind: "measured", areaM2: row.measuredAreaM2 } : undefined;
  }
}

/**
 * The area of one face of a surface as the piece's record gives it, m²: the top's from its shape
 * (lib/care/area.ts topArea). The record keeps no size for the base or the edges (db/schema.ts pieces),
 * so they have none here, and neither has a top whose sizes are missing: null, never the top's figure
 * for another surface.
 */
export function recordedAreaM2(row: PieceShapeRow, surface: Surface): number | null {
  if (surface !== "top") return null;
  const shape = topShape(row);
  return shape ? topArea(shape).m2 : null;
}

/** The surfaces whose outermost layer (the highest position of its stack) is of `finishClass`. */
export function surfacesEndingIn(layers: readonly Pick<FinishLayer, "surface" | "position" | "finishClass">[], finishClass: FinishClass): Surface[] {
  const outermost = new Map<Surface, Pick<FinishLayer, "position" | "finishClass">>();
  for (const l of layers) if ((outermost.get(l.surface)?.position ?? -1) < l.position) outermost.set(l.surface, l);
  return [...outermost].filter(([, l]) => l.finishClass === finishClass).map(([surface]) => surface);
}

/**
 * The surface a proposed layer of `finishClass` goes on: the one surface whose outermost layer is of
 * that class, the layer it refreshes. Null where no surface's outermost layer is, or more than one's
 * (an oiled top and base): the technician chooses.
 */
export function refreshedSurface(layers: readonly Pick<FinishLayer, "surface" | "position" | "finishClass">[], finishClass: FinishClass): Surface | null {
  const surfaces = surfacesEndingIn(layers, finishClass);
  return surfaces.length === 1 ? surfaces[0]! : null;
}

export function toCarePiece(row: Piece): CarePiece {
  return {
    id: row.id,
    kind: row.kind,
    use: row.use,
    sun: row.sun,
    deliveredOn: clampStoredDate(row.deliveredOn),
    resin: row.resinKind,
    shape: topShape(row),
    primarySpeciesId: row.primarySpeciesId,
  };
}

export function toCareLayers(rows: readonly FinishLayer[]): CareFinishLayer[] {
  return rows.map((l) => ({
    id: l.id,
    surface: l.surface,
    finishClass: l.finishClass,
    productId: l.productId ?? undefined,
    coats: l.coats,
    appliedOn: clampStoredDate(l.appliedOn),
  }));
}

export function toCareLog(rows: readonly Pick<CareLogRow, "taskKind" | "doneOn" | "surface">[]): CareLogEntry[] {
  return rows.map((r) => ({ taskKind: r.taskKind, doneOn: clampStoredDate(r.doneOn), surface: r.surface ?? undefined }));
}

export function toCatalog(rows: readonly FinishProduct[]): CatalogEntry[] {
  return rows.map((p) => ({
    id: p.id,
    name: p.name,
    finishClass: p.finishClass,
    coverageM2PerL: p.coverageM2PerL,
    containerSizesMl: p.containers.map((c) => c.ml),
    containerPricesMinor: Object.fromEntries(p.containers.map((c) => [c.ml, c.priceMinor])),
    intervals: {
      ...(p.intervalHeavyMonths != null ? { heavy: p.intervalHeavyMonths } : {}),
      ...(p.intervalModerateMonths != null ? { moderate: p.intervalModerateMonths } : {}),
      ...(p.intervalLightMonths != null ? { light: p.intervalLightMonths } : {}),
    },
  }));
}

/** The care schedule of one piece from its rows, in the studio's time zone. */
export function scheduleFromRows(input: {
  piece: Piece;
  layers: readonly FinishLayer[];
  careLog: readonly Pick<CareLogRow, "taskKind" | "doneOn" | "surface">[];
  products: readonly FinishProduct[];
  timeZone: string;
  now: Date;
}): CareSchedule {
  return careSchedule({
    piece: toCarePiece(input.piece),
    finishLayers: toCareLayers(input.layers),
    careLog: toCareLog(input.careLog),
    catalog: toCatalog(input.products),
    now: input.now,
    timeZone: input.timeZone,
  });
}

/** The columns of a piece row the care engine reads (bulk loaders select only these). */
export type CarePieceColumns = Pick<
  Piece,
  "id" | "kind" | "use" | "sun" | "deliveredOn" | "resinKind" | "primarySpeciesId" | "shapeKind" | "lengthMm" | "widthMm" | "diameterMm" | "measuredAreaM2"
>;
export type CareLayerColumns = Pick<FinishLayer, "id" | "surface" | "finishClass" | "productId" | "coats" | "appliedOn">;

/** toCarePiece for a row that carries only the columns the care engine reads. */
export function toCarePieceFromColumns(row: CarePieceColumns): CarePiece {
  return {
    id: row.id,
    kind: row.kind,
    use: row.use,
    sun: row.sun,
    deliveredOn: clampStoredDate(row.deliveredOn),
    resin: row.resinKind,
    shape: topShape(row),
    primarySpeciesId: row.primarySpeciesId,
  };
}

/**
 * scheduleFromRows for bulk callers (the reminder pass, the staff reminders view): the same mapping,
 * from column subsets, with the studio's catalog already converted once by toCatalog.
 */
export function scheduleFromColumns(input: {
  piece: CarePieceColumns;
  layers: readonly CareLayerColumns[];
  careLog: readonly Pick<CareLogRow, "taskKind" | "doneOn" | "surface">[];
  catalog: readonly CatalogEntry[];
  timeZone: string;
  now: Date | number;
}): CareSchedule {
  return careSchedule({
    piece: toCarePieceFromColumns(input.piece),
    finishLayers: input.layers.map((l) => ({
      id: l.id,
      surface: l.surface,
      finishClass: l.finishClass,
      productId: l.productId ?? undefined,
      coats: l.coats,
      appliedOn: clampStoredDate(l.appliedOn),
    })),
    careLog: toCareLog(input.careLog),
    catalog: input.catalog,
    now: input.now,
    timeZone: input.timeZone,
  });
}
