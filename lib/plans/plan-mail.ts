// What every mail about a plan starts from: the owner it goes to, the studio it is sent for, the piece
// the plan covers, the zone its dates are written in, and the names each plan mail opens with
// (emails/components/plan-mail.tsx). Read once here for the held-payment, ending, grace and visit mails.
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { pieces, studios, users, type Piece, type PlanInvoice, type PlanSubscription, type PlanTemplate, type Studio, type User } from "@/db/schema";
import type { PlanMailNames } from "@/emails/components/plan-mail";
import { PlanPaidAfterHandOnEmail, planPaidAfterHandOnSubject } from "@/emails/plan-paid-after-hand-on";
import { PlanRenewalHeldEmail, planRenewalHeldSubject } from "@/emails/plan-renewal-held";
import { formatInstant, formatMoney } from "@/lib/format";
import { sendMail } from "@/lib/mail";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import { pieceUrl } from "./subscriptions";
import { templateOf } from "./templates";

export type PlanMailContext = {
  owner: User;
  studio: Studio;
  piece: Piece;
  /** The owner's time zone, else the studio's: the one the mail's dates are written in. */
  zone: string;
  names: PlanMailNames;
};

/** The plan's mail context; null when the plan has no owner (nobody to tell). `template` saves a read when the caller has it. */
export function planMailContext(sub: PlanSubscription, template?: Pick<PlanTemplate, "name">): PlanMailContext | null {
  const db = getDb();
  const owner = sub.ownerId ? db.select().from(users).where(eq(users.id, sub.ownerId)).get() : undefined;
  if (!owner) return null;
  const piece = db.select().from(pieces).where(eq(pieces.id, sub.pieceId)).get()!;
  const studio = db.select().from(studios).where(eq(studios.id, sub.studioId)).get()!;
  return {
    owner,
    studio,
    piece,
    zone: owner.timeZone || studio.timeZone,
    names: { ownerName: owner.name, studioName: studio.name, planName: (template ?? templateOf(sub.studioId, sub.templateId)).name, pieceTitle: piece.title },
  };
}

/**
 * Tells the person who paid for a plan after handing its piece on (lib/plans/held.ts) that the payment is
 * held, or, once staff have paid it back, that it is on its way back. After the change is committed; a
 * failed send never undoes it.
 */
export async function mailPaidAfterHandOn(sub: PlanSubscription, held: Pick<PlanInvoice, "amountMinor" | "currency" | "at">, stage: "held" | "paid_back"): Promise<void> {
  await mailAfterCommit(stage === "held" ? "plan payment held" : "held plan payment paid back", async () => {
    const context = planMailContext(sub);
    if (!context) return;
    const { owner, studio, zone } = context;
    const props = { ...context.names, stage, amount: formatMoney(held.amountMinor, held.currency, studio.country), paidOn: formatInstant(held.at, zone, { time: true }) };
    await sendMail({ studioId: sub.studioId, to: owner.email, subject: planPaidAfterHandOnSubject(props), email: PlanPaidAfterHandOnEmail(props), replyTo: studio.email || undefined });
  });
}

/**
 * Tells the person who paid (`payerId`: the plan's owner, or its former owner once the plan passed on
 * with its piece) that a payment nobody owed was paid back at once (lib/plans/stripe-sync.ts): a renewal
 * charged after the plan's end, or the first payment of a plan for a piece another plan already covers.
 * After the refund is made; a failed send never undoes it.
 */
export async function mailPaidBackUnowed(sub: PlanSubscription, payerId: string | null, paid: Pick<PlanInvoice, "amountMinor" | "currency" | "at">, why: "after_end" | "piece_covered"): Promise<void> {
  await mailAfterCommit("payment nobody owed paid back", async () => {
    const context = planMailContext({ ...sub, ownerId: payerId });
    if (!context) return;
    const { owner, studio, zone } = context;
    const stage = why === "after_end" ? ("renewal_paid_back" as const) : ("covered_paid_back" as const);
    const props = { ...context.names, stage, amount: formatMoney(paid.amountMinor, paid.currency, studio.country), paidOn: formatInstant(paid.at, zone, { time: true }) };
    await sendMail({ studioId: sub.studioId, to: owner.email, subject: planPaidAfterHandOnSubject(props), email: PlanPaidAfterHandOnEmail(props), replyTo: studio.email || undefined });
  });
}

/**
 * Tells the owner that a renewal charged at another amount than the plan's price is held for the studio
 * to check (lib/plans/held.ts); the decision has its own mail. After the hold is committed; a failed send
 * never undoes it.
 */
export async function mailRenewalHeld(sub: PlanSubscription, held: Pick<PlanInvoice, "amountMinor" | "currency" | "at">): Promise<void> {
  await mailAfterCommit("plan renewal held", async () => {
    const context = planMailContext(sub);
    if (!context) return;
    const { owner, studio, piece, zone } = context;
    const props = {
      ...context.names,
      charged: formatMoney(held.amountMinor, held.currency, studio.country),
      price: formatMoney(sub.amountMinor, sub.currency, studio.country),
      paidOn: formatInstant(held.at, zone, { time: true }),
      url: pieceUrl(piece.id),
    };
    await sendMail({ studioId: sub.studioId, to: owner.email, subject: planRenewalHeldSubject(props), email: PlanRenewalHeldEmail(props), replyTo: studio.email || undefined });
  });
}
