import type { TopShape } from "./area";
import { addDays, addMonths, assertTimeZone, diffDays, fromDayNumber, localDate, toDayNumber, parseIsoDate, toEpochMs, type InstantInput, type IsoDate } from "./dates";
import { CareInputError } from "./errors";
import {
  ANNUAL_CHECK_MONTHS,
  DEFAULT_WEAR_INTERVALS,
  effectiveInterval,
  bandForUse,
  type EffectiveInterval,
  type UseBand,
  type WearIntervals,
} from "./intervals";
import {
  CARE_TASK_KINDS,
  CARE_TASK_LABELS,
  FINISH_CLASSES,
  REFRESH_TASK_KINDS,
  TASK_KIND_BY_FINISH_CLASS,
  type CareTaskKind,
  type CareTaskStatus,
  type FinishClass,
  type PieceKind,
  type ReminderStep,
  type ResinKind,
  type SunExposure,
  type Surface,
  type Use,
} from "./vocabulary";

/** What the care engine needs of a piece record. */
export interface CarePiece {
  id: string;
  kind: PieceKind;
  use: Use;
  sun: SunExposure;
  /** Delivery date, YYYY-MM-DD. */
  deliveredOn: IsoDate;
  resin: ResinKind;
  shape?: TopShape;
  /** Species id from lib/care/species.ts, for movement checks. */
  primarySpeciesId?: string;
  /** How the top's boards or slab were sawn; live-edge slabs are usually flat-sawn (the default). */
  grain?: "flat" | "quarter";
}

/** One entry of the finish stack. */
export interface CareFinishLayer {
  id: string;
  surface: Surface;
  finishClass: FinishClass;
  /** Catalog entry id of the product used, if known. */
  productId?: string;
  coats: number;
  appliedOn: IsoDate;
}

/** Care done, self-logged by the owner or recorded at a visit. Without `surface` it counts for every surface. */
export interface CareLogEntry {
  taskKind: CareTaskKind;
  doneOn: IsoDate;
  surface?: Surface;
}

/** A finish product of the studio's catalog. */
export interface CatalogEntry {
  id: string;
  name?: string;
  finishClass: FinishClass;
  /** Coverage of one coat, m² per litre. */
  coverageM2PerL: number;
  containerSizesMl: readonly number[];
  /** Price of one container by its size in mL, minor units of the quote currency. */
  containerPricesMinor?: Readonly<Record<number, number>>;
  /** Overrides the default wear intervals (DEFAULT_WEAR_INTERVALS in ./intervals.ts), months. */
  intervals?: Partial<WearIntervals>;
  /** Coats a refresh applies (default 1). */
  refreshCoats?: number;
}

/**
 * Which surfaces carry a care clock:
 * - "top": layers on the top and on its edges (edges are cared for with the top); interval by the piece's use.
 * - "base": layers on the base; a base sees little wear, so it uses the light-use interval, except on
 *   outdoor pieces (heavy). Direct sun shortens both.
 * - "whole_piece": the yearly clean-and-check.
 */
export type TaskSurface = "top" | "base" | "whole_piece";

export interface CareReminder {
  step: ReminderStep;
  on: IsoDate;
}

export interface CareTask {
  /** Stable: pieceId + kind + surface. A send ledger is unique on (key, dueOn, step) — see reminderKey. */
  key: string;
  pieceId: string;
  kind: CareTaskKind;
  label: string;
  surface: TaskSurface;
  finishClass: FinishClass | null;
  /** A paid refresh visit would do this task (refresh offers attach to it). */
  isRefresh: boolean;
  /** The layer or catalog product that set the clock. */
  layerId: string | null;
  productId: string | null;
  interval: EffectiveInterval;
  /**
   * Where the interval came from, as data for the words a page builds: the studio's catalog product,
   * or the usual interval for the finish class (intervals.ts DEFAULT_INTERVAL_SOURCE keeps the sources
   * of those; they stay in code, never in words shown to people). `unknownProductId`: the layer names a
   * product the catalog no longer holds.
   */
  intervalFrom:
    | { kind: "catalog"; productId: string; productName: string | null }
    | { kind: "usual"; finishClass: FinishClass | null; unknownProductId: string | null };
  /** A topcoat over hardwax oil: the oil is cared for through this task, on the longer of the two intervals. */
  oilBeneath: { topcoat: EffectiveInterval; oil: EffectiveInterval } | null;
  /** The date the clock runs from and why. */
  clockFrom: IsoDate;
  clockSource: "layer" | "care_log" | "delivery";
  dueOn: IsoDate;
  reminders: CareReminder[];
  status: CareTaskStatus;
  /** dueOn − today in days (negative when overdue). */
  daysUntilDue: number;
  reasons: string[];
}

