import { and, asc, desc, eq, inArray, isNull, sql } from "drizzle-orm";
import type { User } from "lucia";
import { cache } from "react";
import { bound } from "@/db/bound";
import { getDb, perConnection } from "@/db/client";
import {
  careLogEntries,
  files,
  finishLayers,
  finishProducts,
  pieces,
  studios,
  warrantyPolicies,
  type CareLogRow,
  type FinishLayer,
  type FinishProduct,
  type Piece,
} from "@/db/schema";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
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
import { formatSize, formatThickness, isTimeZone, type UnitSystem } from "@/lib/format";
import { brandOf, type StudioBrand } from "@/lib/studio/brand";
import { warrantyTermsName } from "@/lib/claims/coverage";
import { warrantyLinesFor, type OwnerWarrantyLine } from "./warranty";

// The owner's reads. Every query filters by the signed-in owner's id; someone else's piece is a 404
// (DEVELOPERS.md), never a 403, so its existence is not revealed.

type Owner = Pick<User, "id" | "timeZone" | "unitSystem">;

/** The piece row if `owner` holds it now, else a 404. Prepared once per connection: the piece pages' layout and sections each ask. */
export function ownedPieceRow(owner: Pick<User, "id">, pieceId: string): Piece {
  if (typeof pieceId !== "string" || pieceId.length === 0 || pieceId.length > 64) throw notFound("No piece with that id among yours.");
  const row = ownedRead(getDb()).get({ pieceId, ownerId: owner.id });
  if (!row) throw notFound("No piece with that id among yours.");
  return row;
}

const ownedRead = perConnection((db) =>
  db
    .select()
    .from(pieces)
    .where(and(eq(pieces.id, bound(sql.placeholder("pieceId"))), eq(pieces.ownerId, bound(sql.placeholder("ownerId"))), isNull(pieces.archivedAt)))
    .prepare(),
);

/**
 * What the piece's pages show around the piece, in one read shared by the layout and the page (once
 * per request): the brand of the studio that made it, and whether the piece has anything at all for
 * the sections that are often empty — a conversation, a studio visit, a care plan (or its studio any
 * plan template). Each flag is a superset of its section's own rule; a section whose flag is false
 * would render nothing, so its full query is skipped. Null when `owner` does not hold the piece.
 */
export type OwnedPieceShell = { brand: StudioBrand; has: { conversations: boolean; visits: boolean; plans: boolean } };

export const ownedPieceShell = cache((owner: Pick<User, "id">, pieceId: string): OwnedPieceShell | null => {
  if (typeof pieceId !== "string" || pieceId.length === 0 || pieceId.length > 64) return null;
  const row = shellRead(getDb()).get({ pieceId, ownerId: owner.id }) as ShellRow | undefined;
  if (!row) return null;
  return {
    brand: brandOf({ id: row.studioId, name: row.name, logoKey: row.logoKey, accent: row.accent }),
    has: { conversations: row.conversations === 1, visits: row.visits === 1, plans: row.plans === 1 },
  };
});

type ShellRow = { studioId: string; name: string; logoKey: string | null; accent: string; conversations: number; visits: number; plans: number };

const shellRead = perConnection((db) =>
  db.$client.prepare(`SELECT s.id AS studioId, s.name, s.logo_key AS logoKey, s.accent,
      EXISTS (SELECT 1 FROM threads t WHERE t.piece_id = p.id) AS conversations,
      EXISTS (SELECT 1 FROM visits v WHERE v.piece_id = p.id) AS visits,
      (EXISTS (SELECT 1 FROM plan_subscriptions ps WHERE ps.piece_id = p.id) OR EXISTS (SELECT 1 FROM plan_templates pt WHERE pt.studio_id = p.studio_id)) AS plans
    FROM pieces p JOIN studios s ON s.id = p.studio_id
    WHERE p.id = +@pieceId AND p.owner_id = +@ownerId AND p.archived_at IS NULL`),
);

/** Today's date for the owner: care logged "today" must never look like the future. */
export function ownerToday(owner: Pick<User, "timeZone">, now: Date): string {
  try {
    return localDate(now, owner.timeZone);
  } catch {
    return localDate(now, "UTC");
  }
}

const zoneChecked = new Map<string, string>();

/** The zone if the runtime knows it, else UTC; remembered per process (building a formatter to ask costs ~0.1 ms). */
function safeZone(tz: string): string {
  let zone = zoneChecked.get(tz);
  if (zone === undefined) {
    zone = isTimeZone(tz) ? tz : "UTC";
    if (zoneChecked.size < 1000) zoneChecked.set(tz, zone);
  }
  return zone;
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
  /** `termsName`: the studio's terms the piece carries, in words ("Warranty terms for deliveries from 1 January 2024"), or null. */
  warranty: { termsName: string | null; isOriginalOwner: boolean; lines: OwnerWarrantyLine[] };
  certificateUrl: string;
};

