// Invented demo visits: a second technician (Sol Amberly), weekly hours for both technicians, a day
// off, and a week of visits on demo repair jobs made for them (paid or covered, now scheduled), plus
// one finished visit with its report on the demo's done job. The e2e fixture's own "paid" and
// "covered" jobs are left without a visit, so the specs can book them. Everything here is invented.
import { and, eq, inArray } from "drizzle-orm";
import { hashPassword } from "@/lib/auth/password";
import { addDays, isoWeekday, localDate, zonedTimeToEpochMs } from "@/lib/care/dates";
import type { CareTaskKind } from "@/lib/care/vocabulary";
import { defaultProductIds, priceJob, pricedPiece, totals } from "@/lib/repairs/pricing";
import { jobDurationMin } from "@/lib/visits/availability";
import { visitUid } from "@/lib/visits/ics";
import type { Db } from "../client";
import { finishProducts, memberships, payments, pieces, repairJobs, studios, technicianHours, technicianTimeOff, users, visits } from "../schema";

export const SOL = { email: "sol@larchmere.example", name: "Sol Amberly" } as const;

/**
 * areasM2: a size staff typed on the quote for a surface the piece's record has none for (lib/repairs/pricing
 * quoteAreaM2); alsoSurfaces: the surfaces priced beside the top where they share the task's finish
 * (JobQuoteInput.alsoSurfaces), so the technician's "What to bring" names them too.
 */
type VisitSpec = { piece: string; title: string; tasks: CareTaskKind[]; state: "paid" | "covered"; tech: "ines" | "sol"; dayOffset: number; at: string; location?: "owner" | "studio"; areasM2?: { base?: number }; alsoSurfaces?: { rewax?: "base"[] } };

// dayOffset counts working days of that technician from today (0 = today or the next working day); local times.
const WEEK: VisitSpec[] = [
  { piece: "White oak kitchen island top", title: "Annual check, island top", tasks: ["annual_check"], state: "covered", tech: "ines", dayOffset: 0, at: "09:00" },
  // The desk's top and legs are both waxed (db/seed/demo.ts), so the re-wax prices the top and, ticked, the
  // base: its legs and rails, one face 0.5 m² as staff typed it (invented).
  { piece: "Cherry writing desk", title: "Re-wax the desk legs and top", tasks: ["rewax"], state: "paid", tech: "ines", dayOffset: 0, at: "13:00", areasM2: { base: 0.5 }, alsoSurfaces: { rewax: ["base"] } },
  { piece: "Charred cedar garden bench", title: "Inspect the bench after the storm", tasks: ["annual_check"], state: "covered", tech: "sol", dayOffset: 1, at: "10:00" },
  { piece: "Spalted maple coffee table, blue resin", title: "Polish a scuff in the blue resin", tasks: ["resin_polish"], state: "paid", tech: "sol", dayOffset: 2, at: "14:00" },
  { piece: "Walnut river dining table", title: "Check the resin edge, dining table", tasks: ["annual_check"], state: "covered", tech: "ines", dayOffset: 3, at: "10:30" },
  { piece: "Walnut and maple resin coffee table", title: "Re-oil the coffee table base", tasks: ["reoil"], state: "paid", tech: "sol", dayOffset: 4, at: "09:30", location: "studio", areasM2: { base: 0.6 } },
];

