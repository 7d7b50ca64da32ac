// The plan template form (components/plans/template-form.tsx) and what it sends: every field a
// template holds round-trips through the form's values (lib/validation/plan-template-form); bad input
// is answered on the field it belongs to; a change saved through the form's values is a new version
// while a plan already running keeps the version it was bought under. Real SQLite file.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { planSubscriptions, planTemplates } from "@/db/schema";
import { startPlanByOtherMeans } from "@/lib/plans/subscriptions";
import { createTemplate, listTemplates, updateTemplate } from "@/lib/plans/templates";
import { planTemplateSchema, type PlanTemplateInput } from "@/lib/plans/validation";
import { templateFormSchema, templateFormValues, templateInputOf } from "@/lib/validation/plan-template-form";
import { createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";

const FULL: PlanTemplateInput = planTemplateSchema.parse({
  name: "Slab keeping (invented)",
  summary: "Yearly oil and a look at the joints.",
  included: { tasks: ["reoil", "annual_check"], visitsPerYear: 2, visitSharePct: 25, extendedLines: [{ category: "crack_gap", extraMonths: 24 }, { category: "finish_wear", extraMonths: 6 }], repairDiscountPct: 15 },
  fits: { finishClasses: ["hardwax_oil", "charred_oiled"], pieceKinds: ["dining_table", "bench"], minTopAreaM2: 0.75, maxTopAreaM2: 3.5 },
  priceMinor: 18_050,
  interval: "month",
  refundRule: "unused_share",
  transfers: true,
  offered: false,
});

describe("the template form's values", () => {
  it("carry every field of a template and back, unchanged", () => {
    const values = templateFormValues(FULL, 2);
    expect(values).toMatchObject({ price: "180.50", interval: "month", visitsPerYear: "2", minTopArea: "0.75", maxTopArea: "3.5", extraMonths: { crack_gap: "24", finish_wear: "6", structural: "" } });
    expect(templateFormSchema(2).safeParse(values).success).toBe(true);
    expect(planTemplateSchema.parse(templateInputOf(values, 2))).toEqual(FULL);
    // A currency without decimals (JPY): the price is typed whole.
    expect(templateFormValues({ ...FULL, priceMinor: 18_000 }, 0).price).toBe("18000");
    expect(templateInputOf({ ...values, price: "18000" }, 0).priceMinor).toBe(18_000);
  });

  it("answer bad input on the field it belongs to", () => {
    const values = templateFormValues(FULL, 2);
    const bad = templateFormSchema(2).safeParse({ ...values, name: "x", price: "12.345", visitsPerYear: "13", repairDiscountPct: "-5", minTopArea: "4", maxTopArea: "2", extraMonths: { ...values.extraMonths, structural: "200" } });
    expect(bad.success).toBe(false);
    const byPath = Object.fromEntries(bad.error!.issues.map((i) => [i.path.join("."), i.message]));
    expect(byPath).toMatchObject({
      name: "Give the plan a name.",
      price: "A price like 120 or 120.00.",
      visitsPerYear: "Visits a year: a whole number from 0 to 12.",
      repairDiscountPct: "The discount: a whole number from 0 to 100.",
      "extraMonths.structural": "Months from 0 to 120, or empty.",
    });
    // The cross-field check runs once the fields themselves are fine.
    const band = templateFormSchema(2).safeParse({ ...values, minTopArea: "4", maxTopArea: "2" });
    expect(band.error!.issues.map((i) => [i.path.join("."), i.message])).toEqual([["maxTopArea", "The largest top can't be smaller than the smallest."]]);
  });
});

describe("editing a template through the form's values", () => {
  it("saves a new version with every change; the plan running under the old one keeps it", async () => {
    const studio = createStudio({ email: `${unique("studio")}@test.example` });
    const admin = await memberContext(studio, "admin");
    const v1 = createTemplate(admin, { ...FULL, offered: true });
    const owner = await createUser();
    const { piece } = createPiece(studio, { ownerId: owner.id, kind: "bench" });
    const sub = startPlanByOtherMeans(admin, { pieceId: piece.id, templateId: v1.id, paidByNote: "Cash (invented)" });

    const edited = { ...templateFormValues(v1, 2), price: "199.00", interval: "year" as const, repairDiscountPct: "20", tasks: ["reoil" as const], extraMonths: { ...templateFormValues(v1, 2).extraMonths, finish_wear: "", structural: "12" }, maxTopArea: "", offered: false };
    expect(templateFormSchema(2).safeParse(edited).success).toBe(true);
    const v2 = updateTemplate(admin, v1.id, planTemplateSchema.parse(templateInputOf(edited, 2)));

    expect(v2).toMatchObject({ lineageId: v1.lineageId, version: 2, priceMinor: 19_900, interval: "year", offered: false });
    expect(v2.included).toEqual({ tasks: ["reoil"], visitsPerYear: 2, visitSharePct: 25, extendedLines: [{ category: "crack_gap", extraMonths: 24 }, { category: "structural", extraMonths: 12 }], repairDiscountPct: 20 });
    expect(v2.fits).toEqual({ finishClasses: ["hardwax_oil", "charred_oiled"], pieceKinds: ["dining_table", "bench"], minTopAreaM2: 0.75, maxTopAreaM2: null });
    // The settings list shows the new version only; the old one is kept, superseded.
    expect(listTemplates(studio.id).map((t) => [t.id, t.version])).toEqual([[v2.id, 2]]);
    const old = getDb().select().from(planTemplates).where(eq(planTemplates.id, v1.id)).get()!;
    expect(old.supersededAt).not.toBeNull();
    expect(old).toMatchObject({ priceMinor: 18_050, interval: "month", included: FULL.included });
    // The running plan still points at version 1, with its terms.
    expect(getDb().select().from(planSubscriptions).where(eq(planSubscriptions.id, sub.id)).get()!.templateId).toBe(v1.id);
  });
});
