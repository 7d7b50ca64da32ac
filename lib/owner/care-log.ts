import "server-only";
import { and, eq } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { careLogEntries, files, type CareLogRow, type Piece } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { CareSchedule } from "@/lib/care/schedule";
import { CARE_TASK_LABELS, type CareTaskKind, type Surface } from "@/lib/care/vocabulary";
import { badRequest, notFound } from "@/lib/errors";
import { removeStoredFiles, storeImage } from "@/lib/storage";
import type { CareLogPatch, CareLogValues } from "@/lib/validation/owner";
import { formatDate } from "@/lib/format";
import { myPieceSchedule, ownedPieceRow, ownerToday, taskView, type TaskView } from "./pieces";

// "I did this": the owner logs care done on a piece they hold; the care engine then restarts that
// task's clock (careSchedule reads the care log). Owners correct or delete only their own entries.

type Owner = Pick<User, "id" | "timeZone" | "unitSystem">;

function storedSurface(surface: CareLogValues["surface"]): Surface | null {
  return surface === "whole_piece" ? null : surface;
}

function taskSurfaceOf(kind: CareTaskKind, surface: Surface | null): "top" | "base" | "whole_piece" {
  if (kind === "annual_check" || surface === null) return kind === "annual_check" ? "whole_piece" : "top";
  return surface === "base" ? "base" : "top";
}

/** Field checks that need the piece and the owner's today. */
function checkAgainstPiece(owner: Owner, piece: Piece, v: Pick<CareLogValues, "taskKind" | "surface" | "doneOn">, now: Date) {
  const today = ownerToday(owner, now);
  if (v.doneOn > today) throw badRequest("That date is in the future.", { doneOn: [`Pick today (${formatDate(today)}) or an earlier day.`] });
  if (v.doneOn < piece.deliveredOn) throw badRequest("That is before the piece was delivered.", { doneOn: [`The piece was delivered on ${formatDate(piece.deliveredOn)}; pick that day or later.`] });
  const schedule = myPieceSchedule(owner, piece, now);
  const surface = storedSurface(v.surface);
  const wanted = taskSurfaceOf(v.taskKind, surface);
  const task = schedule.tasks.find((t) => t.kind === v.taskKind && t.surface === wanted);
  if (!task) {
    const kinds = [...new Set(schedule.tasks.map((t) => CARE_TASK_LABELS[t.kind].toLowerCase()))].join(", ");
    throw badRequest("That care task isn't part of this piece's schedule.", { taskKind: [`This piece's care tasks are: ${kinds}.`] });
  }
  return { surface: v.taskKind === "annual_check" ? null : surface };
}

function afterView(owner: Owner, piece: Piece, kind: CareTaskKind, surface: Surface | null, now: Date) {
  const schedule: CareSchedule = myPieceSchedule(owner, piece, now);
  const wanted = taskSurfaceOf(kind, surface);
  const t = schedule.tasks.find((x) => x.kind === kind && x.surface === wanted);
  return t ? taskView(piece.id, t) : null;
}

export type CareLogResult = { entry: Pick<CareLogRow, "id" | "taskKind" | "surface" | "doneOn" | "productUsed" | "notes" | "photoFileId">; task: TaskView | null };

/**
 * Logs care on a piece the owner holds (else 404), with an optional photo (checked, re-encoded and
 * stored by lib/storage as a "care_log_photo" file). Returns the entry and the task's new due date
 * and reasons.
 */
export async function addCareLogEntry(owner: Owner, pieceId: string, values: CareLogValues, photo?: Uint8Array | null, now = new Date()): Promise<CareLogResult> {
  const piece = ownedPieceRow(owner, pieceId);
  const { surface } = checkAgainstPiece(owner, piece, values, now);
  const stored = photo && photo.byteLength > 0 ? await storeImage(photo, owner.id) : null;
  const db = getDb();
  let entry: CareLogResult["entry"];
  try {
    entry = db.transaction((tx) => {
      const file = stored
        ? tx
            .insert(files)
            .values({ studioId: piece.studioId, purpose: "care_log_photo", pieceId: piece.id, ...stored, uploadedById: owner.id })
            .returning({ id: files.id })
            .get()
        : null;
      const row = tx
        .insert(careLogEntries)
        .values({
          studioId: piece.studioId,
          pieceId: piece.id,
          userId: owner.id,
          source: "owner",
          taskKind: values.taskKind,
          surface,
          doneOn: values.doneOn,
          productUsed: values.productUsed,
          notes: values.notes,
          photoFileId: file?.id ?? null,
        })
        .returning()
        .get();
      recordAudit(tx, { studioId: piece.studioId, actorId: owner.id, action: "care_log.added", subjectType: "care_log_entry", subjectId: row.id, data: { taskKind: row.taskKind, doneOn: row.doneOn } });
      return row;
    });
  } catch (e) {
    if (stored) await removeStoredFiles(stored.storageKey, stored.thumbKey);
    throw e;
  }
  return { entry: pick(entry), task: afterView(owner, piece, values.taskKind, surface, now) };
}

