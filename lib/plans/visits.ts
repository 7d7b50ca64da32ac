// Included visits: the scheduler turns each visit a running plan includes into studio work ahead of its
// due date — a repair job priced at the plan's share (zero when included in full), recorded once per
// plan and due date — and proposes free times to the owner. Plans paid by other means end here at their period's end.
import { and, eq, inArray, lte, sql } from "drizzle-orm";
import { getDb, type Db } from "@/db/client";
import { finishProducts, planSubscriptions, planTemplates, planVisits, pieces, repairJobs, studios, type PlanSubscription, type PlanTemplate } from "@/db/schema";
import { PlanVisitEmail, planVisitSubject } from "@/emails/plan-visit";
import { recordAudit } from "@/lib/audit";
import { ownerActor } from "@/lib/auth/actor";
import { addDays, localDate } from "@/lib/care/dates";
import { TASK_KIND_BY_FINISH_CLASS, type CareTaskKind } from "@/lib/care/vocabulary";
import { formatDate, formatInstant } from "@/lib/format/dates";
import { formatMoney } from "@/lib/format/money";
import { sendMail } from "@/lib/mail";
import { jobUrl } from "@/lib/repairs/mail";
import { defaultJobTitle } from "@/lib/repairs/states";
import { priceJob, pricedPiece, totals } from "@/lib/repairs/pricing";
import { listJobSlots } from "@/lib/visits/slots";
import { planMailContext } from "./plan-mail";
import { PLAN_COVERS } from "./states";
import { moveSubscription } from "./subscriptions";

/** How far ahead of its due date an included visit becomes a job. Common practice, no published source. */
export const PLAN_VISIT_LEAD_DAYS = 28;

/** The due dates (YYYY-MM-DD, studio zone) of a plan's included visits: spread evenly over each year from its start. */
export function visitDueDates(startedAt: Date, visitsPerYear: number, until: Date, timeZone: string): string[] {
  if (visitsPerYear <= 0) return [];
  const start = localDate(startedAt, timeZone);
  const out: string[] = [];
  for (let k = 0; k < 1000; k++) {
    const due = addDays(start, Math.round(((k + 0.5) * 365) / visitsPerYear));
    if (due > localDate(until, timeZone)) break;
    out.push(due);
  }
  return out;
}

type Live = { sub: PlanSubscription; template: PlanTemplate };

/**
 * Creates the job of one included visit (once per plan and due date); null when it exists already.
 * Its origin "plan" makes every reader of the job say the plan pays its covered part, not the
 * warranty (coverWords in lib/repairs/states.ts). The demo seed (db/seed/plans.ts) makes one too.
 */
export function createVisitJob({ sub, template }: Live, dueOn: string, db: Db = getDb()): { jobId: string } | null {
  return db.transaction((tx) => {
    const claimed = tx.insert(planVisits).values({ studioId: sub.studioId, subscriptionId: sub.id, dueOn }).onConflictDoNothing().returning().get();
    if (!claimed) return null;
    const studio = tx.select().from(studios).where(eq(studios.id, sub.studioId)).get()!;
    const piece = tx.select().from(pieces).where(and(eq(pieces.id, sub.pieceId), eq(pieces.studioId, sub.studioId))).get()!;
    const products = tx.select().from(finishProducts).where(eq(finishProducts.studioId, sub.studioId)).all();
    const tasks: CareTaskKind[] = [...new Set<CareTaskKind>([...template.included.tasks, "annual_check"])];
    const wanted = new Set(tasks);
    const input = {
      title: defaultJobTitle({ plan: tasks }),
      tasks,
      repairs: [],
      productIds: products.filter((p) => wanted.has(TASK_KIND_BY_FINISH_CLASS[p.finishClass])).map((p) => p.id).slice(0, 1),
      coats: 1,
      travel: true,
      coveredPct: 100 - template.included.visitSharePct,
      notes: `Included in the care plan “${template.name}”; due ${dueOn}.`,
    };
    const priced = totals(priceJob(studio, pricedPiece(tx, piece), input, products));
    const now = new Date();
    const job = tx
      .insert(repairJobs)
      .values({ studioId: sub.studioId, pieceId: piece.id, ownerId: sub.ownerId, origin: "plan", title: input.title, quoteInput: input, currency: studio.currency, coveredPct: input.coveredPct, ...priced, state: priced.totalMinor === 0 ? "covered" : "quoted", quoteVersion: 1, quotedAt: now })
      .returning()
      .get();
    tx.update(planVisits).set({ jobId: job.id }).where(eq(planVisits.id, claimed.id)).run();
    recordAudit(tx, { studioId: sub.studioId, actorId: null, action: "job.created", subjectType: "repair_job", subjectId: job.id, data: { from: "plan", subscriptionId: sub.id, dueOn, totalMinor: job.totalMinor } });
    return { jobId: job.id };
  });
}

