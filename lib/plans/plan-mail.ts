// What every mail about a plan starts from: the owner it goes to, the studio it is sent for, the piece
// the plan covers, the zone its dates are written in, and the names each plan mail opens with
// (emails/components/plan-mail.tsx). Read once here for the held-payment, ending, grace and visit mails.
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { pieces, studios, users, type Piece, type PlanSubscription, type PlanTemplate, type Studio, type User } from "@/db/schema";
import type { PlanMailNames } from "@/emails/components/plan-mail";
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
