// The demo studio's overview shows figures from its seeded (invented) history: nothing that should
// have a year of data is empty, and the numbers agree with the ledger and claims the seed wrote.
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { claims, memberships, reminderSends, studios, users } from "@/db/schema";
import { AlreadySeededError, DEMO_ACCOUNTS, DEMO_STUDIO_SLUG, seedDemo } from "@/db/seed/demo";
import type { StudioContext } from "@/lib/auth/guards";
import { getOverview, type Overview } from "@/lib/overview";

let o: Overview;
let studioId: string;

beforeAll(async () => {
  const db = getDb();
  try {
    await seedDemo(db);
  } catch (e) {
    if (!(e instanceof AlreadySeededError)) throw e;
  }
  const studio = db.select().from(studios).where(eq(studios.slug, DEMO_STUDIO_SLUG)).get()!;
  studioId = studio.id;
  const maren = db.select().from(users).where(eq(users.email, DEMO_ACCOUNTS.maren.email)).get()!;
  const role = db.select().from(memberships).where(eq(memberships.userId, maren.id)).get()!.role;
  const ctx = { user: { id: maren.id, email: maren.email, name: maren.name, emailVerifiedAt: maren.emailVerifiedAt, timeZone: maren.timeZone, unitSystem: maren.unitSystem, remindersEnabled: maren.remindersEnabled }, studio, role } satisfies StudioContext;
  o = getOverview(ctx);
  if (process.env.GW_PRINT_OVERVIEW) console.log(JSON.stringify({ ...o, revenue: { ...o.revenue, months: o.revenue.months.filter((m) => m.paidMinor) } }, null, 1));
}, 60_000);

describe("the demo's overview", () => {
  it("has pieces, care coming due, reminders with care in return, claims, offers and revenue", () => {
    expect(o.pieces.delivered).toBeGreaterThanOrEqual(10);
    expect(o.pieces.underWarranty).toBeGreaterThan(0);
    expect(o.care.due + o.care.overdue).toBeGreaterThan(0);
    expect(o.reminders.sent).toBeGreaterThan(0);
    expect(o.reminders.acted).toBeGreaterThan(0);
    expect(o.reminders.acted).toBeLessThan(o.reminders.sent);
    expect(o.claims.total).toBeGreaterThan(0);
    expect(o.offers.sent).toBeGreaterThan(0);
    expect(o.offers.accepted).toBeGreaterThan(0);
    expect(o.revenue.totalNetMinor).toBeGreaterThan(0);
  });

  it("agrees with the rows the seed wrote", () => {
    const db = getDb();
    expect(o.claims.total).toBe(db.select().from(claims).where(eq(claims.studioId, studioId)).all().length);
    expect(o.reminders.sent).toBe(db.select().from(reminderSends).where(eq(reminderSends.studioId, studioId)).all().length);
  });
});
