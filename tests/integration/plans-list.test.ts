// The staff plans list and a plan's own page read from one query (lib/plans/overview): the list is the
// newest 500, newest first; a plan's page finds its own row however many plans the studio has, and
// another studio's plan is not there. Real SQLite; all data invented.
import { eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { planSubscriptions } from "@/db/schema";
import { listStudioPlans, studioPlanRow } from "@/lib/plans/overview";
import { startPlanByOtherMeans } from "@/lib/plans/subscriptions";
import { createTemplate } from "@/lib/plans/templates";
import { createPiece, createStudio, createUser, memberContext, planTemplateInput } from "../support/fixtures";

describe("the staff plans list and a plan's page", () => {
  it("lists the newest 500 newest first; a plan's page finds an old plan beyond them; another studio's plan is undefined", async () => {
    const studio = createStudio({ taxRateBp: 0 });
    const admin = await memberContext(studio, "admin");
    const template = createTemplate(admin, planTemplateInput());
    const { piece } = createPiece(studio, { ownerId: (await createUser()).id });
    const first = startPlanByOtherMeans(admin, { pieceId: piece.id, templateId: template.id, paidByNote: "bank transfer (test)" });
    const t0 = Date.UTC(2025, 0, 1);
    getDb().update(planSubscriptions).set({ createdAt: new Date(t0) }).where(eq(planSubscriptions.id, first.id)).run();
    // 510 more plans of the same piece, each a minute newer than the last (copies of the first row).
    const columns = getDb().all<{ name: string }>(sql`SELECT name FROM pragma_table_info('plan_subscriptions')`).map((c) => c.name);
    const picked = columns.map((c) => (c === "id" ? `'copy-' || i` : c === "created_at" ? `${t0} + i * 60000` : c)).join(", ");
    getDb().$client.exec(`WITH RECURSIVE n(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM n WHERE i < 510) INSERT INTO plan_subscriptions (${columns.join(", ")}) SELECT ${picked} FROM n, plan_subscriptions WHERE plan_subscriptions.id = '${first.id}'`);

    const list = listStudioPlans(admin);
    expect(list).toHaveLength(500);
    expect(list[0]!.id).toBe("copy-510");
    expect(list[499]!.id).toBe("copy-11");
    expect(list.map((p) => p.id)).not.toContain(first.id);

    expect(studioPlanRow(admin, first.id)).toMatchObject({ id: first.id, planName: "Finish keeping (invented)", pieceTitle: piece.title, interval: "year" });
    const other = await memberContext(createStudio(), "admin");
    expect(studioPlanRow(other, first.id)).toBeUndefined();
  });
});
