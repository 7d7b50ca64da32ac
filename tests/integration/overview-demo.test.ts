// The demo studio's overview shows figures from its seeded (invented) history: nothing that should
// have a year of data is empty, and the numbers agree with the ledger and claims the seed wrote.
import { eq } from "drizzle-orm";
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { claims, reminderSends, users } from "@/db/schema";
import { DEMO_ACCOUNTS } from "@/db/seed/demo";
import { getOverview, type Overview } from "@/lib/overview";
import { memberContextOf, seededDemoStudio } from "../support/demo-studio";

let o: Overview;
let studioId: string;

beforeAll(async () => {
  const studio = await seededDemoStudio();
  studioId = studio.id;
  const maren = getDb().select().from(users).where(eq(users.email, DEMO_ACCOUNTS.maren.email)).get()!;
  o = getOverview(memberContextOf(studio, maren.id));
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