export async function seedVisits(db: Db, studioId: string, today: Date, doneJobId?: string): Promise<{ visits: number; solId: string }> {
  const studio = db.select().from(studios).where(eq(studios.id, studioId)).get()!;
  const tz = studio.timeZone;
  const passwordHash = await hashPassword("grainward-demo");
  const products = db.select().from(finishProducts).where(eq(finishProducts.studioId, studioId)).all();
  const owned = db.select().from(pieces).where(eq(pieces.studioId, studioId)).all();
  const ines = db.select().from(users).where(eq(users.email, "ines@larchmere.example")).get()!;
  const teo = db.select().from(users).where(eq(users.email, "teo@larchmere.example")).get();

  return db.transaction((tx) => {
    const sol = tx.insert(users).values({ email: SOL.email, name: SOL.name, passwordHash, emailVerifiedAt: today, timeZone: tz, unitSystem: "imperial" }).returning().get();
    tx.insert(memberships).values({ studioId, userId: sol.id, role: "technician" }).run();
    const tech = { ines: ines.id, sol: sol.id };

    // Ines: Monday to Friday 08:00–16:00. Sol: Tuesday to Saturday, 09:00–12:00 and 13:00–17:00.
    for (let d = 1; d <= 5; d++) tx.insert(technicianHours).values({ studioId, userId: ines.id, weekday: d, start: "08:00", end: "16:00" }).run();
    for (let d = 2; d <= 6; d++) {
      tx.insert(technicianHours).values({ studioId, userId: sol.id, weekday: d, start: "09:00", end: "12:00" }).run();
      tx.insert(technicianHours).values({ studioId, userId: sol.id, weekday: d, start: "13:00", end: "17:00" }).run();
    }
    const todayLocal = localDate(today.getTime(), tz);
    tx.insert(technicianTimeOff).values({ studioId, userId: sol.id, date: addDays(todayLocal, 9), note: "Day off (invented)" }).run();

    // Working days of each technician from tomorrow on.
    const worksOn = (who: "ines" | "sol", date: string) => (who === "ines" ? isoWeekday(date) <= 5 : isoWeekday(date) >= 2 && isoWeekday(date) <= 6);
    const nthWorkday = (who: "ines" | "sol", n: number) => {
      let date = addDays(todayLocal, -1); // today counts when it is a working day
      let seen = -1;
      for (;;) {
        date = addDays(date, 1);
        if (worksOn(who, date) && ++seen === n) return date;
      }
    };

    let count = 0;
    WEEK.forEach((spec, i) => {
      const piece = owned.find((p) => p.title === spec.piece);
      if (!piece?.ownerId) return;
      const input = { title: spec.title, tasks: spec.tasks, productIds: defaultProductIds(spec.tasks, products), coats: 1, travel: true, coveredPct: spec.state === "covered" ? 100 : 0, notes: "", ...(spec.areasM2 ? { areasM2: spec.areasM2 } : {}), ...(spec.alsoSurfaces ? { alsoSurfaces: spec.alsoSurfaces } : {}) };
      const priced = totals(priceJob(studio, pricedPiece(tx, piece), input, products));
      const paidAt = new Date(today.getTime() - (6 - i) * 86_400_000);
      const job = tx
        .insert(repairJobs)
        .values({ studioId, pieceId: piece.id, ownerId: piece.ownerId, origin: "studio", title: spec.title, quoteInput: input, currency: studio.currency, coveredPct: input.coveredPct, ...priced, state: "scheduled", quoteVersion: 1, quotedAt: paidAt, approvedAt: spec.state === "paid" ? paidAt : null, paidAt: spec.state === "paid" ? paidAt : null, notes: "Invented demo job with a booked visit.", createdById: teo?.id ?? null })
        .returning()
        .get();
      if (spec.state === "paid") {
        tx.insert(payments).values({ studioId, jobId: job.id, quoteVersion: 1, checkoutSessionId: `cs_demo_visit_${i}_${job.id.slice(0, 8)}`, amountMinor: job.totalMinor, currency: job.currency, status: "paid", paymentIntentId: `pi_demo_visit_${i}`, paidAt }).run();
      }
      const date = nthWorkday(spec.tech, spec.dayOffset);
      const [h, m] = spec.at.split(":").map(Number) as [number, number];
      const start = zonedTimeToEpochMs(date, h * 60 + m, tz);
      const end = start + jobDurationMin(job, pricedPiece(tx, piece)) * 60_000;
      const location = spec.location === "studio" ? `${studio.name}, ${studio.address}` : piece.deliveryAddress;
      const visitId = crypto.randomUUID();
      tx.insert(visits)
        .values({ id: visitId, studioId, jobId: job.id, pieceId: piece.id, technicianId: tech[spec.tech], startAt: new Date(start), endAt: new Date(end), locationKind: spec.location ?? "owner", location, icsUid: visitUid(visitId), sequence: 0, state: "booked", jobStateBefore: spec.state, bookedById: teo?.id ?? null, lastInviteAt: paidAt, createdAt: paidAt, updatedAt: paidAt })
        .run();
      count++;
    });

    // The demo's done job gets the visit that finished it.
    if (doneJobId) {
      const job = tx.select().from(repairJobs).where(and(eq(repairJobs.id, doneJobId), inArray(repairJobs.state, ["done"]))).get();
      const piece = job && owned.find((p) => p.id === job.pieceId);
      if (job && piece) {
        const at = job.doneAt ?? new Date(today.getTime() - 10 * 86_400_000);
        const date = localDate(at.getTime(), tz);
        const start = zonedTimeToEpochMs(date, 10 * 60, tz);
        const visitId = crypto.randomUUID();
        tx.insert(visits)
          .values({ id: visitId, studioId, jobId: job.id, pieceId: piece.id, technicianId: ines.id, startAt: new Date(start), endAt: new Date(start + jobDurationMin(job, pricedPiece(tx, piece)) * 60_000), locationKind: "owner", location: piece.deliveryAddress, icsUid: visitUid(visitId), sequence: 0, state: "done", jobStateBefore: "paid", reportWork: "Brushed down, washed, one coat of exterior oil on the seat (invented demo report).", reportSignOffName: "The Holloway household", reportLayerIds: [], reportedAt: new Date(start + 90 * 60_000), reportedById: ines.id, createdAt: at, updatedAt: at })
          .run();
        count++;
      }
    }
    return { visits: count, solId: sol.id };
  });
}
