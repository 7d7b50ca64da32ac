// Plan subscriptions: starting one (Checkout in subscription mode, or by staff for a client who paid
// by other means), cancelling at the period's end, and the one function every state move goes through.
import { and, desc, eq, inArray, isNotNull, isNull, lt } from "drizzle-orm";
import type { User } from "lucia";
import { getDb, type Tx } from "@/db/client";
import { planInvoices, planSubscriptions, pieces, studios, type PlanSubscription, type PlanTemplate } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioActor } from "@/lib/auth/actor";
import { env } from "@/lib/env";
import { conflict, notFound } from "@/lib/errors";
import { ownedPieceRow } from "@/lib/owner/pieces";
import { accountFor, callStripe, expireCheckoutSession } from "@/lib/payments/stripe";
import { assertPlanMove, PLAN_COVERS, type PlanState } from "./states";
import { addPeriod } from "./periods";
import { syncPlanSubscription, withPlanLock } from "./stripe-sync";
import { planPrice } from "./price";
import { templateOf, templatesFitting } from "./templates";


/** Days a plan keeps covering after a failed renewal (the owner is mailed the last day). Common practice, no published source. */
export const PLAN_GRACE_DAYS = 14;

/** Who moved a plan: a staff member, or Stripe (a verified event), or the scheduler at a period's end. */
export type PlanMover = { actorId: string | null; source: "staff" | "stripe" | "scheduler" | "owner" };

/**
 * The one place a plan changes state: checks the move (lib/plans/states.ts), writes it with the
 * fields that go with it only if nobody moved the row meanwhile (version), and audits it.
 */
export function moveSubscription(tx: Tx, sub: PlanSubscription, to: PlanState, set: Partial<PlanSubscription>, by: PlanMover): PlanSubscription {
  // A plan past awaiting_payment has no payment page left open: it gives up the piece's one (startPlanCheckout).
  if (to !== "awaiting_payment" && sub.checkoutClaimedAt) set = { ...set, checkoutClaimedAt: null };
  if (sub.state !== to) assertPlanMove(sub.state, to);
  else if (Object.entries(set).every(([k, v]) => same(sub[k as keyof PlanSubscription], v))) return sub; // nothing new: no write
  const next = tx
    .update(planSubscriptions)
    .set({ ...set, state: to, version: sub.version + 1, updatedAt: new Date() })
    .where(and(eq(planSubscriptions.id, sub.id), eq(planSubscriptions.version, sub.version)))
    .returning()
    .get();
  if (!next) throw conflict("The plan changed while this was being saved. Reload and try again.");
  if (sub.state !== to) {
    recordAudit(tx, { studioId: sub.studioId, actorId: by.actorId, action: `plan.${to}`, subjectType: "plan_subscription", subjectId: sub.id, data: { from: sub.state, to, source: by.source } });
  }
  return next;
}

function same(a: unknown, b: unknown): boolean {
  if (a instanceof Date || b instanceof Date) return a instanceof Date && b instanceof Date && a.getTime() === b.getTime();
  return a === b;
}

/**
 * Whether the plan's buyer still holds its piece. A plan that moved with the piece has no owner
 * (lib/plans/transfer.ts) and is not renewed, so it is not asked.
 */
export function buyerHoldsPiece(sub: Pick<PlanSubscription, "ownerId" | "pieceId">): boolean {
  if (sub.ownerId === null) return true;
  return !!getDb().select({ id: pieces.id }).from(pieces).where(and(eq(pieces.id, sub.pieceId), eq(pieces.ownerId, sub.ownerId))).get();
}

const LIVE: PlanState[] = [...PLAN_COVERS];

/** The plan a piece is under now (running, in grace, or ending), with its template version; null if none. */
export function livePlanOfPiece(pieceId: string): { sub: PlanSubscription; template: PlanTemplate } | null {
  const db = getDb();
  const sub = db.select().from(planSubscriptions).where(and(eq(planSubscriptions.pieceId, pieceId), inArray(planSubscriptions.state, LIVE))).orderBy(desc(planSubscriptions.createdAt)).get();
  if (!sub) return null;
  return { sub, template: templateOf(sub.studioId, sub.templateId) };
}

