import "server-only";
import { and, asc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { finishProducts, type FinishProduct } from "@/db/schema";
import { assertRole, type StudioContext } from "@/lib/auth/guards";
import { recordAudit } from "@/lib/audit";
import { DEFAULT_CURE_TIMES } from "@/lib/care/cure";
import { DEFAULT_WEAR_INTERVALS } from "@/lib/care/intervals";
import { notFound } from "@/lib/errors";
import { catalogProductSchema, type CatalogPatch, type CatalogProductInput } from "@/lib/validation/pieces";
import { inWords } from "@/lib/validation/words";

// The studio's finish catalog: staff read it (layer pickers), admins change it. Wear intervals left empty — or equal to the care engine's
// default for the class — are stored as null, so the care engine's default (lib/care/intervals.ts) applies and
// the schedule's reasons say so.

type Intervals = Pick<FinishProduct, "intervalHeavyMonths" | "intervalModerateMonths" | "intervalLightMonths">;

function intervalsFor(cls: FinishProduct["finishClass"], v: Partial<Record<keyof Intervals, number | null | undefined>>): Intervals {
  const d = DEFAULT_WEAR_INTERVALS[cls];
  const keep = (x: number | null | undefined, def: number) => (x == null || x === def ? null : x);
  return {
    intervalHeavyMonths: keep(v.intervalHeavyMonths, d.heavy),
    intervalModerateMonths: keep(v.intervalModerateMonths, d.moderate),
    intervalLightMonths: keep(v.intervalLightMonths, d.light),
  };
}

export function listCatalog(ctx: StudioContext, { includeArchived = true } = {}) {
  const rows = getDb().select().from(finishProducts).where(eq(finishProducts.studioId, ctx.studio.id)).orderBy(asc(finishProducts.finishClass), asc(finishProducts.name)).all();
  return (includeArchived ? rows : rows.filter((r) => !r.archivedAt)).map((p) => ({ ...p, defaults: DEFAULT_WEAR_INTERVALS[p.finishClass], cureDefaults: DEFAULT_CURE_TIMES[p.finishClass] }));
}

function load(ctx: StudioContext, id: string): FinishProduct {
  const p = getDb().select().from(finishProducts).where(and(eq(finishProducts.id, id), eq(finishProducts.studioId, ctx.studio.id))).get();
  if (!p) throw notFound("No finish product with that id in this studio.");
  return p;
}

export function getCatalogProduct(ctx: StudioContext, id: string) {
  return load(ctx, id);
}

const ADMINS_ONLY = "Only the studio's admins can change the finish catalog.";

export function createCatalogProduct(ctx: StudioContext, v: CatalogProductInput): FinishProduct {
  assertRole(ctx, ["admin"], ADMINS_ONLY);
  return getDb().transaction((tx) => {
    const row = tx
      .insert(finishProducts)
      .values({ studioId: ctx.studio.id, name: v.name, finishClass: v.finishClass, coverageM2PerL: v.coverageM2PerL, containers: v.containers ?? [], safetyNotes: v.safetyNotes ?? "", cureLightUseHours: v.cureLightUseHours ?? null, cureFullDays: v.cureFullDays ?? null, ...intervalsFor(v.finishClass, v) })
      .returning()
      .get();
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "finish_product.created", subjectType: "finish_product", subjectId: row.id, data: { name: row.name } });
    return row;
  });
}

export function updateCatalogProduct(ctx: StudioContext, id: string, patch: CatalogPatch): FinishProduct {
  assertRole(ctx, ["admin"], ADMINS_ONLY);
  return getDb().transaction((tx) => {
    const current = load(ctx, id);
    const { archived, ...fields } = patch;
    const merged = catalogProductSchema.parse({
      ...current,
      ...Object.fromEntries(Object.entries(fields).filter(([, x]) => x !== undefined)),
    }, { error: inWords });
    const archivedAt = archived === undefined ? current.archivedAt : archived ? (current.archivedAt ?? new Date()) : null;
    const row = tx
      .update(finishProducts)
      .set({ name: merged.name, finishClass: merged.finishClass, coverageM2PerL: merged.coverageM2PerL, containers: merged.containers, safetyNotes: merged.safetyNotes, cureLightUseHours: merged.cureLightUseHours ?? null, cureFullDays: merged.cureFullDays ?? null, ...intervalsFor(merged.finishClass, merged), archivedAt })
      .where(and(eq(finishProducts.id, id), eq(finishProducts.studioId, ctx.studio.id)))
      .returning()
      .get();
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: archived === true ? "finish_product.archived" : "finish_product.updated", subjectType: "finish_product", subjectId: id, data: { before: { ...current, createdAt: undefined }, after: { ...row, createdAt: undefined } } });
    return row;
  });
}

/** Archives a product: its layers keep their label; it leaves the pickers. */
export function archiveCatalogProduct(ctx: StudioContext, id: string): FinishProduct {
  return updateCatalogProduct(ctx, id, { archived: true });
}
