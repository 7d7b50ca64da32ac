import "server-only";
// The studio's settings: profile and rates, warranty policy versions, reminder timing.
// Every function takes the caller's StudioContext (from requireAdmin) and checks the role again, so a
// staff member or technician calling it directly is refused too.
import { asc, desc, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { studios, users, visitRules as visitRulesTable, warrantyPolicies, type Studio } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import { assertRole, type StudioContext } from "@/lib/auth/guards";
import { localDate } from "@/lib/care/dates";
import { CURRENCY_EXPONENTS, formatMinorUnits } from "@/lib/care/quote";
import { CLAIM_CATEGORIES, REMINDER_STEPS, type ReminderStep } from "@/lib/care/vocabulary";
import { formatBasisPoints, formatDate } from "@/lib/format";
import { badRequest, unprocessable } from "@/lib/errors";
import type {
  ProfileInput,
  ProfileValues,
  PolicyVersionInput,
  PolicyVersionValues,
  ReminderTimingValues,
  VisitRulesInput,
  VisitRulesValues,
} from "@/lib/validation/settings";
import { markSetupStep } from "@/lib/studio/setup";
import { visitRulesFor } from "@/lib/visits/availability";
import { describePolicyChanges, formToPolicy, policyToForm } from "./policy";

export { policyInForce } from "./policy";

export function assertAdmin(ctx: StudioContext): void {
  assertRole(ctx, ["admin"], "Only the studio's admins can change its settings.");
}

/** "85.50" in a currency with `exp` decimals → 8550. The schema has already checked the shape. */
export function toMinorUnits(amount: string, currency: string): number {
  const exp = (CURRENCY_EXPONENTS as Record<string, number>)[currency];
  if (exp === undefined) throw badRequest(`Unsupported currency ${currency}.`, { currency: ["Pick a currency from the list."] });
  const [whole = "0", frac = ""] = amount.split(".");
  if (frac.length > exp) throw badRequest(`${currency} has ${exp} decimals at most.`);
  return Number(whole) * 10 ** exp + Number(frac.padEnd(exp, "0") || "0");
}

/** Basis points from a percentage string: "8.5" → 850. */
export function toBasisPoints(pct: string): number {
  const [whole = "0", frac = ""] = pct.split(".");
  return Number(whole) * 100 + Number(frac.padEnd(2, "0").slice(0, 2));
}

export function freshStudio(ctx: StudioContext): Studio {
  return getDb().select().from(studios).where(eq(studios.id, ctx.studio.id)).get() ?? ctx.studio;
}

export function profileFormValues(ctx: StudioContext): ProfileInput {
  assertAdmin(ctx);
  const s = freshStudio(ctx);
  const safe = (minor: number) => {
    try {
      return formatMinorUnits(minor, s.currency);
    } catch {
      return String(minor);
    }
  };
  return {
    name: s.name,
    address: s.address,
    email: s.email,
    phone: s.phone,
    timeZone: s.timeZone,
    currency: s.currency as ProfileInput["currency"],
    unitSystem: s.unitSystem,
    taxRatePct: formatBasisPoints(s.taxRateBp),
    labourRate: safe(s.labourRateMinor),
    travelFee: safe(s.travelFeeMinor),
  };
}

/** Saves the profile and rates; amounts arrive in major units as typed and are stored in minor units. */
export function updateProfile(ctx: StudioContext, v: ProfileValues): Studio {
  assertAdmin(ctx);
  const db = getDb();
  return db.transaction((tx) => {
    const before = tx.select().from(studios).where(eq(studios.id, ctx.studio.id)).get()!;
    const next = {
      name: v.name,
      address: v.address,
      email: v.email,
      phone: v.phone ?? before.phone,
      timeZone: v.timeZone,
      currency: v.currency,
      unitSystem: v.unitSystem,
      taxRateBp: toBasisPoints(v.taxRatePct),
      labourRateMinor: toMinorUnits(v.labourRate, v.currency),
      travelFeeMinor: toMinorUnits(v.travelFee, v.currency),
    };
    const changed = Object.fromEntries(
      Object.entries(next)
        .filter(([k, val]) => before[k as keyof typeof next] !== val)
        .map(([k, val]) => [k, { from: before[k as keyof typeof next], to: val }]),
    );
    tx.update(studios).set(next).where(eq(studios.id, ctx.studio.id)).run();
    markSetupStep(tx, ctx.studio.id, "details");
    const row = tx.select().from(studios).where(eq(studios.id, ctx.studio.id)).get()!;
    if (Object.keys(changed).length) {
      recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "settings.profile_updated", subjectType: "studio", subjectId: ctx.studio.id, data: { changed } });
    }
    return row;
  });
}