export interface CareScheduleInput {
  piece: CarePiece;
  finishLayers: readonly CareFinishLayer[];
  careLog: readonly CareLogEntry[];
  catalog: readonly CatalogEntry[];
  now: InstantInput;
  /** The studio's IANA time zone; "today" is the date of `now` there. Default "UTC". */
  timeZone?: string;
}

export interface CareSchedule {
  pieceId: string;
  today: IsoDate;
  timeZone: string;
  /** Sorted by due date, then kind. */
  tasks: CareTask[];
  /** Inputs that were ignored and why (e.g. care logged in the future). */
  notes: string[];
}

/** Reminders go out 14 days before, on the day, and 30 days after. */
export const REMINDER_OFFSETS_DAYS: Record<ReminderStep, number> = { before_14d: -14, due_day: 0, after_30d: 30 };

export function taskKey(pieceId: string, kind: CareTaskKind, surface: TaskSurface): string {
  return `${pieceId}:${kind}:${surface}`;
}

/** A unique key for one reminder e-mail of one cycle of a task. */
export function reminderKey(task: Pick<CareTask, "key" | "dueOn">, step: ReminderStep): string {
  return `${task.key}:${task.dueOn}:${step}`;
}

export function isRefreshTask(kind: CareTaskKind): boolean {
  return REFRESH_TASK_KINDS.includes(kind);
}

const CLASS_NOUN: Record<FinishClass, string> = {
  hardwax_oil: "oil coat",
  ceramic_topcoat: "topcoat",
  paste_wax: "wax coat",
  film_finish: "film finish coat",
  epoxy_surface: "resin surface",
  charred_oiled: "oil coat on the charred surface",
};

const USE_PHRASE: Record<Use, string> = {
  heavy: "heavy use",
  moderate: "moderate use",
  light: "light use",
  outdoor_covered: "outdoor (covered), counted as heavy use",
};

const SUN_PHRASE: Record<SunExposure, string> = { none: "no sun", indirect: "indirect sun", direct: "direct sun" };

// A reminder pass calls careSchedule for many pieces with the same now, in a few studios' zones
// that alternate from piece to piece: one entry per zone, for the last instant asked.
const cachedToday = new Map<string, { now: string | number; date: IsoDate }>();

function todayIn(now: InstantInput, timeZone: string): IsoDate {
  const key = now instanceof Date ? now.getTime() : now;
  const hit = cachedToday.get(timeZone);
  if (hit && hit.now === key) return hit.date;
  const date = localDate(toEpochMs(now, "now"), timeZone);
  if (cachedToday.size > 64) cachedToday.clear();
  cachedToday.set(timeZone, { now: key, date });
  return date;
}

/**
 * Status of a task relative to today:
 * - overdue: today is after the due date;
 * - due: today is inside the reminder window (from 14 days before the due date to the due date);
 * - done: the current cycle was started by care (a care-log entry, or a layer applied after delivery —
 *   a refresh) and the next cycle's window has not opened yet;
 * - upcoming: otherwise.
 */
export function taskStatus(today: IsoDate, dueOn: IsoDate, startedByCare: boolean): CareTaskStatus {
  return statusFromDays(diffDays(today, dueOn), startedByCare);
}

function statusFromDays(daysUntilDue: number, startedByCare: boolean): CareTaskStatus {
  if (daysUntilDue < 0) return "overdue";
  if (daysUntilDue <= -REMINDER_OFFSETS_DAYS.before_14d) return "due";
  return startedByCare ? "done" : "upcoming";
}

function validatePiece(piece: CarePiece): void {
  if (!piece || typeof piece.id !== "string" || piece.id === "") throw new CareInputError("piece.id is required", "piece.id");
  parseIsoDate(piece.deliveredOn, "piece.deliveredOn");
  bandForUse(piece.use);
  if (!(piece.sun in SUN_PHRASE)) throw new CareInputError(`unknown sun exposure ${JSON.stringify(piece.sun)}`, "piece.sun");
}

/**
 * The wear interval a layer's clock runs on: the catalog product's months for the band if it has them,
 * else the default in ./intervals.ts; the band is the piece's use (base: light unless outdoor); direct sun × 0.75.
 */