// The piece page's reads, built and prepared once per connection (the page owners open most: building
// a drizzle query costs about as much as running it). Four reads: the piece with its studio, its
// warranty policy and its first owner; its layers; its care log; the studio's catalog.
// The piece's id and its owner's are bound as `+?` here, in ownedRead and as `+@…` in shellRead
// (db/bound.ts): by the piece's primary key, or the few rows of one piece in its own index, whichever
// piece, so these are planned once per connection instead of on every read. The studio's catalog keeps
// `?`: how much of the table one studio holds may rightly change its plan.
const pageReads = perConnection((db) => {
  const id = bound(sql.placeholder("pieceId"));
  const policyId = sql`coalesce(${pieces.warrantyPolicyId}, (SELECT wp.id FROM warranty_policies wp WHERE wp.studio_id = ${pieces.studioId} AND wp.effective_from <= ${pieces.deliveredOn} ORDER BY wp.version DESC LIMIT 1))`;
  return {
    piece: db
      .select({
        piece: pieces,
        studioName: studios.name,
        studioEmail: studios.email,
        policyVersion: warrantyPolicies.version,
        policyEffectiveFrom: warrantyPolicies.effectiveFrom,
        policy: warrantyPolicies.policy,
        firstOwnerId: sql<string | null>`(SELECT o.user_id FROM ownerships o WHERE o.piece_id = ${pieces.id} ORDER BY o.started_at LIMIT 1)`,
      })
      .from(pieces)
      .innerJoin(studios, eq(studios.id, pieces.studioId))
      .leftJoin(warrantyPolicies, and(eq(warrantyPolicies.id, policyId), eq(warrantyPolicies.studioId, pieces.studioId)))
      .where(and(eq(pieces.id, id), eq(pieces.ownerId, bound(sql.placeholder("ownerId"))), isNull(pieces.archivedAt)))
      .prepare(),
    layers: db.select().from(finishLayers).where(eq(finishLayers.pieceId, id)).orderBy(asc(finishLayers.surface), asc(finishLayers.position)).prepare(),
    careLog: db
      .select({ entry: careLogEntries, photoId: files.id })
      .from(careLogEntries)
      .leftJoin(files, eq(files.id, careLogEntries.photoFileId))
      .where(eq(careLogEntries.pieceId, id))
      .orderBy(desc(careLogEntries.doneOn), desc(careLogEntries.createdAt))
      .prepare(),
    products: db.select().from(finishProducts).where(eq(finishProducts.studioId, sql.placeholder("studioId"))).prepare(),
  };
});

function loadPieceParts(piece: Piece) {
  const reads = pageReads(getDb());
  const layers = reads.layers.all({ pieceId: piece.id });
  const log = reads.careLog.all({ pieceId: piece.id }).map((r) => ({ ...r.entry, photoId: r.photoId }));
  const products: FinishProduct[] = reads.products.all({ studioId: piece.studioId });
  return { layers, log, products };
}

// The care guide depends only on what it is given: the same inputs give the same guide for this
// process's life, so the last 500 are kept by their inputs (the page owners open most builds it once).
const guides = new Map<string, CareGuide>();
function careGuideFor(input: Parameters<typeof buildCareGuide>[0]): CareGuide {
  const key = JSON.stringify(input);
  let guide = guides.get(key);
  if (guide) {
    guides.delete(key); // most recently used last
  } else {
    guide = buildCareGuide(input);
    if (guides.size >= 500) guides.delete(guides.keys().next().value!);
  }
  guides.set(key, guide);
  return guide;
}

/** Everything the owner's piece page shows, for a piece `owner` holds (else 404). */
export function getMyPiece(owner: Owner, pieceId: string, now = new Date()): PieceDetail {
  if (typeof pieceId !== "string" || pieceId.length === 0 || pieceId.length > 64) throw notFound("No piece with that id among yours.");
  const row = pageReads(getDb()).piece.get({ pieceId, ownerId: owner.id });
  if (!row) throw notFound("No piece with that id among yours.");
  const { piece } = row;
  const { layers, log, products } = loadPieceParts(piece);
  const studio = { name: row.studioName, email: row.studioEmail };
  const units: UnitSystem = owner.unitSystem === "imperial" ? "imperial" : "metric";
  const timeZone = safeZone(owner.timeZone);
  const schedule = scheduleFromRows({ piece, layers, careLog: log, products, timeZone, now });
  // The policy version the piece carries, else the studio's version in force at delivery, else none.
  const policy = row.policyVersion !== null ? { effectiveFrom: row.policyEffectiveFrom!, policy: row.policy ?? DEFAULT_WARRANTY_POLICY } : null;
  // The first owner keeps the warranty lines that do not pass to a new owner.
  const original = row.firstOwnerId === null || row.firstOwnerId === owner.id;
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
    thickness: piece.thicknessMm ? formatThickness(piece.thicknessMm, units, { quarters: false }) : null,
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
    guide: careGuideFor({
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
      termsName: policy ? warrantyTermsName(policy.effectiveFrom) : null,
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
