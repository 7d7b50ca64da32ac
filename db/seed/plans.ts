// Demo care plans (invented, like all demo data): two plan templates of the demo studio, and one
// owner's piece running under the first, started by staff as paid at the studio, whose included visit
// falls due in about two weeks and so already has its job (made as the scheduler makes it).
import { and, asc, eq, isNotNull } from "drizzle-orm";
import type { Db } from "../client";
import { auditLog, memberships, pieces, planInvoices, planSubscriptions, planTemplates, studios } from "../schema";
import { localDate } from "../../lib/care/dates";
import { addPeriod } from "../../lib/plans/periods";
import { planPrice } from "../../lib/plans/price";
import { createVisitJob, PLAN_VISIT_LEAD_DAYS, visitDueDates } from "../../lib/plans/visits";

export function seedPlans(db: Db, studioId: string, today: Date): { templates: number; running: string } {
  const studio = db.select().from(studios).where(eq(studios.id, studioId)).get()!;
  const admin = db.select().from(memberships).where(and(eq(memberships.studioId, studioId), eq(memberships.role, "admin"))).get();
  const make = (values: Omit<typeof planTemplates.$inferInsert, "studioId" | "lineageId" | "currency">) => {
    const id = crypto.randomUUID();
    return db.insert(planTemplates).values({ ...values, id, lineageId: id, studioId, currency: studio.currency, createdById: admin?.userId ?? null }).returning().get();
  };
  const keeping = make({
    name: "Slab keeping, yearly (demo, invented)",
    summary: "A yearly inspection visit at no charge, and cracks and joinery covered for longer while the plan runs. Invented demo plan.",
    included: { tasks: [], visitsPerYear: 1, visitSharePct: 0, extendedLines: [{ category: "crack_gap", extraMonths: 24 }, { category: "structural", extraMonths: 12 }], repairDiscountPct: 10 },
    fits: { finishClasses: [], pieceKinds: [], minTopAreaM2: null, maxTopAreaM2: null },
    priceMinor: 14_000,
    interval: "year",
  });
  make({
    name: "Oil care, done for you (demo, invented)",
    summary: "We re-oil the top for you twice a year and the finish-wear line runs longer. For oiled tops up to 3 m². Invented demo plan.",
    included: { tasks: ["reoil"], visitsPerYear: 2, visitSharePct: 25, extendedLines: [{ category: "finish_wear", extraMonths: 12 }], repairDiscountPct: 0 },
    fits: { finishClasses: ["hardwax_oil"], pieceKinds: [], minTopAreaM2: null, maxTopAreaM2: 3 },
    priceMinor: 1_500,
    interval: "month",
  });
  const piece = db.select().from(pieces).where(and(eq(pieces.studioId, studioId), isNotNull(pieces.ownerId))).orderBy(asc(pieces.deliveredOn)).get()!;
  const { totalMinor, taxMinor } = planPrice(studio, keeping);
  // One visit a year falls due half a year after the start (lib/plans/visits.ts): about two weeks from today.
  const start = new Date(today.getTime() - 169 * 86_400_000);
  const periodEnd = addPeriod(start, "year");
  const sub = db
    .insert(planSubscriptions)
    .values({ studioId, templateId: keeping.id, pieceId: piece.id, ownerId: piece.ownerId, payerId: piece.ownerId, state: "running", paidBy: "other", paidByNote: "Paid at the studio (demo, invented)", amountMinor: totalMinor, currency: studio.currency, periodStart: start, periodEnd, startedAt: start, createdById: admin?.userId ?? null, version: 1 })
    .returning()
    .get();
  db.insert(planInvoices).values({ studioId, subscriptionId: sub.id, status: "paid", amountMinor: totalMinor, taxMinor, currency: studio.currency, periodStart: start, periodEnd, at: start }).run();
  db.insert(auditLog).values({ studioId, actorId: admin?.userId ?? null, action: "plan.running", subjectType: "plan_subscription", subjectId: sub.id, data: { from: "awaiting_payment", to: "running", source: "staff" } }).run();
  const todayIso = localDate(today, studio.timeZone);
  for (const dueOn of visitDueDates(start, keeping.included.visitsPerYear, new Date(today.getTime() + PLAN_VISIT_LEAD_DAYS * 86_400_000), studio.timeZone)) {
    if (dueOn >= todayIso) createVisitJob({ sub, template: keeping }, dueOn, db);
  }
  return { templates: 2, running: piece.id };
}
