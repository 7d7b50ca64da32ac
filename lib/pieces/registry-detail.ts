// The staff piece page (GET /api/pieces/[id] and app/studio/pieces/[id]): the record, its finish stack,
// care schedule, top area, photos, a timeline of everything that happened to it, and its stack history.
import "server-only";
import { and, asc, desc, eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { auditLog, careLogEntries, claims, files, finishLayers, finishProducts, reminderSends, users } from "@/db/schema";
import { requireStaff, type StudioContext } from "@/lib/auth/guards";
import { topArea, type TopArea } from "@/lib/care/area";
import { localDate } from "@/lib/care/dates";
import { CARE_LOG_SOURCE_WORDS, CARE_TASK_LABELS, FINISH_CLASS_LABELS, SURFACE_LABELS } from "@/lib/care/vocabulary";
import { CLAIM_CATEGORY_LABELS, CLAIM_STATE_LABELS_STAFF } from "@/lib/claims/labels";
import { formatDate } from "@/lib/format";
import { REMINDER_STEP_LABELS } from "@/lib/overview";
import type { CareSchedule } from "@/lib/care/schedule";
import { scheduleFromRows, topShape } from "./care-inputs";
import { loadPiece, publicPiece, studioMembers, studioProducts, today } from "./registry-common";
import { policyTerms, warrantyEndsOn } from "./registry-sql";

export type TimelineEvent = { on: string; at?: number; kind: "delivered" | "layer" | "care" | "reminder" | "claim" | "registered" | "record"; text: string };


const AUDIT_TEXT: Record<string, string> = {
  "piece.created": "Piece record created",
  "piece.updated": "Piece record edited",
  "piece.archived": "Piece archived",
  "piece.unarchived": "Piece taken out of the archive",
  "piece.code_reissued": "Registration code reissued; the old code stopped working",
  "layer.added": "Finish layer added",
  "layer.updated": "Finish layer edited",
  "layer.moved": "Finish layer moved",
  "layer.removed": "Finish layer removed",
  "photo.added": "Photo added",
  "piece.handover_sent": "Hand-over mail sent to the buyer",
  "piece.handover_resent": "Hand-over mail sent again, with a fresh link",
};

export function getPieceDetail(ctx: StudioContext, pieceId: string, now = new Date()) {
  const db = getDb();
  const piece = loadPiece(ctx, pieceId);
  const owner = piece.ownerId ? (db.select({ id: users.id, name: users.name, email: users.email }).from(users).where(eq(users.id, piece.ownerId)).get() ?? null) : null;
  const layers = db
    .select({ layer: finishLayers, productName: finishProducts.name, appliedByName: users.name })
    .from(finishLayers)
    .leftJoin(finishProducts, eq(finishProducts.id, finishLayers.productId))
    .leftJoin(users, eq(users.id, finishLayers.appliedById))
    .where(and(eq(finishLayers.pieceId, pieceId), eq(finishLayers.studioId, ctx.studio.id)))
    .orderBy(asc(finishLayers.surface), asc(finishLayers.position))
    .all();
  const careLog = db.select().from(careLogEntries).where(and(eq(careLogEntries.pieceId, pieceId), eq(careLogEntries.studioId, ctx.studio.id))).orderBy(asc(careLogEntries.doneOn)).all();
  const products = studioProducts(ctx.studio.id);
  let schedule: CareSchedule | null = null;
  let scheduleError: string | null = null;
  try {
    schedule = scheduleFromRows({ piece, layers: layers.map((l) => l.layer), careLog, products, timeZone: ctx.studio.timeZone, now });
  } catch (e) {
    scheduleError = e instanceof Error ? e.message : "The care schedule could not be computed.";
  }
  const shape = topShape(piece);
  let area: TopArea | null = null;
  try {
    area = shape ? topArea(shape) : null;
  } catch {
    area = null;
  }
  const photos = db
    .select({ id: files.id, width: files.width, height: files.height, createdAt: files.createdAt })
    .from(files)
    .where(and(eq(files.pieceId, pieceId), eq(files.studioId, ctx.studio.id), eq(files.purpose, "piece_photo")))
    .orderBy(asc(files.createdAt))
    .all()
    .map((f) => ({ ...f, url: `/api/files/${f.id}`, thumbUrl: `/api/files/${f.id}?thumb=1` }));

  const tz = ctx.studio.timeZone;
  const day = (d: Date) => localDate(d.getTime(), tz);
  const timeline: TimelineEvent[] = [{ on: piece.deliveredOn, kind: "delivered", text: `Delivered${piece.deliveryAddress ? ` to ${piece.deliveryAddress}` : ""}` }];
  for (const { layer, productName } of layers) {
    timeline.push({ on: layer.appliedOn, kind: "layer", text: `${SURFACE_LABELS[layer.surface]}: ${productName ?? (layer.productLabel || FINISH_CLASS_LABELS[layer.finishClass])} applied, ${layer.coats} coat${layer.coats === 1 ? "" : "s"}` });
  }
  for (const c of careLog) timeline.push({ on: c.doneOn, kind: "care", text: `Care logged ${CARE_LOG_SOURCE_WORDS[c.source]}: ${CARE_TASK_LABELS[c.taskKind as keyof typeof CARE_TASK_LABELS] ?? c.taskKind}${c.notes ? ` — ${c.notes}` : ""}` });
  if (piece.registeredAt) timeline.push({ on: day(piece.registeredAt), at: piece.registeredAt.getTime(), kind: "registered", text: `Registered by ${owner?.name ?? "its owner"}` });
  for (const r of db.select().from(reminderSends).where(and(eq(reminderSends.pieceId, pieceId), eq(reminderSends.studioId, ctx.studio.id), eq(reminderSends.status, "sent"))).all()) {
    if (r.sentAt) timeline.push({ on: day(r.sentAt), at: r.sentAt.getTime(), kind: "reminder", text: `Care reminder sent: ${CARE_TASK_LABELS[r.taskKind as keyof typeof CARE_TASK_LABELS] ?? r.taskKind} (${REMINDER_STEP_LABELS[r.step].toLowerCase()}), due ${formatDate(r.dueOn)}` });
  }
  for (const c of db.select().from(claims).where(and(eq(claims.pieceId, pieceId), eq(claims.studioId, ctx.studio.id))).all()) {
    timeline.push({ on: day(c.createdAt), at: c.createdAt.getTime(), kind: "claim", text: `Claim filed: ${CLAIM_CATEGORY_LABELS[c.category]} (now ${CLAIM_STATE_LABELS_STAFF[c.state].toLowerCase()})` });
  }
  for (const a of db
    .select()
    .from(auditLog)
    .where(and(eq(auditLog.studioId, ctx.studio.id), eq(auditLog.subjectType, "piece"), eq(auditLog.subjectId, pieceId)))
    .orderBy(asc(auditLog.createdAt))
    .all()) {
    if (a.action.startsWith("layer.") || a.action === "piece.created") continue; // layers are on the timeline by their date
    timeline.push({ on: day(a.createdAt), at: a.createdAt.getTime(), kind: "record", text: AUDIT_TEXT[a.action] ?? a.action });
  }
  timeline.sort((a, b) => (a.on < b.on ? 1 : a.on > b.on ? -1 : (b.at ?? 0) - (a.at ?? 0)));

  const terms = policyTerms(ctx.studio.id);
  const ends = warrantyEndsOn(piece, terms);
  return {
    piece: publicPiece(piece),
    owner,
    layers: layers.map((l) => ({ ...l.layer, productName: l.productName, appliedByName: l.appliedByName })),
    schedule,
    scheduleError,
    area,
    photos,
    timeline,
    warrantyEndsOn: ends,
    underWarranty: ends !== null && ends >= today(ctx, now),
    members: studioMembers(ctx),
    products: products.filter((p) => !p.archivedAt).map((p) => ({ id: p.id, name: p.name, finishClass: p.finishClass })),
  };
}

/** Stack history of a piece (the audit entries of its layers), newest first. */
export function layerHistory(ctx: StudioContext, pieceId: string) {
  loadPiece(ctx, pieceId);
  return getDb()
    .select({ action: auditLog.action, data: auditLog.data, createdAt: auditLog.createdAt, actorName: users.name })
    .from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorId))
    .where(and(eq(auditLog.studioId, ctx.studio.id), eq(auditLog.subjectType, "piece"), eq(auditLog.subjectId, pieceId), sql`${auditLog.action} LIKE 'layer.%'`))
    .orderBy(desc(auditLog.createdAt))
    .all();
}

/** The piece page: the record, stack, schedule, timeline and stack history. */
export async function piecePage(pieceId: string) {
  const ctx = await requireStaff();
  const detail = getPieceDetail(ctx, pieceId);
  return { ...detail, history: layerHistory(ctx, pieceId), unitSystem: ctx.studio.unitSystem, today: today(ctx), studioName: ctx.studio.name };
}
