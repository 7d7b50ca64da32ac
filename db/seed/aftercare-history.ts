// Invented history of care reminders and refresh offers for the demo studio (db/seed/demo.ts), so its
// overview has a year of reminders, care logged in return, and offers with outcomes. Derived from
// the demo's own rows: each care-log entry an owner made in the last year was preceded by the
// reminders the pass would have sent for it, and each task that is overdue today got its reminders
// and no care. Ledger keys are the care engine's reminderKey, so the real pass sees these as sent and
// never sends them again. Everything here is invented; dates are relative to the seed day.
import { and, eq, isNotNull } from "drizzle-orm";
import { topArea } from "@/lib/care/area";
import { addDays, addMonths, localDate, zonedTimeToEpochMs } from "@/lib/care/dates";
import { quote } from "@/lib/care/quote";
import { reminderKey, taskKey, type TaskSurface } from "@/lib/care/schedule";
import { REFRESH_TASK_KINDS, type CareTaskKind, type ReminderStep } from "@/lib/care/vocabulary";
import { scheduleFromRows, topShape } from "@/lib/pieces/care-inputs";
import type { Db } from "../client";
import { careLogEntries, finishLayers, finishProducts, pieces, refreshOffers, reminderSends, studios, users, type Piece, type Studio } from "../schema";

const OFFSETS: Record<ReminderStep, number> = { before_14d: -14, due_day: 0, after_30d: 30 };
/** Outcomes given in turn to the offers that went with logged tasks (invented). */
const LOGGED_OFFER_OUTCOMES = ["declined", "accepted", "expired"] as const;

function price(studio: Studio, piece: Piece, kind: CareTaskKind) {
  const shape = topShape(piece);
  const areaM2 = shape ? topArea(shape).m2 : 1;
  return quote({
    tasks: [kind],
    areaM2,
    rates: { labourPerHourMinor: studio.labourRateMinor },
    products: [],
    travel: { flatMinor: studio.travelFeeMinor },
    taxRatePct: studio.taxRateBp / 100,
    coveredPct: 0,
    currency: studio.currency,
  });
}

export function seedAftercareHistory(db: Db, studioId: string, now: Date = new Date()): { reminders: number; offers: number } {
  const studio = db.select().from(studios).where(eq(studios.id, studioId)).get()!;
  const today = localDate(now, studio.timeZone);
  // The overview's window: the first day of the month eleven months back.
  const yearAgo = addMonths(`${today.slice(0, 7)}-01`, -11);
  const owned = db
    .select({ piece: pieces, ownerTz: users.timeZone })
    .from(pieces)
    .innerJoin(users, eq(users.id, pieces.ownerId))
    .where(and(eq(pieces.studioId, studioId), isNotNull(pieces.ownerId)))
    .all();
  const products = db.select().from(finishProducts).where(eq(finishProducts.studioId, studioId)).all();
  let reminders = 0;
  let offers = 0;
  let loggedOffers = 0;

  const send = (piece: Piece, ownerTz: string, kind: CareTaskKind, surface: TaskSurface, dueOn: string, steps: ReminderStep[], offerStatus: (typeof LOGGED_OFFER_OUTCOMES)[number] | "offered" | null) => {
    const key = taskKey(piece.id, kind, surface);
    let first: string | null = null;
    for (const step of steps) {
      const on = addDays(dueOn, OFFSETS[step]);
      if (on < yearAgo || on >= today) continue;
      const sentAt = new Date(zonedTimeToEpochMs(on, 9 * 60 + 4, ownerTz));
      const row = db
        .insert(reminderSends)
        .values({ studioId, pieceId: piece.id, userId: piece.ownerId!, reminderKey: reminderKey({ key, dueOn }, step), taskKey: key, taskKind: kind, step, dueOn, status: "sent", attempts: 1, messageId: `<seeded-${key}-${step}@demo.invalid>`, sentAt, createdAt: sentAt, updatedAt: sentAt })
        .onConflictDoNothing()
        .returning({ id: reminderSends.id })
        .get();
      if (!row) continue;
      reminders++;
      first ??= row.id;
      if (offerStatus && REFRESH_TASK_KINDS.includes(kind) && first === row.id) {
        const q = price(studio, piece, kind);
        db.insert(refreshOffers)
          .values({
            studioId,
            pieceId: piece.id,
            userId: piece.ownerId!,
            taskKey: key,
            dueOn,
            priceMinor: q.totalMinor,
            currency: q.currency,
            quote: q,
            status: offerStatus,
            reminderSendId: row.id,
            acceptedAt: offerStatus === "accepted" ? new Date(sentAt.getTime() + 2 * 86_400_000) : null,
            createdAt: sentAt,
          })
          .onConflictDoNothing()
          .run();
        offers++;
      }
    }
  };

  for (const { piece, ownerTz } of owned) {
    // Care the owner logged in the last year: the reminders before it went out, and it answered them.
    const logs = db
      .select()
      .from(careLogEntries)
      .where(and(eq(careLogEntries.pieceId, piece.id), eq(careLogEntries.source, "owner")))
      .all()
      .filter((l) => l.doneOn >= yearAgo);
    for (const l of logs) {
      const surface: TaskSurface = l.taskKind === "annual_check" || !l.surface ? (l.taskKind === "annual_check" ? "whole_piece" : "top") : l.surface === "base" ? "base" : "top";
      const dueOn = addDays(l.doneOn, -3); // done three days after the due date
      const outcome = REFRESH_TASK_KINDS.includes(l.taskKind) ? LOGGED_OFFER_OUTCOMES[loggedOffers++ % LOGGED_OFFER_OUTCOMES.length]! : null;
      send(piece, ownerTz, l.taskKind, surface, dueOn, ["before_14d", "due_day"], outcome);
    }
    // Tasks overdue today: every reminder whose day has passed, no care yet.
    const schedule = scheduleFromRows({
      piece,
      layers: db.select().from(finishLayers).where(eq(finishLayers.pieceId, piece.id)).all(),
      careLog: db.select().from(careLogEntries).where(eq(careLogEntries.pieceId, piece.id)).all(),
      products,
      timeZone: studio.timeZone,
      now,
    });
    for (const t of schedule.tasks.filter((x) => x.status === "overdue")) {
      send(piece, ownerTz, t.kind, t.surface, t.dueOn, ["before_14d", "due_day", "after_30d"], t.isRefresh ? (t.daysUntilDue < -30 ? "expired" : "offered") : null);
    }
  }
  return { reminders, offers };
}