export function layerInterval(
  piece: Pick<CarePiece, "use" | "sun">,
  layer: Pick<CareFinishLayer, "surface" | "finishClass" | "productId">,
  catalog: readonly CatalogEntry[],
): { interval: EffectiveInterval; product: CatalogEntry | undefined; catalogMonths: number | undefined } {
  const cls = layer.finishClass;
  const product = layer.productId === undefined ? undefined : catalog.find((c) => c.id === layer.productId);
  const band: UseBand = surfaceGroup(layer.surface) === "base" && piece.use !== "outdoor_covered" ? "light" : bandForUse(piece.use);
  const catalogMonths = product && product.finishClass === cls ? product.intervals?.[band] : undefined;
  const months = catalogMonths ?? DEFAULT_WEAR_INTERVALS[cls][band];
  return { interval: cachedInterval(months, band, piece.sun), product, catalogMonths };
}

const intervalCache = new Map<number, (EffectiveInterval | undefined)[]>();

/** effectiveInterval, memoised by months, then band × sun (frozen: tasks share the object). */
function cachedInterval(months: number, band: UseBand, sun: SunExposure): EffectiveInterval {
  let row = intervalCache.get(months);
  if (!row) {
    row = new Array(9);
    if (intervalCache.size < 1000) intervalCache.set(months, row);
  }
  const i = (band === "heavy" ? 0 : band === "moderate" ? 3 : 6) + (sun === "none" ? 0 : sun === "indirect" ? 1 : 2);
  let hit = row[i];
  if (!hit) hit = row[i] = Object.freeze(effectiveInterval({ heavy: months, moderate: months, light: months }, band, sun));
  return hit;
}

/**
 * Stacked layers (the rule, also in SOURCES.md): a hardwax-oil layer under a ceramic-type topcoat
 * applied the same day or later on the same surface group has no clock of its own — the topcoat task
 * cares for the stack — and that task runs on the longer of the topcoat's and the oil's intervals:
 * a topcoat protects what is under it, so it never brings the care of the oil forward. (Reasoning
 * from how the layers wear, common practice, no published source.) Oil applied after the topcoat
 * (the topcoat worn away and the surface re-oiled) keeps its own clock.
 */
export function protectedByTopcoat(oil: Pick<CareFinishLayer, "appliedOn">, topcoat: Pick<CareFinishLayer, "appliedOn"> | undefined): boolean {
  return topcoat !== undefined && topcoat.appliedOn >= oil.appliedOn;
}

/**
 * The interval a layer's clock runs on, with the stacked-layer rule: for a topcoat over oil (`beneath`,
 * protected per protectedByTopcoat), the longer of the two layers' intervals.
 */
export function stackedLayerInterval(
  piece: Pick<CarePiece, "use" | "sun">,
  layer: Pick<CareFinishLayer, "surface" | "finishClass" | "productId">,
  beneath: Pick<CareFinishLayer, "surface" | "finishClass" | "productId"> | undefined,
  catalog: readonly CatalogEntry[],
): ReturnType<typeof layerInterval> & { setBy: "layer" | "beneath"; beneathInterval?: EffectiveInterval } {
  const own = layerInterval(piece, layer, catalog);
  if (!beneath) return { ...own, setBy: "layer" };
  const under = layerInterval(piece, beneath, catalog);
  const longer = under.interval.months > own.interval.months || (under.interval.months === own.interval.months && under.interval.days > own.interval.days);
  return longer ? { ...under, setBy: "beneath", beneathInterval: under.interval } : { ...own, setBy: "layer", beneathInterval: under.interval };
}

/** Due date of a clock started on `from`: whole months (clamped to month end), then the extra days. */
export function dueDate(from: IsoDate, interval: Pick<EffectiveInterval, "months" | "days">): IsoDate {
  return addDays(addMonths(from, interval.months), interval.days);
}

export function surfaceGroup(surface: Surface): "top" | "base" {
  return surface === "base" ? "base" : "top";
}

const CLASS_COUNT = FINISH_CLASSES.length;
const SLOTS = CLASS_COUNT * 2;
const HARDWAX_INDEX = FINISH_CLASSES.indexOf("hardwax_oil");
const CERAMIC_INDEX = FINISH_CLASSES.indexOf("ceramic_topcoat");
const LOG_TOP = 0;
const LOG_BASE = 1;
const LOG_UNSPECIFIED = 2;
const LOG_ANY = 3;

/** The latest logged date of a kind for a surface group (entries without a surface count for every group). */
function lastLogged(logged: readonly (IsoDate | undefined)[] | null, kind: CareTaskKind, group: number): IsoDate | undefined {
  if (!logged) return undefined;
  const k = CARE_TASK_KINDS.indexOf(kind) * 4;
  if (group === LOG_ANY) return logged[k + LOG_ANY];
  const a = logged[k + group];
  const b = logged[k + LOG_UNSPECIFIED];
  return a === undefined ? b : b === undefined || a > b ? a : b;
}

