import "server-only";
import { and, asc, desc, eq, inArray, isNull, lte } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import {
  careLogEntries,
  files,
  finishLayers,
  finishProducts,
  ownerships,
  pieces,
  studios,
  warrantyPolicies,
  type CareLogRow,
  type FinishLayer,
  type FinishProduct,
  type Piece,
} from "@/db/schema";
import { DEFAULT_WARRANTY_POLICY, type WarrantyPolicy } from "@/lib/care/coverage";
import { localDate } from "@/lib/care/dates";
import type { CareTask } from "@/lib/care/schedule";
import { getSpecies } from "@/lib/care/species";
import {
  CARE_TASK_LABELS,
  FINISH_CLASS_LABELS,
  PIECE_KIND_LABELS,
  RESIN_LABELS,
  SUN_LABELS,
  USE_LABELS,
  type CareTaskKind,
  type CareTaskStatus,
} from "@/lib/care/vocabulary";
import { notFound } from "@/lib/errors";
import { scheduleFromRows, topShape, toCatalog } from "@/lib/pieces/care-inputs";
import { monthsText, whyNow } from "@/lib/reminders/content";
import { buildCareGuide, type CareGuide } from "./care-guide";
import { formatSize, formatThickness, type UnitSystem } from "@/lib/format";
import { warrantyLinesFor, type OwnerWarrantyLine } from "./warranty";

// The owner's reads. Every query filters by the signed-in owner's id; someone else's piece is a 404
// (DEVELOPERS.md), never a 403, so its existence is not revealed.

type Owner = Pick<User, "id" | "timeZone" | "unitSystem">;

/** The piece row if `owner` holds it now, else a 404. */
export function ownedPieceRow(owner: Pick<User, "id">, pieceId: string): Piece {
  if (typeof pieceId !== "string" || pieceId.length === 0 || pieceId.length > 64) throw notFound("No piece with that id among yours.");
  const row = getDb()
    .select()
    .from(pieces)
    .where(and(eq(pieces.id, pieceId), eq(pieces.ownerId, owner.id), isNull(pieces.archivedAt)))
    .get();
  if (!row) throw notFound("No piece with that id among yours.");
  return row;
}

/** Today's date for the owner: care logged "today" must never look like the future. */
export function ownerToday(owner: Pick<User, "timeZone">, now: Date): string {
  try {
    return localDate(now, owner.timeZone);
  } catch {
    return localDate(now, "UTC");
  }
}

function safeZone(tz: string): string {
  try {
    new Intl.DateTimeFormat("en-US", { timeZone: tz });
    return tz;
  } catch {
    return "UTC";
  }
}

export type TaskView = {
  key: string;
  kind: CareTaskKind;
  label: string;
  surface: CareTask["surface"];
  surfaceLabel: string;
  dueOn: string;
  daysUntilDue: number;
  status: CareTaskStatus;
  clockFrom: string;
  clockSource: CareTask["clockSource"];
  interval: string;
  reasons: string[];
  logUrl: string;
};

const SURFACE_LABELS: Record<CareTask["surface"], string> = { top: "Top", base: "Base", whole_piece: "Whole piece" };

export function taskView(pieceId: string, t: CareTask): TaskView {
  return {
    key: t.key,
    kind: t.kind,
    label: t.label,
    surface: t.surface,
    surfaceLabel: SURFACE_LABELS[t.surface],
    dueOn: t.dueOn,
    daysUntilDue: t.daysUntilDue,
    status: t.status,
    clockFrom: t.clockFrom,
    clockSource: t.clockSource,
    interval: monthsText(t.interval.months, t.interval.days),
    reasons: whyNow(t),
    logUrl: logTaskUrl(pieceId, t.key),
  };
}

/** The stable URL for "I did this" of one care task (care reminders link here). */
export function logTaskUrl(pieceId: string, taskKey: string): string {
  return `/pieces/${encodeURIComponent(pieceId)}/log?task=${encodeURIComponent(taskKey)}`;
}

/** The next task that wants attention: the earliest overdue/due/upcoming one, else the earliest. */
function nextTask(tasks: readonly CareTask[]): CareTask | undefined {
  return tasks.find((t) => t.status !== "done") ?? tasks[0];
}

