// A care plan's price as staff and owners read it (lib/plans/price-words): the amount with its period,
// never a version number; "price as of <day>" only once the plan has been changed since it was bought.
// Plans started by other means against a real SQLite file, read back as the staff plans list, the plan
// page, a client's page and the owner's piece page read them. All data is invented.
import { describe, expect, it } from "vitest";
import { formatInstant } from "@/lib/format";
import { piecePlan } from "@/lib/plans/offers";
import { listStudioPlans } from "@/lib/plans/overview";
import { formatPlanPrice, planPriceWords } from "@/lib/plans/price-words";
import { clientPiecePlans } from "@/lib/plans/staff";
import { startPlanByOtherMeans } from "@/lib/plans/subscriptions";
import { createTemplate, updateTemplate } from "@/lib/plans/templates";
import { createPiece, createStudio, createUser, memberContext, planTemplateInput } from "../support/fixtures";


describe("care plan prices in words", () => {
  it("formats the amount with its period", () => {
    expect(formatPlanPrice(15_190, "USD", "year", "US")).toBe("$151.90 a year");
    expect(formatPlanPrice(1_450, "USD", "month", "US")).toBe("$14.50 a month");
    const at = Date.UTC(2026, 2, 3, 12);
    expect(planPriceWords({ amountMinor: 15_190, currency: "USD", interval: "year", pricedAt: at, superseded: false }, "US", "UTC")).toBe("$151.90 a year");
    expect(planPriceWords({ amountMinor: 15_190, currency: "USD", interval: "year", pricedAt: at, superseded: true }, "US", "UTC")).toBe("$151.90 a year (price as of 3 March 2026)");
  });

  it("a plan started by other means reads with its period everywhere staff and the owner see it; after the plan changes, with the day its price was set", async () => {
    const studio = createStudio({ taxRateBp: 0 });
    const admin = await memberContext(studio, "admin");
    const owner = await createUser();
    const yearly = createTemplate(admin, planTemplateInput({}));
    const monthly = createTemplate(admin, planTemplateInput({ name: "Monthly keeping (invented)", priceMinor: 1_450, interval: "month" }));
    const { piece: a } = createPiece(studio, { ownerId: owner.id });
    const { piece: b } = createPiece(studio, { ownerId: owner.id });

    // A client's page offers each fitting plan with its period.
    const offered = clientPiecePlans(admin, [a.id])[0]!.fitting.map((f) => `${f.name} — ${formatPlanPrice(f.priceMinor, f.currency, f.interval, studio.country)}`).sort();
    expect(offered).toEqual(["Finish keeping (invented) — $151.90 a year", "Monthly keeping (invented) — $14.50 a month"]);

    const subA = startPlanByOtherMeans(admin, { pieceId: a.id, templateId: yearly.id, paidByNote: "bank transfer (test)" });
    const subB = startPlanByOtherMeans(admin, { pieceId: b.id, templateId: monthly.id, paidByNote: "cash (test)" });
    const words = () => new Map(listStudioPlans(admin).map((p) => [p.id, planPriceWords(p, studio.country, studio.timeZone)]));
    expect(words().get(subA.id)).toBe("$151.90 a year");
    expect(words().get(subB.id)).toBe("$14.50 a month");
    expect(planPriceWords(piecePlan(a.id)!, studio.country, studio.timeZone)).toBe("$151.90 a year");
    expect([...words().values()].join(" ")).not.toMatch(/version|\(v\d/i);

    // The yearly plan is changed: the running plan keeps its price, now dated so staff can compare.
    updateTemplate(admin, yearly.id, planTemplateInput({ priceMinor: 16_500 }));
    const asOf = `$151.90 a year (price as of ${formatInstant(yearly.createdAt, studio.timeZone)})`;
    expect(words().get(subA.id)).toBe(asOf);
    expect(planPriceWords(clientPiecePlans(admin, [a.id])[0]!.plan!, studio.country, studio.timeZone)).toBe(asOf);
    expect(words().get(subB.id)).toBe("$14.50 a month");
  });
});