function byDueThenKind(a: CareTask, b: CareTask): number {
  return a.dueOn < b.dueOn ? -1 : a.dueOn > b.dueOn ? 1 : a.kind < b.kind ? -1 : a.kind > b.kind ? 1 : 0;
}

/** The care tasks of one piece from its finish stack, care log and the studio's catalog. */
export function careSchedule(input: CareScheduleInput): CareSchedule {
  const { piece, finishLayers, careLog, catalog } = input;
  const timeZone = input.timeZone ?? "UTC";
  assertTimeZone(timeZone);
  validatePiece(piece);
  const today = todayIn(input.now, timeZone);
  const notes: string[] = [];

  // Newest layer per (surface group, class) in fixed slots: top classes 0–5, base classes 6–11.
  // A later entry in the stack wins a same-day tie.
  const newest: (CareFinishLayer | undefined)[] = new Array(SLOTS);
  for (let i = 0; i < finishLayers.length; i++) {
    const layer = finishLayers[i]!;
    const c = FINISH_CLASSES.indexOf(layer.finishClass);
    if (c < 0) throw new CareInputError(`finishLayers[${i}].finishClass is unknown: ${JSON.stringify(layer.finishClass)}`, "finishLayers.finishClass");
    parseIsoDate(layer.appliedOn, `finishLayers[${i}].appliedOn`);
    if (layer.appliedOn > today) {
      notes.push(`layer ${layer.id} is dated ${layer.appliedOn}, after today (${today}); ignored`);
      continue;
    }
    const slot = (layer.surface === "base" ? CLASS_COUNT : 0) + c;
    const prev = newest[slot];
    if (!prev || layer.appliedOn >= prev.appliedOn) newest[slot] = layer;
  }

  // Latest care-log date per kind × (top, base, no surface given, any).
  const logged: (IsoDate | undefined)[] | null = careLog.length > 0 ? new Array(CARE_TASK_KINDS.length * 4) : null;
  for (let i = 0; i < careLog.length; i++) {
    const entry = careLog[i]!;
    const k = CARE_TASK_KINDS.indexOf(entry.taskKind);
    if (k < 0) throw new CareInputError(`careLog[${i}].taskKind is unknown: ${JSON.stringify(entry.taskKind)}`, "careLog.taskKind");
    parseIsoDate(entry.doneOn, `careLog[${i}].doneOn`);
    if (entry.doneOn > today) {
      notes.push(`care log entry ${entry.taskKind} on ${entry.doneOn} is after today (${today}); ignored`);
      continue;
    }
    const g = entry.surface === undefined ? LOG_UNSPECIFIED : entry.surface === "base" ? LOG_BASE : LOG_TOP;
    for (const idx of [k * 4 + g, k * 4 + LOG_ANY]) {
      const prev = logged![idx];
      if (prev === undefined || entry.doneOn > prev) logged![idx] = entry.doneOn;
    }
  }

  const tasks: CareTask[] = [];
  const band = bandForUse(piece.use);
  for (let slot = 0; slot < SLOTS; slot++) {
    const layer = newest[slot];
    if (!layer) continue;
    const group = slot < CLASS_COUNT ? "top" : "base";
    const cls = layer.finishClass;
    if (cls === "hardwax_oil" && protectedByTopcoat(layer, newest[slot - HARDWAX_INDEX + CERAMIC_INDEX])) continue; // cared for through the topcoat task
    const oilBeneath = cls === "ceramic_topcoat" ? newest[slot - CERAMIC_INDEX + HARDWAX_INDEX] : undefined;
    const beneath = oilBeneath && protectedByTopcoat(oilBeneath, layer) ? oilBeneath : undefined;
    const kind = TASK_KIND_BY_FINISH_CLASS[cls];
    const { interval, product, catalogMonths, setBy, beneathInterval } = stackedLayerInterval(piece, layer, beneath, catalog);
    const intervalClass = setBy === "beneath" ? beneath!.finishClass : cls;
    const taskBand = interval.band;

    const log = lastLogged(logged, kind, group === "base" ? LOG_BASE : LOG_TOP);
    const byLog = log !== undefined && log >= layer.appliedOn;
    const clockFrom = byLog ? log : layer.appliedOn;
    const dueOn = dueDate(clockFrom, interval);
    const startedByCare = byLog || layer.appliedOn > piece.deliveredOn;

    const label = CARE_TASK_LABELS[kind];
    const since = byLog ? `last logged ${label.toLowerCase()} ${clockFrom}` : `last ${CLASS_NOUN[cls]} ${clockFrom}`;
    const usePhrase = group === "base" && taskBand === "light" ? "base, light wear" : USE_PHRASE[piece.use];
    const reasons = [`${label.toLowerCase()} (${group}) due ${dueOn}: ${since}, ${usePhrase}, ${SUN_PHRASE[piece.sun]} (${interval.text})`];
    const intervalLayer = setBy === "beneath" ? beneath! : layer;
    const unknownProductId = intervalLayer.productId !== undefined && !product ? intervalLayer.productId : null;
    const intervalFrom: CareTask["intervalFrom"] =
      catalogMonths !== undefined && product
        ? { kind: "catalog", productId: product.id, productName: product.name ?? null }
        : { kind: "usual", finishClass: intervalClass, unknownProductId };
    reasons.push(
      intervalFrom.kind === "catalog"
        ? `interval from catalog product ${product?.name ?? product?.id}`
        : `default interval for ${intervalClass}` + (unknownProductId !== null ? `; product ${unknownProductId} is not in the catalog` : ""),
    );
    const stacked = beneath ? { topcoat: layerInterval(piece, layer, catalog).interval, oil: beneathInterval! } : null;
    if (stacked) {
      reasons.push(
        `the hardwax oil beneath is protected by the topcoat; refreshing the topcoat is its care, on the longer of the two intervals ` +
          `(topcoat alone ${stacked.topcoat.text}, oil alone ${stacked.oil.text})`,
      );
    }
    tasks.push(
      makeTask(piece.id, kind, group, cls, layer.id, layer.productId ?? null, interval, intervalFrom, stacked, clockFrom, byLog ? "care_log" : "layer", dueOn, today, startedByCare, reasons),
    );
  }

  // Yearly clean-and-check of the whole piece, from delivery or the last logged check.
  const lastCheck = lastLogged(logged, "annual_check", LOG_ANY);
  const checkByLog = lastCheck !== undefined && lastCheck >= piece.deliveredOn;
  const checkFrom = checkByLog ? lastCheck : piece.deliveredOn;
  const checkInterval = cachedInterval(ANNUAL_CHECK_MONTHS, band, "none");
  const checkDue = addMonths(checkFrom, checkInterval.months);
  tasks.push(
    // The yearly interval's source is on ANNUAL_CHECK_MONTHS (intervals.ts); it stays in code.
    makeTask(piece.id, "annual_check", "whole_piece", null, null, null, checkInterval, { kind: "usual", finishClass: null, unknownProductId: null }, null, checkFrom, checkByLog ? "care_log" : "delivery", checkDue, today, checkByLog, [
      `annual clean and check due ${checkDue}: ${checkByLog ? `last logged check ${checkFrom}` : `delivered ${checkFrom}`} (every 12 mo)`,
    ]),
  );

  tasks.sort(byDueThenKind);
  return { pieceId: piece.id, today, timeZone, tasks, notes };
}