/** The signed-in owner's pieces, from every studio, each with its next care task. */
export function listMyPieces(owner: Owner, now = new Date()) {
  const db = getDb();
  const rows = db
    .select({ piece: pieces, studioName: studios.name })
    .from(pieces)
    .innerJoin(studios, eq(studios.id, pieces.studioId))
    .where(and(eq(pieces.ownerId, owner.id), isNull(pieces.archivedAt)))
    .orderBy(desc(pieces.registeredAt), asc(pieces.title))
    .all();
  if (rows.length === 0) return [];
  const ids = rows.map((r) => r.piece.id);
  const studioIds = [...new Set(rows.map((r) => r.piece.studioId))];
  const layers = db.select().from(finishLayers).where(inArray(finishLayers.pieceId, ids)).all();
  const logs = db
    .select({ pieceId: careLogEntries.pieceId, taskKind: careLogEntries.taskKind, doneOn: careLogEntries.doneOn, surface: careLogEntries.surface })
    .from(careLogEntries)
    .where(inArray(careLogEntries.pieceId, ids))
    .all();
  const products = db.select().from(finishProducts).where(inArray(finishProducts.studioId, studioIds)).all();
  const timeZone = safeZone(owner.timeZone);
  return rows.map(({ piece, studioName }) => {
    const schedule = scheduleFromRows({
      piece,
      layers: layers.filter((l) => l.pieceId === piece.id),
      careLog: logs.filter((l) => l.pieceId === piece.id),
      products: products.filter((p) => p.studioId === piece.studioId),
      timeZone,
      now,
    });
    const next = nextTask(schedule.tasks);
    return {
      id: piece.id,
      title: piece.title,
      kind: piece.kind,
      kindLabel: PIECE_KIND_LABELS[piece.kind],
      studioName,
      deliveredOn: piece.deliveredOn,
      nextTask: next ? taskView(piece.id, next) : null,
      openTasks: schedule.tasks.filter((t) => t.status === "due" || t.status === "overdue").length,
    };
  });
}


/** The policy version the piece carries, else the studio's version in force at delivery, else none. */
function policyFor(piece: Piece): { version: number | null; policy: WarrantyPolicy } | null {
  const db = getDb();
  const row = piece.warrantyPolicyId
    ? db.select().from(warrantyPolicies).where(and(eq(warrantyPolicies.id, piece.warrantyPolicyId), eq(warrantyPolicies.studioId, piece.studioId))).get()
    : db
        .select()
        .from(warrantyPolicies)
        .where(and(eq(warrantyPolicies.studioId, piece.studioId), lte(warrantyPolicies.effectiveFrom, piece.deliveredOn)))
        .orderBy(desc(warrantyPolicies.version))
        .get();
  if (!row) return null;
  return { version: row.version, policy: row.policy ?? DEFAULT_WARRANTY_POLICY };
}

/** Whether `owner` is the piece's first owner (the warranty lines that do not transfer stay with them). */
export function isOriginalOwner(pieceId: string, ownerId: string): boolean {
  const first = getDb().select({ userId: ownerships.userId }).from(ownerships).where(eq(ownerships.pieceId, pieceId)).orderBy(asc(ownerships.startedAt)).get();
  return !first || first.userId === ownerId;
}

export type CareLogView = {
  id: string;
  taskKind: CareTaskKind;
  label: string;
  surface: string | null;
  doneOn: string;
  productUsed: string;
  notes: string;
  source: CareLogRow["source"];
  /** True when this owner logged it and may correct or delete it. */
  mine: boolean;
  byLabel: string;
  photoUrl: string | null;
};

function careLogView(rows: (CareLogRow & { photoId: string | null })[], ownerId: string): CareLogView[] {
  return rows.map((r) => {
    const mine = r.source === "owner" && r.userId === ownerId;
    const byLabel = r.source === "visit" ? "At a studio visit" : r.source === "studio" ? "Recorded by the studio" : mine ? "You" : "A previous owner";
    return {
      id: r.id,
      taskKind: r.taskKind,
      label: CARE_TASK_LABELS[r.taskKind],
      surface: r.surface,
      doneOn: r.doneOn,
      productUsed: r.productUsed,
      // A previous owner's notes and photos stay theirs; the dates and products are the piece's history.
      notes: mine || r.source !== "owner" ? r.notes : "",
      source: r.source,
      mine,
      byLabel,
      photoUrl: r.photoId && (mine || r.source !== "owner") ? `/api/files/${r.photoId}` : null,
    };
  });
}

function layerView(l: FinishLayer) {
  return {
    id: l.id,
    surface: l.surface,
    position: l.position,
    finishClass: l.finishClass,
    classLabel: FINISH_CLASS_LABELS[l.finishClass],
    productLabel: l.productLabel,
    coats: l.coats,
    appliedOn: l.appliedOn,
    batchLot: l.batchLot,
    notes: l.notes,
  };
}