// ---- reminder timing ----

export type ReminderTiming = { sendHour: number; steps: ReminderStep[] };

export function reminderTiming(ctx: StudioContext): ReminderTiming {
  const s = freshStudio(ctx);
  return { sendHour: s.reminderSendHour, steps: REMINDER_STEPS.filter((st) => s.reminderSteps.includes(st)) };
}

export function updateReminderTiming(ctx: StudioContext, v: ReminderTimingValues): ReminderTiming {
  assertAdmin(ctx);
  const steps = REMINDER_STEPS.filter((s) => v.steps.includes(s));
  return getDb().transaction((tx) => {
    const before = tx.select({ h: studios.reminderSendHour, s: studios.reminderSteps }).from(studios).where(eq(studios.id, ctx.studio.id)).get()!;
    tx.update(studios).set({ reminderSendHour: v.sendHour, reminderSteps: steps }).where(eq(studios.id, ctx.studio.id)).run();
    markSetupStep(tx, ctx.studio.id, "reminders");
    recordAudit(tx, {
      studioId: ctx.studio.id,
      actorId: ctx.user.id,
      action: "settings.reminder_timing_updated",
      subjectType: "studio",
      subjectId: ctx.studio.id,
      data: { from: { sendHour: before.h, steps: before.s }, to: { sendHour: v.sendHour, steps } },
    });
    return { sendHour: v.sendHour, steps };
  });
}


// ---- visit booking rules ----

export type VisitRules = Required<VisitRulesInput>;

/** The studio's visit booking rules (the defaults until an admin saves its own). */
export function visitRules(ctx: StudioContext): VisitRules {
  assertAdmin(ctx);
  return rulesOf(visitRulesFor(getDb(), ctx.studio.id));
}

function rulesOf(r: VisitRules): VisitRules {
  return { travelBufferMin: r.travelBufferMin, leadTimeHours: r.leadTimeHours, slotStepMin: r.slotStepMin, ownerChangeCutoffHours: r.ownerChangeCutoffHours };
}

/** Saves the rules; slots offered from then on follow them. Visits already booked stay as they are. */
export function updateVisitRules(ctx: StudioContext, v: VisitRulesValues): VisitRules {
  assertAdmin(ctx);
  return getDb().transaction((tx) => {
    const before = rulesOf(visitRulesFor(tx, ctx.studio.id));
    tx.insert(visitRulesTable).values({ studioId: ctx.studio.id, ...v }).onConflictDoUpdate({ target: visitRulesTable.studioId, set: v }).run();
    markSetupStep(tx, ctx.studio.id, "visits");
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "settings.visit_rules_updated", subjectType: "studio", subjectId: ctx.studio.id, data: { from: before, to: v } });
    return v;
  });
}

// ---- warranty policy versions ----

export type PolicyVersionView = {
  id: string;
  version: number;
  effectiveFrom: string;
  createdAt: Date;
  createdBy: string | null;
  lineCount: number;
  changes: string[];
  /** true for the version that new deliveries get today. */
  current: boolean;
  /** true for a version whose effectiveFrom is still ahead. */
  upcoming: boolean;
};

export function studioToday(ctx: StudioContext, now: Date = new Date()): string {
  return localDate(now, ctx.studio.timeZone);
}