export const pieceUrl = (pieceId: string, query = "") => new URL(`/pieces/${pieceId}${query}`, env.APP_URL).href;
/** The owner's list of pieces: where mail about a piece they no longer hold sends them (its own page is gone for them). */
export const myPiecesUrl = () => new URL("/pieces", env.APP_URL).href;

function refuseIfCovered(pieceId: string) {
  if (livePlanOfPiece(pieceId)) throw conflict("This piece is already under a care plan.");
}

/**
 * The owner buys a plan for one of their pieces: a plan row waiting for payment, a Stripe Price and
 * Customer, and a Checkout Session in subscription mode carrying the plan's id, template version and
 * amount. An open checkout for the same plan version is reused.
 *
 * One piece, one plan: starts for a piece run one at a time in this process (two clicks, two tabs), and
 * every other payment page still open for the piece (another plan, another price, a former owner's) is
 * closed at Stripe first, so only the page handed out last can take money. A page completed meanwhile is
 * written as Stripe reports it; if that started a plan, this start is refused as any start on a covered
 * piece is.
 *
 * Across processes, the plan whose page is asked of Stripe first claims the piece's one open payment page
 * (checkoutClaimedAt; a partial unique index on the piece, migration 0036) in an immediate transaction. A
 * start that finds another plan's claim whose page is still being opened is refused with a 409 that says
 * so (it doesn't wait for that page or reuse it: it can't know the page yet); one that finds the page
 * already open closes it first, as above.
 */
export async function startPlanCheckout(user: Pick<User, "id" | "email" | "name">, pieceId: string, templateId: string): Promise<{ checkoutUrl: string; subscriptionId: string }> {
  const piece = ownedPieceRow(user, pieceId);
  return withPlanLock(`piece-checkout:${piece.id}`, () => startPlanCheckoutNow(user, piece.id, templateId));
}

/**
 * Closes every open plan payment page of the piece at Stripe except `keep`'s; one completed meanwhile is
 * synced. A plan whose page is closed unpaid ends (it was never paid), so it isn't asked about again.
 */
async function closeOtherPlanCheckouts(pieceId: string, keep: string | undefined, by: PlanMover): Promise<void> {
  const open = getDb()
    .select()
    .from(planSubscriptions)
    .where(and(eq(planSubscriptions.pieceId, pieceId), eq(planSubscriptions.state, "awaiting_payment"), isNotNull(planSubscriptions.checkoutSessionId)))
    .all()
    .filter((s) => s.checkoutSessionId !== keep);
  for (const sub of open) {
    const session = await expireCheckoutSession(sub.checkoutSessionId!, sub);
    const subscription = typeof session.subscription === "string" ? session.subscription : session.subscription?.id;
    if (session.status === "complete" && subscription) await syncPlanSubscription(subscription, undefined, sub);
    else if (session.status === "expired") {
      getDb().transaction((tx) => {
        const fresh = tx.select().from(planSubscriptions).where(eq(planSubscriptions.id, sub.id)).get()!;
        if (fresh.state === "awaiting_payment" && fresh.checkoutSessionId === session.id) moveSubscription(tx, fresh, "ended", { endedAt: new Date() }, by);
      });
    }
    // Its page is closed or paid now: it no longer holds the piece's one open page.
    if (session.status !== "open") releaseCheckoutClaim(sub.id, session.id);
  }
  // A claim whose page was never made (the process stopped while asking Stripe) is let go once it is old.
  getDb()
    .update(planSubscriptions)
    .set({ checkoutClaimedAt: null })
    .where(and(eq(planSubscriptions.pieceId, pieceId), isNull(planSubscriptions.checkoutSessionId), lt(planSubscriptions.checkoutClaimedAt, new Date(Date.now() - CHECKOUT_CLAIM_STALE_MS))))
    .run();
}

/**
 * How long a plan's claim on the piece's payment page may stand with no page made: longer than asking
 * Stripe for one can take (three calls, each up to 10 s with 2 retries, lib/payments/stripe.ts).
 */
const CHECKOUT_CLAIM_STALE_MS = 3 * 60_000;

