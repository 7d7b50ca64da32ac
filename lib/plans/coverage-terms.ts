// What a care plan adds to a piece's warranty on a given day: its extended lines while it runs, and
// nothing from the day it lapsed or ended. Read by the claim coverage check (lib/claims/coverage.ts).
import { and, desc, eq, ne } from "drizzle-orm";
import { getDb } from "@/db/client";
import { planSubscriptions, planTemplates, type PlanSubscription, type PlanTemplate } from "@/db/schema";
import type { WarrantyPolicy } from "@/lib/care/coverage";
import { CLAIM_CATEGORY_LABELS } from "@/lib/claims/labels";
import { formatInstant } from "@/lib/format";

export type PlanOnDay = { sub: PlanSubscription; template: PlanTemplate; covers: boolean; endedAt: Date | null };

/** The plan the piece was under on `at` (covers) or, failing that, the last one that ended before it. */
export function planOnDay(pieceId: string, at: Date): PlanOnDay | null {
  const rows = getDb()
    .select({ sub: planSubscriptions, template: planTemplates })
    .from(planSubscriptions)
    .innerJoin(planTemplates, eq(planTemplates.id, planSubscriptions.templateId))
    .where(and(eq(planSubscriptions.pieceId, pieceId), ne(planSubscriptions.state, "awaiting_payment")))
    .orderBy(desc(planSubscriptions.startedAt))
    .all();
  let lastEnded: PlanOnDay | null = null;
  for (const { sub, template } of rows) {
    if (!sub.startedAt || sub.startedAt > at) continue;
    const endedAt = sub.lapsedAt ?? sub.endedAt;
    if (!endedAt || endedAt > at) return { sub, template, covers: true, endedAt };
    if (!lastEnded || (lastEnded.endedAt && endedAt > lastEnded.endedAt)) lastEnded = { sub, template, covers: false, endedAt };
  }
  return lastEnded;
}

/** One warranty line the plan changed: lengthened (from its base months) or added (fromMonths null). */
export type PlanTermChange = { label: string; fromMonths: number | null; toMonths: number };

/**
 * The base policy with the plan's extended lines: a line's term is lengthened by the plan's months;
 * a category the base terms lack gets a line of the plan's months from delivery. Reasons say so, with
 * the day a plan lapsed or ended written in words in `timeZone` (the studio's).
 */
export function withPlanTerms(policy: WarrantyPolicy, plan: PlanOnDay, timeZone: string): { policy: WarrantyPolicy; reasons: string[]; changes: PlanTermChange[] } {
  const name = `the care plan “${plan.template.name}” (version ${plan.template.version})`;
  if (!plan.covers) {
    const how = plan.sub.state === "lapsed" ? "lapsed" : "ended";
    return { policy, reasons: [`${name} ${how} on ${formatInstant(plan.endedAt!, timeZone)}; the base terms apply from that day`], changes: [] };
  }
  const lines = { ...policy.lines };
  const reasons: string[] = [];
  const changes: PlanTermChange[] = [];
  for (const ext of plan.template.included.extendedLines) {
    const base = lines[ext.category];
    if (base) {
      lines[ext.category] = { ...base, termMonths: base.termMonths + ext.extraMonths };
      changes.push({ label: base.label, fromMonths: base.termMonths, toMonths: base.termMonths + ext.extraMonths });
      reasons.push(`${name} is running: ${base.label.toLowerCase()} term lengthened by ${ext.extraMonths} months (${base.termMonths} → ${base.termMonths + ext.extraMonths})`);
    } else {
      lines[ext.category] = { label: CLAIM_CATEGORY_LABELS[ext.category], termMonths: ext.extraMonths, exclusions: ["heat", "impact", "outdoor_use_of_indoor_piece"], partlyCoveredPct: 50, transfersToNewOwner: plan.template.transfers };
      changes.push({ label: CLAIM_CATEGORY_LABELS[ext.category], fromMonths: null, toMonths: ext.extraMonths });
      reasons.push(`${name} is running: adds ${CLAIM_CATEGORY_LABELS[ext.category].toLowerCase()} for ${ext.extraMonths} months from delivery`);
    }
  }
  if (reasons.length === 0) reasons.push(`${name} is running; it lengthens no warranty line`);
  return { policy: { version: `${policy.version} + plan ${plan.template.name} v${plan.template.version}`, lines }, reasons, changes };
}
