import "server-only";
// What a studio still has to set up, read from its data each time (no stored flag): the overview
// shows the items left until every one is done (components/setup/setup-checklist.tsx).
import { and, count, eq, isNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import type { StudioContext } from "@/lib/auth/guards";
import { finishProducts, invitations, memberships, studios, warrantyPolicies } from "@/db/schema";

export type SetupItem = {
  key: string;
  label: string;
  hint: string;
  href: string;
  done: boolean;
};

/** For the studio's admins (the pages it links to are theirs); nothing for other roles. */
export function setupChecklist(ctx: Pick<StudioContext, "studio" | "role">, db = getDb()): SetupItem[] {
  if (ctx.role !== "admin") return [];
  const studioId = ctx.studio.id;
  const studio = db.select().from(studios).where(eq(studios.id, studioId)).get();
  if (!studio) return [];
  const has = (n: { n: number } | undefined) => (n?.n ?? 0) > 0;
  const policies = db.select({ n: count() }).from(warrantyPolicies).where(eq(warrantyPolicies.studioId, studioId)).get();
  const finishes = db
    .select({ n: count() })
    .from(finishProducts)
    .where(and(eq(finishProducts.studioId, studioId), isNull(finishProducts.archivedAt)))
    .get();
  const members = db.select({ n: count() }).from(memberships).where(eq(memberships.studioId, studioId)).get();
  const invited = db
    .select({ n: count() })
    .from(invitations)
    .where(and(eq(invitations.studioId, studioId), isNull(invitations.revokedAt)))
    .get();
  return [
    {
      key: "details",
      label: "Studio details",
      hint: "The workshop's address, printed on quotes and receipts.",
      href: "/studio/settings",
      done: studio.address.trim() !== "",
    },
    {
      key: "warranty",
      label: "Warranty terms",
      hint: "What your warranty covers and for how long; each piece keeps the terms of its delivery day.",
      href: "/studio/settings/warranty",
      done: has(policies),
    },
    {
      key: "catalog",
      label: "Finish catalog",
      hint: "The oils, waxes and topcoats you use, so each piece's care can be worked out.",
      href: "/studio/catalog",
      done: has(finishes),
    },
    {
      key: "team",
      label: "Team invitations",
      hint: "Invite the people who answer claims and the technicians who visit.",
      href: "/studio/team",
      done: (members?.n ?? 0) > 1 || has(invited),
    },
    {
      key: "payments",
      label: "Repair prices for online payment",
      hint: "Your labour rate or price list, so owners can pay repair quotes by card.",
      href: "/studio/settings/repairs",
      done: studio.labourRateMinor > 0 || studio.repairPriceList.length > 0,
    },
    {
      key: "mail",
      label: "Reply address for e-mails",
      hint: "Where owners' answers to your e-mails go.",
      href: "/studio/settings",
      done: studio.email.trim() !== "",
    },
  ];
}