export function listPolicyVersions(ctx: StudioContext, now: Date = new Date()): PolicyVersionView[] {
  assertAdmin(ctx);
  const today = studioToday(ctx, now);
  const rows = getDb()
    .select({ row: warrantyPolicies, createdBy: users.name })
    .from(warrantyPolicies)
    .leftJoin(users, eq(users.id, warrantyPolicies.createdById))
    .where(eq(warrantyPolicies.studioId, ctx.studio.id))
    .orderBy(asc(warrantyPolicies.version))
    .all();
  const currentId = [...rows].reverse().find((r) => r.row.effectiveFrom <= today)?.row.id;
  const out = rows.map((r, i) => ({
    id: r.row.id,
    version: r.row.version,
    effectiveFrom: r.row.effectiveFrom,
    createdAt: r.row.createdAt,
    createdBy: r.createdBy,
    lineCount: Object.keys(r.row.policy.lines ?? {}).length,
    changes: describePolicyChanges(i > 0 ? rows[i - 1]!.row.policy : null, r.row.policy),
    current: r.row.id === currentId,
    upcoming: r.row.effectiveFrom > today,
  }));
  return out.reverse();
}

/** The editor's starting values: the newest version's terms, effective from today (or its own later date). */
export function policyEditorValues(ctx: StudioContext, now: Date = new Date()): { values: PolicyVersionInput; earliest: string; latestVersion: number | null } {
  assertAdmin(ctx);
  const latest = getDb().select().from(warrantyPolicies).where(eq(warrantyPolicies.studioId, ctx.studio.id)).orderBy(desc(warrantyPolicies.version)).get();
  const today = studioToday(ctx, now);
  const earliest = latest && latest.effectiveFrom > today ? latest.effectiveFrom : today;
  return { values: policyToForm(latest?.policy ?? null, earliest), earliest: latest ? earliest : "", latestVersion: latest?.version ?? null };
}

/**
 * Saves the editor's terms as a new version effective from the given date. Earlier versions are
 * never changed, so every piece keeps the version it was stamped with at delivery.
 */
export function createPolicyVersion(ctx: StudioContext, v: PolicyVersionValues, now: Date = new Date()) {
  assertAdmin(ctx);
  if (!CLAIM_CATEGORIES.some((c) => v.lines[c].covered)) throw badRequest("Cover at least one kind of claim.");
  const today = studioToday(ctx, now);
  return getDb().transaction((tx) => {
    const latest = tx.select().from(warrantyPolicies).where(eq(warrantyPolicies.studioId, ctx.studio.id)).orderBy(desc(warrantyPolicies.version)).get();
    if (latest) {
      const earliest = latest.effectiveFrom > today ? latest.effectiveFrom : today;
      if (v.effectiveFrom < earliest) {
        throw unprocessable("effective_too_early", "New terms can't start before today or before the newest terms.", {
          effectiveFrom: [
            latest.effectiveFrom > today
              ? `The newest terms are for deliveries from ${formatDate(latest.effectiveFrom)}; start these on that day or later.`
              : `Start on ${formatDate(today)} (today) or later: pieces already delivered keep the terms they were delivered with.`,
          ],
        });
      }
    }
    const version = (latest?.version ?? 0) + 1;
    const policy = formToPolicy(v, `v${version} from ${v.effectiveFrom}`);
    const row = tx
      .insert(warrantyPolicies)
      .values({ studioId: ctx.studio.id, version, effectiveFrom: v.effectiveFrom, policy, createdById: ctx.user.id })
      .returning()
      .get();
    recordAudit(tx, {
      studioId: ctx.studio.id,
      actorId: ctx.user.id,
      action: "policy.version_created",
      subjectType: "warranty_policy",
      subjectId: row.id,
      data: { version, effectiveFrom: v.effectiveFrom, changes: describePolicyChanges(latest?.policy ?? null, policy) },
    });
    return row;
  });
}