export type PieceDetail = {
  id: string;
  title: string;
  kind: Piece["kind"];
  kindLabel: string;
  studio: { name: string; email: string };
  deliveredOn: string;
  registeredAt: number | null;
  size: string;
  thickness: string | null;
  species: { primary: string; secondary: string | null };
  resin: { kind: Piece["resinKind"]; label: string; tint: string | null; pouredOn: string | null };
  base: { material: string; finish: string };
  use: string;
  sun: string;
  units: UnitSystem;
  timeZone: string;
  layers: ReturnType<typeof layerView>[];
  schedule: { today: string; tasks: TaskView[]; notes: string[] };
  careLog: CareLogView[];
  guide: CareGuide;
  warranty: { version: number | null; policyName: string | null; isOriginalOwner: boolean; lines: OwnerWarrantyLine[] };
  certificateUrl: string;
};

function loadPieceParts(piece: Piece) {
  const db = getDb();
  const layers = db.select().from(finishLayers).where(eq(finishLayers.pieceId, piece.id)).orderBy(asc(finishLayers.surface), asc(finishLayers.position)).all();
  const log = db
    .select({ entry: careLogEntries, photoId: files.id })
    .from(careLogEntries)
    .leftJoin(files, eq(files.id, careLogEntries.photoFileId))
    .where(eq(careLogEntries.pieceId, piece.id))
    .orderBy(desc(careLogEntries.doneOn), desc(careLogEntries.createdAt))
    .all()
    .map((r) => ({ ...r.entry, photoId: r.photoId }));
  const products: FinishProduct[] = db.select().from(finishProducts).where(eq(finishProducts.studioId, piece.studioId)).all();
  const studio = db.select({ name: studios.name, email: studios.email }).from(studios).where(eq(studios.id, piece.studioId)).get()!;
  return { layers, log, products, studio };
}

/** Everything the owner's piece page shows, for a piece `owner` holds (else 404). */
export function getMyPiece(owner: Owner, pieceId: string, now = new Date()): PieceDetail {
  const piece = ownedPieceRow(owner, pieceId);
  const { layers, log, products, studio } = loadPieceParts(piece);
  const units: UnitSystem = owner.unitSystem === "imperial" ? "imperial" : "metric";
  const timeZone = safeZone(owner.timeZone);
  const schedule = scheduleFromRows({ piece, layers, careLog: log, products, timeZone, now });
  const policy = policyFor(piece);
  const original = isOriginalOwner(piece.id, owner.id);
  const primary = getSpecies(piece.primarySpeciesId);
  const secondary = piece.secondarySpeciesId ? getSpecies(piece.secondarySpeciesId) : undefined;
  return {
    id: piece.id,
    title: piece.title,
    kind: piece.kind,
    kindLabel: PIECE_KIND_LABELS[piece.kind],
    studio,
    deliveredOn: piece.deliveredOn,
    registeredAt: piece.registeredAt ? piece.registeredAt.getTime() : null,
    size: formatSize(piece, units),
    thickness: piece.thicknessMm ? formatThickness(piece.thicknessMm, units) : null,
    species: {
      primary: primary?.commonName ?? piece.primarySpeciesId.replace(/_/g, " "),
      secondary: piece.secondarySpeciesId ? (secondary?.commonName ?? piece.secondarySpeciesId.replace(/_/g, " ")) : null,
    },
    resin: { kind: piece.resinKind, label: RESIN_LABELS[piece.resinKind], tint: piece.resinTint, pouredOn: piece.resinPouredOn },
    base: { material: piece.baseMaterial, finish: piece.baseFinish },
    use: USE_LABELS[piece.use],
    sun: SUN_LABELS[piece.sun],
    units,
    timeZone,
    layers: layers.map(layerView),
    schedule: { today: schedule.today, tasks: schedule.tasks.map((t) => taskView(piece.id, t)), notes: schedule.notes },
    careLog: careLogView(log, owner.id),
    guide: buildCareGuide({
      layers: layers.map((l) => ({ surface: l.surface, finishClass: l.finishClass, productId: l.productId, productLabel: l.productLabel, appliedOn: l.appliedOn })),
      shape: topShape(piece),
      resin: piece.resinKind,
      use: piece.use,
      catalog: toCatalog(products),
      cureProducts: products,
      today: schedule.today,
      units,
    }),
    warranty: {
      version: policy?.version ?? null,
      policyName: policy?.policy.version ?? null,
      isOriginalOwner: original,
      lines: policy
        ? warrantyLinesFor(policy.policy, piece.deliveredOn, schedule.today, original, { resin: piece.resinKind, use: piece.use, hasEpoxyLayer: layers.some((l) => l.finishClass === "epoxy_surface") })
        : [],
    },
    certificateUrl: `/api/me/pieces/${piece.id}/certificate`,
  };
}

/** The schedule of a piece the owner holds, for the log form and after a change. */
export function myPieceSchedule(owner: Owner, piece: Piece, now = new Date()) {
  const { layers, log, products } = loadPieceParts(piece);
  return scheduleFromRows({ piece, layers, careLog: log, products, timeZone: safeZone(owner.timeZone), now });
}
