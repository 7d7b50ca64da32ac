import "server-only";
// What a studio still has to set up. Each step is done when its data says so (an address, a warranty
// version, a catalog entry, a second member, a checked Stripe key) or once it has been saved from its
// page (studios.setupDone, written by markSetupStep beside the save). A skipped step is simply not
// saved: it stays on the list. The overview shows the steps left (components/setup/setup-checklist.tsx),
// each linking to its page in the set-up (app/studio/setup/[step]).
import { and, count, eq, isNull } from "drizzle-orm";
import { getDb, type Db } from "@/db/client";
import type { StudioContext } from "@/lib/auth/guards";
import { finishProducts, invitations, memberships, studios, visitRules, warrantyPolicies } from "@/db/schema";

export const SETUP_STEPS = ["details", "brand", "warranty", "catalog", "reminders", "visits", "team", "payments", "mail"] as const;
export type SetupStep = (typeof SETUP_STEPS)[number];

export const SETUP_STEP_WORDS: Record<SetupStep, { label: string; hint: string }> = {
  details: { label: "Studio details", hint: "Name, address, phone, time zone, currency, units and tax, printed on quotes and receipts." },
  brand: { label: "Logo and colour", hint: "Your logo and colour on e-mails, owners' pages, drawer cards and receipts." },
  warranty: { label: "Warranty terms", hint: "What your warranty covers and for how long; each piece keeps the terms of its delivery day." },
  catalog: { label: "Finish catalog", hint: "The oils, waxes and topcoats you use, so each piece's care can be worked out." },
  reminders: { label: "Reminder timing", hint: "When owners are reminded of the care their pieces need." },
  visits: { label: "Visits and technicians' hours", hint: "How far ahead owners can book a visit, and when your technicians work." },
  team: { label: "Team invitations", hint: "Invite the people who answer claims and the technicians who visit." },
  payments: { label: "Online payments", hint: "Your Stripe key, so owners can pay repair quotes by card." },
  mail: { label: "E-mail sender", hint: "The name your e-mails come from and where owners' answers go." },
};

export type SetupItem = {
  key: SetupStep;
  label: string;
  hint: string;
  href: string;
  done: boolean;
};

export function isSetupStep(s: string): s is SetupStep {
  return (SETUP_STEPS as readonly string[]).includes(s);
}

export const setupHref = (step: SetupStep) => `/studio/setup/${step}`;

/** Every step with whether it is done, in the set-up's order; for the studio's admins only (nothing for other roles). */
export function setupChecklist(ctx: Pick<StudioContext, "studio" | "role">, db: Db = getDb()): SetupItem[] {
  if (ctx.role !== "admin") return [];
  const studioId = ctx.studio.id;
  const studio = db.select().from(studios).where(eq(studios.id, studioId)).get();
  if (!studio) return [];
  const n = (row: { n: number } | undefined) => row?.n ?? 0;
  const policies = n(db.select({ n: count() }).from(warrantyPolicies).where(eq(warrantyPolicies.studioId, studioId)).get());
  const finishes = n(db.select({ n: count() }).from(finishProducts).where(and(eq(finishProducts.studioId, studioId), isNull(finishProducts.archivedAt))).get());
  const members = n(db.select({ n: count() }).from(memberships).where(eq(memberships.studioId, studioId)).get());
  const invited = n(db.select({ n: count() }).from(invitations).where(and(eq(invitations.studioId, studioId), isNull(invitations.revokedAt))).get());
  const rules = n(db.select({ n: count() }).from(visitRules).where(eq(visitRules.studioId, studioId)).get());
  const saved = new Set(studio.setupDone);
  const fromData: Record<SetupStep, boolean> = {
    details: studio.address.trim() !== "",
    brand: studio.logoKey !== null || studio.accent !== "default",
    warranty: policies > 0,
    catalog: finishes > 0,
    reminders: false,
    visits: rules > 0,
    team: members > 1 || invited > 0,
    payments: studio.stripeCheckedAt !== null,
    mail: studio.email.trim() !== "" && studio.mailSenderName.trim() !== "",
  };
  return SETUP_STEPS.map((key) => ({ key, ...SETUP_STEP_WORDS[key], href: setupHref(key), done: fromData[key] || saved.has(key) }));
}

/** The step to open when an admin comes back to the set-up: the first not done, or null when all are. */
export function firstUnfinishedStep(items: SetupItem[]): SetupStep | null {
  return items.find((i) => !i.done)?.key ?? null;
}

/** Notes that a step was saved from its page; call it inside the save's transaction. */
export function markSetupStep(tx: Pick<Db, "select" | "update">, studioId: string, step: SetupStep): void {
  const row = tx.select({ done: studios.setupDone }).from(studios).where(eq(studios.id, studioId)).get();
  if (!row || row.done.includes(step)) return;
  tx.update(studios)
    .set({ setupDone: SETUP_STEPS.filter((s) => s === step || row.done.includes(s)) })
    .where(eq(studios.id, studioId))
    .run();
}