/** Lets go of the plan's claim on the piece's open payment page (only the claim of `sessionId`'s page, when given). */
function releaseCheckoutClaim(subId: string, sessionId?: string | null) {
  getDb()
    .update(planSubscriptions)
    .set({ checkoutClaimedAt: null })
    .where(and(eq(planSubscriptions.id, subId), sessionId === undefined ? undefined : sessionId === null ? isNull(planSubscriptions.checkoutSessionId) : eq(planSubscriptions.checkoutSessionId, sessionId)))
    .run();
}

/**
 * Claims the piece's one open payment page for `waiting` (still waiting for payment) or a new plan row,
 * in one immediate transaction: refused when another plan of the piece holds it (its page is being
 * opened now, in another tab or process). The partial unique index makes a second claim impossible
 * whatever the order.
 */
function claimCheckout(user: Pick<User, "id">, piece: { id: string; studioId: string }, template: PlanTemplate, totalMinor: number, waiting: PlanSubscription | undefined): PlanSubscription {
  return getDb().transaction(
    (tx) => {
      const now = new Date();
      const again = waiting ? tx.select().from(planSubscriptions).where(and(eq(planSubscriptions.id, waiting.id), eq(planSubscriptions.state, "awaiting_payment"))).get() : undefined;
      const holder = tx.select({ id: planSubscriptions.id }).from(planSubscriptions).where(and(eq(planSubscriptions.pieceId, piece.id), isNotNull(planSubscriptions.checkoutClaimedAt))).get();
      if (holder && holder.id !== again?.id) throw conflict(CHECKOUT_OPENING, { code: "plan_checkout_opening" });
      if (again) return tx.update(planSubscriptions).set({ checkoutClaimedAt: now }).where(eq(planSubscriptions.id, again.id)).returning().get()!;
      const row = tx.insert(planSubscriptions).values({ studioId: piece.studioId, templateId: template.id, pieceId: piece.id, ownerId: user.id, payerId: user.id, amountMinor: totalMinor, currency: template.currency, paidBy: "card", checkoutClaimedAt: now }).returning().get();
      recordAudit(tx, { studioId: piece.studioId, actorId: user.id, action: "plan.checkout_started", subjectType: "plan_subscription", subjectId: row.id, data: { templateId: template.id, version: template.version, amountMinor: totalMinor } });
      return row;
    },
    { behavior: "immediate" },
  );
}

const CHECKOUT_OPENING = "A payment page for a care plan on this piece is being opened right now, in another tab or window. Finish there, or try again in a minute.";