function makeTask(
  pieceId: string,
  kind: CareTaskKind,
  surface: TaskSurface,
  finishClass: FinishClass | null,
  layerId: string | null,
  productId: string | null,
  interval: EffectiveInterval,
  intervalFrom: CareTask["intervalFrom"],
  oilBeneath: CareTask["oilBeneath"],
  clockFrom: IsoDate,
  clockSource: CareTask["clockSource"],
  dueOn: IsoDate,
  today: IsoDate,
  startedByCare: boolean,
  reasons: string[],
): CareTask {
  const dueDay = toDayNumber(dueOn);
  const daysUntilDue = dueDay - toDayNumber(today);
  const status = statusFromDays(daysUntilDue, startedByCare);
  if (status === "overdue") reasons.push(`overdue by ${-daysUntilDue} day${daysUntilDue === -1 ? "" : "s"} on ${today}`);
  else if (status === "done") reasons.push(`done: ${clockSource === "care_log" ? "care logged" : "refreshed"} ${clockFrom}`);
  return {
    key: taskKey(pieceId, kind, surface),
    pieceId,
    kind,
    label: CARE_TASK_LABELS[kind],
    surface,
    finishClass,
    isRefresh: isRefreshTask(kind),
    layerId,
    productId,
    interval,
    intervalFrom,
    oilBeneath,
    clockFrom,
    clockSource,
    dueOn,
    reminders: [
      { step: "before_14d", on: fromDayNumber(dueDay + REMINDER_OFFSETS_DAYS.before_14d) },
      { step: "due_day", on: dueOn },
      { step: "after_30d", on: fromDayNumber(dueDay + REMINDER_OFFSETS_DAYS.after_30d) },
    ],
    status,
    daysUntilDue,
    reasons,
  };
}
