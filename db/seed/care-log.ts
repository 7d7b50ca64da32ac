// Invented care-log history for the demo owners (db/seed/demo.ts), so their schedules look lived-in:
// some care logged on time, a correction here and there, and a task or two left to fall due.
// Everything here is invented. Dates are relative to the seed day, like the rest of the demo.
import { and, eq, isNotNull } from "drizzle-orm";
import type { Surface } from "@/lib/care/vocabulary";
import type { CareTaskKind } from "@/lib/care/vocabulary";
import type { Db } from "../client";
import { careLogEntries, pieces } from "../schema";

type Entry = { kind: CareTaskKind; surface: Surface | null; monthsAgo: number; product?: string; notes: string };

const HISTORY: Record<string, Entry[]> = {
  "Walnut river dining table": [
    { kind: "annual_check", surface: null, monthsAgo: 14, notes: "Wiped the whole table down, snugged the trestle bolts a quarter turn. Resin line looks clean." },
    { kind: "annual_check", surface: null, monthsAgo: 2, notes: "No new checks in the slab. One faint ring near the end seat — it buffed out with a damp cloth." },
  ],
  "White oak kitchen island top": [
    { kind: "film_inspect", surface: "top", monthsAgo: 6, notes: "Looked along the top under the pendant lights. Film intact; the edge by the sink cut-out is still sealed." },
    { kind: "annual_check", surface: null, monthsAgo: 6, notes: "Checked underneath for water marks after the dishwasher leak next door — dry." },
  ],
  "Charred cedar garden bench": [
    { kind: "annual_check", surface: null, monthsAgo: 18, notes: "Brushed off the leaves, legs tight, no soft spots." },
    { kind: "reoil_charred", surface: "top", monthsAgo: 5, product: "Exterior penetrating oil", notes: "After a dry week: soft brush, one thin coat, wiped off after 20 minutes. Rags dried flat on the patio, then binned." },
    { kind: "reoil_charred", surface: "base", monthsAgo: 5, product: "Exterior penetrating oil", notes: "Legs done the same afternoon." },
  ],
  "Cherry writing desk": [{ kind: "rewax", surface: "top", monthsAgo: 2, product: "Clear paste wax", notes: "Two thin coats, buffed after ten minutes each. The mug ring by the lamp is gone." }],
  "Spalted maple coffee table, blue resin": [
    { kind: "reoil", surface: "top", monthsAgo: 4, product: "Studio hardwax oil, satin", notes: "Water ring on the sofa side; cleaned and re-oiled the whole top. Windows open, rags in the metal can with water." },
  ],
};

/** "YYYY-MM-DD" `months` before `today`, day clamped to the month's end (as the demo seed counts). */
function monthsBefore(today: Date, months: number): string {
  const first = new Date(Date.UTC(today.getUTCFullYear(), today.getUTCMonth() - months, 1));
  const last = new Date(Date.UTC(first.getUTCFullYear(), first.getUTCMonth() + 1, 0)).getUTCDate();
  return new Date(Date.UTC(first.getUTCFullYear(), first.getUTCMonth(), Math.min(today.getUTCDate(), last))).toISOString().slice(0, 10);
}

type Tx = Pick<Db, "select" | "insert">;

/** Adds the invented history to the registered pieces of the demo studio. */
export function seedCareLog(tx: Tx, studioId: string, today: Date): number {
  const owned = tx
    .select({ id: pieces.id, title: pieces.title, ownerId: pieces.ownerId, deliveredOn: pieces.deliveredOn })
    .from(pieces)
    .where(and(eq(pieces.studioId, studioId), isNotNull(pieces.ownerId)))
    .all();
  let n = 0;
  for (const p of owned) {
    for (const e of HISTORY[p.title] ?? []) {
      const doneOn = monthsBefore(today, e.monthsAgo);
      if (doneOn < p.deliveredOn) continue;
      tx.insert(careLogEntries)
        .values({ studioId, pieceId: p.id, userId: p.ownerId, source: "owner", taskKind: e.kind, surface: e.surface, doneOn, productUsed: e.product ?? "", notes: e.notes })
        .run();
      n++;
    }
  }
  return n;
}
