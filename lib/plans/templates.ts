// Plan templates: versions, the price with the studio's tax, and which pieces a template fits.
import { and, desc, eq, isNull } from "drizzle-orm";
import { getDb, type Db } from "@/db/client";
import { finishLayers, planTemplates, type Piece, type PlanTemplate } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioActor } from "@/lib/auth/actor";
import { topArea } from "@/lib/care/area";
import { conflict, notFound } from "@/lib/errors";
import { toCarePiece } from "@/lib/pieces/care-inputs";
import type { PlanTemplateInput } from "./validation";

/** The current version of every template of the studio (withdrawn ones too, for staff), newest first. */
export function listTemplates(studioId: string, db: Db = getDb()): PlanTemplate[] {
  return db.select().from(planTemplates).where(and(eq(planTemplates.studioId, studioId), isNull(planTemplates.supersededAt))).orderBy(desc(planTemplates.createdAt)).all();
}

/** One template version of the studio, or a 404. */
export function templateOf(studioId: string, templateId: string): PlanTemplate {
  const t = getDb().select().from(planTemplates).where(and(eq(planTemplates.id, templateId), eq(planTemplates.studioId, studioId))).get();
  if (!t) throw notFound("No such plan in this studio.");
  return t;
}

export function createTemplate(ctx: StudioActor, input: PlanTemplateInput): PlanTemplate {
  return getDb().transaction((tx) => {
    const id = crypto.randomUUID();
    const row = tx.insert(planTemplates).values({ ...input, id, lineageId: id, version: 1, studioId: ctx.studio.id, currency: ctx.studio.currency, createdById: ctx.user.id }).returning().get();
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "plan_template.created", subjectType: "plan_template", subjectId: row.id, data: { name: row.name, version: 1 } });
    return row;
  });
}

/** A change is a new version; plans bought under the old one keep it. */
export function updateTemplate(ctx: StudioActor, templateId: string, input: PlanTemplateInput): PlanTemplate {
  return getDb().transaction((tx) => {
    const current = tx.select().from(planTemplates).where(and(eq(planTemplates.id, templateId), eq(planTemplates.studioId, ctx.studio.id))).get();
    if (!current) throw notFound("No such plan in this studio.");
    if (current.supersededAt) throw conflict("This plan was changed meanwhile. Reload to edit its newest version.");
    const superseded = tx.update(planTemplates).set({ supersededAt: new Date() }).where(and(eq(planTemplates.id, current.id), isNull(planTemplates.supersededAt))).run();
    if (superseded.changes !== 1) throw conflict("This plan was changed meanwhile. Reload to edit its newest version.");
    const row = tx
      .insert(planTemplates)
      .values({ ...input, lineageId: current.lineageId, version: current.version + 1, studioId: ctx.studio.id, currency: current.currency, createdById: ctx.user.id })
      .returning()
      .get();
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "plan_template.changed", subjectType: "plan_template", subjectId: row.id, data: { lineageId: row.lineageId, from: current.version, to: row.version } });
    return row;
  });
}

/** The piece's top area in m², or null when its record gives no top. */
function pieceTopAreaM2(piece: Piece): number | null {
  try {
    const shape = toCarePiece(piece).shape;
    return shape ? topArea(shape).m2 : null;
  } catch {
    return null;
  }
}

/** Whether a template fits the piece: its kind, one of its finish classes, its top area. */
export function fitsPiece(t: Pick<PlanTemplate, "fits">, piece: Piece, finishClasses: readonly string[]): boolean {
  const f = t.fits;
  if (f.pieceKinds.length && !f.pieceKinds.includes(piece.kind)) return false;
  if (f.finishClasses.length && !finishClasses.some((c) => (f.finishClasses as string[]).includes(c))) return false;
  if (f.minTopAreaM2 != null || f.maxTopAreaM2 != null) {
    const area = pieceTopAreaM2(piece);
    if (area == null) return false;
    if (f.minTopAreaM2 != null && area < f.minTopAreaM2) return false;
    if (f.maxTopAreaM2 != null && area > f.maxTopAreaM2) return false;
  }
  return true;
}

/** The studio's offered templates that fit the piece. */
export function templatesFitting(piece: Piece, db: Db = getDb()): PlanTemplate[] {
  const classes = db.select({ c: finishLayers.finishClass }).from(finishLayers).where(eq(finishLayers.pieceId, piece.id)).all().map((r) => r.c);
  return listTemplates(piece.studioId, db).filter((t) => t.offered && fitsPiece(t, piece, classes));
}
