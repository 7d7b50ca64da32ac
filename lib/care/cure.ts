// Cure times of a fresh finish layer: how long water, objects and heavy use stay off it. The studio's
// catalog product carries the times from its own label; without them the finish class's default below
// applies. Pure: imports only lib/care.
import { addDays, type IsoDate } from "./dates";
import type { FinishClass } from "./vocabulary";

export interface CureTimes {
  /** Hours until light use: things set down gently, a wipe with a dry cloth. Water and mats stay off until then. */
  lightUseHours: number;
  /** Days until full use: water, cleaning with soap, heavy dishes, children's play. */
  fullCureDays: number;
}

/**
 * Defaults per finish class, used only when the studio's catalog product has no cure times of its
 * own. Common practice, no published source: typical figures printed on makers' labels for each
 * class (they vary by product, temperature and humidity; the label always comes first).
 */
export const DEFAULT_CURE_TIMES: Record<FinishClass, CureTimes> = {
  hardwax_oil: { lightUseHours: 24, fullCureDays: 14 }, // common practice, no published source
  ceramic_topcoat: { lightUseHours: 24, fullCureDays: 7 }, // common practice, no published source
  paste_wax: { lightUseHours: 12, fullCureDays: 3 }, // common practice, no published source
  film_finish: { lightUseHours: 72, fullCureDays: 30 }, // common practice, no published source
  epoxy_surface: { lightUseHours: 72, fullCureDays: 7 }, // common practice, no published source
  charred_oiled: { lightUseHours: 48, fullCureDays: 14 }, // common practice, no published source
};

export interface CureLayer {
  finishClass: FinishClass;
  appliedOn: IsoDate;
  productId?: string | null;
  /** The label the studio wrote for the layer's product. */
  productLabel?: string;
}

export interface CureProduct {
  id: string;
  name?: string;
  finishClass: FinishClass;
  cureLightUseHours?: number | null;
  cureFullDays?: number | null;
}

export interface CureWindow {
  finishClass: FinishClass;
  appliedOn: IsoDate;
  productName: string | null;
  lightUseHours: number;
  fullCureDays: number;
  /** First day light use is fine: the applied date plus the light-use hours, rounded up to whole days. */
  lightUseOn: IsoDate;
  /** First day of full use. */
  fullUseOn: IsoDate;
  /** Where the times came from: the catalog product's label, or the class default above. */
  source: "product" | "default";
}

/** The cure window of one layer: the catalog product's times where it has them, else the class default. */
export function cureWindow(layer: CureLayer, catalog: readonly CureProduct[]): CureWindow {
  const product = layer.productId ? catalog.find((p) => p.id === layer.productId && p.finishClass === layer.finishClass) : undefined;
  const def = DEFAULT_CURE_TIMES[layer.finishClass];
  const fromProduct = product != null && (product.cureLightUseHours != null || product.cureFullDays != null);
  const lightUseHours = product?.cureLightUseHours ?? def.lightUseHours;
  const fullCureDays = Math.max(product?.cureFullDays ?? def.fullCureDays, Math.ceil(lightUseHours / 24));
  return {
    finishClass: layer.finishClass,
    appliedOn: layer.appliedOn,
    productName: product?.name ?? (layer.productLabel || null),
    lightUseHours,
    fullCureDays,
    lightUseOn: addDays(layer.appliedOn, Math.ceil(lightUseHours / 24)),
    fullUseOn: addDays(layer.appliedOn, fullCureDays),
    source: fromProduct ? "product" : "default",
  };
}

/**
 * The layers still curing on `today` (full use not reached yet), one per finish class — the latest
 * applied — ordered by when full use comes, last first: the date an owner waits for.
 */
export function curingLayers(layers: readonly CureLayer[], catalog: readonly CureProduct[], today: IsoDate): CureWindow[] {
  const byClass = new Map<FinishClass, CureWindow>();
  for (const layer of layers) {
    if (layer.appliedOn > today) continue;
    const w = cureWindow(layer, catalog);
    if (w.fullUseOn <= today) continue;
    const prev = byClass.get(w.finishClass);
    if (!prev || w.fullUseOn > prev.fullUseOn) byClass.set(w.finishClass, w);
  }
  return [...byClass.values()].sort((a, b) => (a.fullUseOn < b.fullUseOn ? 1 : a.fullUseOn > b.fullUseOn ? -1 : 0));
}