function pick(r: CareLogResult["entry"]): CareLogResult["entry"] {
  return { id: r.id, taskKind: r.taskKind, surface: r.surface, doneOn: r.doneOn, productUsed: r.productUsed, notes: r.notes, photoFileId: r.photoFileId };
}

/** An entry this owner logged on a piece they hold, else 404 (a studio's or a previous owner's entry too). */
export function ownEntry(owner: Pick<User, "id">, pieceId: string, entryId: string) {
  const piece = ownedPieceRow(owner, pieceId);
  const entry =
    typeof entryId === "string" && entryId.length <= 64
      ? getDb()
          .select()
          .from(careLogEntries)
          .where(and(eq(careLogEntries.id, entryId), eq(careLogEntries.pieceId, piece.id), eq(careLogEntries.userId, owner.id), eq(careLogEntries.source, "owner")))
          .get()
      : undefined;
  if (!entry) throw notFound("No care-log entry of yours with that id.");
  return { piece, entry };
}

export async function updateCareLogEntry(owner: Owner, pieceId: string, entryId: string, patch: CareLogPatch, now = new Date()): Promise<CareLogResult> {
  const { piece, entry } = ownEntry(owner, pieceId, entryId);
  const merged = {
    taskKind: patch.taskKind ?? entry.taskKind,
    surface: patch.surface ?? (entry.taskKind === "annual_check" || entry.surface === null ? "whole_piece" : entry.surface),
    doneOn: patch.doneOn ?? entry.doneOn,
  } as const;
  const { surface } = checkAgainstPiece(owner, piece, merged, now);
  const row = getDb().transaction((tx) => {
    const updated = tx
      .update(careLogEntries)
      .set({
        taskKind: merged.taskKind,
        surface,
        doneOn: merged.doneOn,
        ...(patch.productUsed !== undefined ? { productUsed: patch.productUsed } : {}),
        ...(patch.notes !== undefined ? { notes: patch.notes } : {}),
        updatedAt: now,
      })
      .where(eq(careLogEntries.id, entry.id))
      .returning()
      .get();
    recordAudit(tx, { studioId: piece.studioId, actorId: owner.id, action: "care_log.corrected", subjectType: "care_log_entry", subjectId: entry.id, data: { ...patch } });
    return updated;
  });
  return { entry: pick(row), task: afterView(owner, piece, row.taskKind, row.surface, now) };
}

export async function deleteCareLogEntry(owner: Owner, pieceId: string, entryId: string, now = new Date()) {
  const { piece, entry } = ownEntry(owner, pieceId, entryId);
  const photo = entry.photoFileId ? getDb().select().from(files).where(eq(files.id, entry.photoFileId)).get() : undefined;
  getDb().transaction((tx) => {
    tx.delete(careLogEntries).where(eq(careLogEntries.id, entry.id)).run();
    if (photo) tx.delete(files).where(eq(files.id, photo.id)).run();
    recordAudit(tx, { studioId: piece.studioId, actorId: owner.id, action: "care_log.deleted", subjectType: "care_log_entry", subjectId: entry.id, data: { taskKind: entry.taskKind, doneOn: entry.doneOn } });
  });
  if (photo) await removeStoredFiles(photo.storageKey, photo.thumbKey);
  return { deleted: entry.id, task: afterView(owner, piece, entry.taskKind, entry.surface, now) };
}

/** Parses a task key from a reminder link (pieceId:kind:surface) into form defaults, if it is this piece's. */
export function taskFromKey(schedule: CareSchedule, key: string | undefined) {
  if (!key) return undefined;
  return schedule.tasks.find((t) => t.key === key);
}

/** What the "I did this" page needs: the piece's tasks to choose from, the chosen task and the owner's today. */
export function getLogForm(owner: Owner, pieceId: string, opts: { taskKey?: string; entryId?: string } = {}, now = new Date()) {
  const piece = ownedPieceRow(owner, pieceId);
  const schedule = myPieceSchedule(owner, piece, now);
  const entry = opts.entryId ? ownEntry(owner, pieceId, opts.entryId).entry : undefined;
  const chosen = entry
    ? schedule.tasks.find((t) => t.kind === entry.taskKind && t.surface === taskSurfaceOf(entry.taskKind, entry.surface))
    : taskFromKey(schedule, opts.taskKey) ?? schedule.tasks.find((t) => t.status !== "done") ?? schedule.tasks[0];
  return {
    piece: { id: piece.id, title: piece.title, deliveredOn: piece.deliveredOn },
    today: ownerToday(owner, now),
    tasks: schedule.tasks.map((t) => taskView(piece.id, t)),
    chosen: chosen ? taskView(piece.id, chosen) : null,
    entry: entry
      ? { id: entry.id, taskKind: entry.taskKind, surface: entry.taskKind === "annual_check" || entry.surface === null ? ("whole_piece" as const) : entry.surface, doneOn: entry.doneOn, productUsed: entry.productUsed, notes: entry.notes, hasPhoto: Boolean(entry.photoFileId) }
      : null,
  };
}