async function proposeSlots(live: Live, jobId: string, dueOn: string) {
  const context = planMailContext(live.sub, live.template);
  if (!context) return;
  const { owner, studio, zone, names } = context;
  const job = getDb().select().from(repairJobs).where(eq(repairJobs.id, jobId)).get()!;
  let slots: string[] = [];
  if (job.state === "covered") {
    const from = new Date(Math.max(Date.now(), Date.parse(`${addDays(dueOn, -7)}T00:00:00Z`)));
    const found = listJobSlots(ownerActor(owner), job.id, { from: from.toISOString(), to: new Date(from.getTime() + 14 * 86_400_000).toISOString() });
    slots = found.slots.slice(0, 3).map((s) => formatInstant(s.start, zone, { time: true }));
  }
  await sendMail({
    studioId: studio.id,
    to: owner.email,
    subject: planVisitSubject(names),
    email: PlanVisitEmail({
      ...names,
      dueOn: formatDate(dueOn),
      price: job.totalMinor === 0 ? "It is included in your plan" : `Your share is ${formatMoney(job.totalMinor, job.currency, studio.country)}`,
      slots,
      url: jobUrl(job.id),
    }),
  });
}

/**
 * One pass: for every plan that covers now, the included visits due within the lead time become jobs
 * (once each) and the owner gets free times; plans paid by other means whose period is over end.
 */
export async function runPlanVisits(now = new Date()): Promise<{ jobs: string[]; ended: number }> {
  const db = getDb();
  const live = db
    .select({ sub: planSubscriptions, template: planTemplates, timeZone: studios.timeZone })
    .from(planSubscriptions)
    .innerJoin(planTemplates, eq(planTemplates.id, planSubscriptions.templateId))
    .innerJoin(studios, eq(studios.id, planSubscriptions.studioId))
    .where(inArray(planSubscriptions.state, [...PLAN_COVERS]))
    .all();
  const jobs: string[] = [];
  const horizon = new Date(now.getTime() + PLAN_VISIT_LEAD_DAYS * 86_400_000);
  for (const row of live) {
    const { sub, template } = row;
    if (!sub.startedAt || !sub.periodEnd || template.included.visitsPerYear <= 0) continue;
    const today = localDate(now, row.timeZone);
    // A visit is the plan's only while the plan covers its due date.
    const until = new Date(Math.min(horizon.getTime(), (sub.endsAt ?? sub.periodEnd).getTime()));
    for (const dueOn of visitDueDates(sub.startedAt, template.included.visitsPerYear, until, row.timeZone)) {
      if (dueOn < today) continue;
      const made = createVisitJob({ sub, template }, dueOn);
      if (!made) continue;
      jobs.push(made.jobId);
      await proposeSlots({ sub, template }, made.jobId, dueOn);
    }
  }
  const over = db
    .select()
    .from(planSubscriptions)
    .where(and(eq(planSubscriptions.paidBy, "other"), inArray(planSubscriptions.state, ["running", "ending"]), lte(sql`coalesce(${planSubscriptions.endsAt}, ${planSubscriptions.periodEnd})`, now.getTime())))
    .all();
  for (const sub of over) {
    // A cancelled plan ends when its refund rule said (endsAt); an unrenewed one lapses at its period's end.
    db.transaction((tx) => moveSubscription(tx, sub, sub.state === "ending" ? "ended" : "lapsed", sub.state === "ending" ? { endedAt: sub.endsAt ?? sub.periodEnd } : { lapsedAt: sub.periodEnd }, { actorId: null, source: "scheduler" }));
  }
  return { jobs, ended: over.length };
}