async function startPlanCheckoutNow(user: Pick<User, "id" | "email" | "name">, pieceId: string, templateId: string): Promise<{ checkoutUrl: string; subscriptionId: string }> {
  const piece = ownedPieceRow(user, pieceId);
  const template = templatesFitting(piece).find((t) => t.id === templateId);
  if (!template) throw notFound("That plan isn't offered for this piece. Reload to see the current plans.");
  refuseIfCovered(piece.id);
  const studio = getDb().select().from(studios).where(eq(studios.id, piece.studioId)).get()!;
  const { totalMinor } = planPrice(studio, template);
  const db = getDb();
  const waiting = db
    .select()
    .from(planSubscriptions)
    .where(and(eq(planSubscriptions.pieceId, piece.id), eq(planSubscriptions.ownerId, user.id), eq(planSubscriptions.templateId, template.id), eq(planSubscriptions.amountMinor, totalMinor), eq(planSubscriptions.state, "awaiting_payment")))
    .get();
  const live = waiting?.checkoutSessionId ? await callStripe("check the open payment page", (s) => s.checkout.sessions.retrieve(waiting.checkoutSessionId!), waiting) : null;
  const reuse = live?.status === "open" && live.url ? live.id : undefined;
  await closeOtherPlanCheckouts(piece.id, reuse, { actorId: user.id, source: "owner" });
  // A page closed just now may have been paid first, and started a plan.
  refuseIfCovered(piece.id);
  if (reuse) return { checkoutUrl: live!.url!, subscriptionId: waiting!.id };
  const sub = claimCheckout(user, piece, template, totalMinor, waiting);
  const metadata = { planSubscriptionId: sub.id, studioId: piece.studioId, templateId: template.id, amountMinor: String(totalMinor) };
  // The account the plan is bought under now; every later call about it uses the same one.
  const home = { studioId: piece.studioId, stripeAccount: accountFor(piece.studioId) };
  const session = await callStripe("start the payment", async (stripe) => {
    const price = await stripe.prices.create(
      { currency: template.currency.toLowerCase(), unit_amount: totalMinor, recurring: { interval: template.interval }, product_data: { name: `${template.name} (care plan)` }, metadata: { templateId: template.id } },
      { idempotencyKey: `plan-price-${template.id}-${totalMinor}` },
    );
    const customer = await stripe.customers.create({ email: user.email, name: user.name, metadata: { userId: user.id } }, { idempotencyKey: `plan-customer-${user.id}-${piece.studioId}` });
    return stripe.checkout.sessions.create(
      {
        mode: "subscription",
        customer: customer.id,
        client_reference_id: sub.id,
        line_items: [{ price: price.id, quantity: 1 }],
        metadata,
        subscription_data: { metadata },
        success_url: pieceUrl(piece.id, "?plan=started&session_id={CHECKOUT_SESSION_ID}"),
        cancel_url: pieceUrl(piece.id, "?plan=cancelled"),
      },
      { idempotencyKey: `plan-checkout-${sub.id}-${sub.version}-${Date.now()}` },
    );
  }, home).catch((e: unknown) => {
    // No page was made for this claim (or none we know of): the next start may make one.
    releaseCheckoutClaim(sub.id, sub.checkoutSessionId);
    throw e;
  });
  db.update(planSubscriptions).set({ checkoutSessionId: session.id, checkoutUrl: session.url, stripeAccount: home.stripeAccount, stripeCustomerId: typeof session.customer === "string" ? session.customer : null, updatedAt: new Date() }).where(eq(planSubscriptions.id, sub.id)).run();
  return { checkoutUrl: session.url!, subscriptionId: sub.id };
}

/** Staff start a plan for a client who paid by other means: running at once for one period, recorded as such. */
export function startPlanByOtherMeans(ctx: StudioActor, input: { pieceId: string; templateId: string; paidByNote: string }, now = new Date()): PlanSubscription {
  const db = getDb();
  const piece = db.select().from(pieces).where(and(eq(pieces.id, input.pieceId), eq(pieces.studioId, ctx.studio.id))).get();
  if (!piece) throw notFound("No such piece in this studio.");
  if (!piece.ownerId) throw conflict("This piece has no registered owner to start a plan for.");
  const template = templateOf(ctx.studio.id, input.templateId);
  if (!templatesFitting(piece).some((t) => t.id === template.id)) throw conflict(template.supersededAt || !template.offered ? "That plan version is no longer offered. Reload to see the current plans." : "That plan doesn't fit this piece.");
  refuseIfCovered(piece.id);
  const { totalMinor, taxMinor } = planPrice(ctx.studio, template);
  const periodEnd = addPeriod(now, template.interval);
  return db.transaction((tx) => {
    const sub = tx
      .insert(planSubscriptions)
      .values({ studioId: ctx.studio.id, templateId: template.id, pieceId: piece.id, ownerId: piece.ownerId, payerId: piece.ownerId, amountMinor: totalMinor, currency: template.currency, paidBy: "other", paidByNote: input.paidByNote, createdById: ctx.user.id })
      .returning()
      .get();
    tx.insert(planInvoices).values({ studioId: ctx.studio.id, subscriptionId: sub.id, status: "paid", amountMinor: totalMinor, taxMinor, currency: template.currency, periodStart: now, periodEnd, at: now }).run();
    return moveSubscription(tx, sub, "running", { periodStart: now, periodEnd, startedAt: now }, { actorId: ctx.user.id, source: "staff" });
  });
}

/** A studio's plan by id, or a 404. */
export function studioSubscription(studioId: string, subId: string): PlanSubscription {
  const sub = getDb().select().from(planSubscriptions).where(and(eq(planSubscriptions.id, subId), eq(planSubscriptions.studioId, studioId))).get();
  if (!sub) throw notFound("No such plan in this studio.");
  return sub;
}
