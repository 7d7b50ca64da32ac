// The plan template form's fields as typed (amounts and counts as text) and how they become the API's
// PlanTemplateInput: a zod schema the form checks with (react-hook-form, field by field) and the values
// an existing version fills it with. Pure: loaded by the browser on first use.
import { z } from "zod";
import { CARE_TASK_KINDS, CLAIM_CATEGORIES, FINISH_CLASSES, PIECE_KINDS, type ClaimCategory } from "@/lib/care/vocabulary";
import { parseMajorAmount } from "@/lib/repairs/lines";
import type { PlanTemplateInput } from "@/lib/plans/validation";
import { PLAN_INTERVALS, PLAN_REFUND_RULES } from "@/lib/plans/terms";

const whole = (what: string, min: number, max: number) =>
  z
    .string()
    .trim()
    .regex(/^\d{1,4}$/, `${what}: a whole number from ${min} to ${max}.`)
    .refine((t) => Number(t) >= min && Number(t) <= max, `${what}: a whole number from ${min} to ${max}.`);

/** A top area in m², blank for no bound. */
const area = z
  .string()
  .trim()
  .refine((t) => t === "" || (/^\d{1,3}([.,]\d{1,2})?$/.test(t) && Number(t.replace(",", ".")) <= 100), "An area in m² up to 100, like 1.5 — or leave it empty.");

const toArea = (t: string) => (t.trim() === "" ? null : Number(t.trim().replace(",", ".")));

/** The form's fields; `exponent` is the studio currency's number of decimals (2 for USD, 0 for JPY). */
export function templateFormSchema(exponent: number) {
  return z
    .object({
      name: z.string().trim().min(2, "Give the plan a name.").max(80, "Keep the name under 80 characters."),
      summary: z.string().trim().max(600, "Keep it under 600 characters."),
      price: z
        .string()
        .trim()
        .refine((t) => (parseMajorAmount(t, exponent) ?? 0) >= 1, exponent ? "A price like 120 or 120.00." : "A whole price like 12000."),
      interval: z.enum(PLAN_INTERVALS),
      tasks: z.array(z.enum(CARE_TASK_KINDS)),
      visitsPerYear: whole("Visits a year", 0, 12),
      visitSharePct: whole("The owner's share", 0, 100),
      repairDiscountPct: whole("The discount", 0, 100),
      extraMonths: z.record(z.enum(CLAIM_CATEGORIES), z.string().trim().refine((t) => t === "" || (/^\d{1,3}$/.test(t) && Number(t) <= 120), "Months from 0 to 120, or empty.")),
      finishClasses: z.array(z.enum(FINISH_CLASSES)),
      pieceKinds: z.array(z.enum(PIECE_KINDS)),
      minTopArea: area,
      maxTopArea: area,
      refundRule: z.enum(PLAN_REFUND_RULES),
      transfers: z.boolean(),
      offered: z.boolean(),
    })
    .refine((v) => v.minTopArea === "" || v.maxTopArea === "" || toArea(v.minTopArea)! <= toArea(v.maxTopArea)!, { message: "The largest top can't be smaller than the smallest.", path: ["maxTopArea"] });
}

export type TemplateFormValues = z.input<ReturnType<typeof templateFormSchema>>;

/** The checked form values as the API takes them. */
export function templateInputOf(v: TemplateFormValues, exponent: number): PlanTemplateInput {
  return {
    name: v.name.trim(),
    summary: v.summary.trim(),
    priceMinor: parseMajorAmount(v.price, exponent) ?? 0,
    interval: v.interval,
    included: {
      tasks: [...v.tasks],
      visitsPerYear: Number(v.visitsPerYear),
      visitSharePct: Number(v.visitSharePct),
      repairDiscountPct: Number(v.repairDiscountPct),
      extendedLines: CLAIM_CATEGORIES.filter((c) => Number(v.extraMonths[c] || 0) > 0).map((category) => ({ category, extraMonths: Number(v.extraMonths[category]) })),
    },
    fits: { finishClasses: [...v.finishClasses], pieceKinds: [...v.pieceKinds], minTopAreaM2: toArea(v.minTopArea), maxTopAreaM2: toArea(v.maxTopArea) },
    refundRule: v.refundRule,
    transfers: v.transfers,
    offered: v.offered,
  };
}

/** The form filled with a template version (or empty, for a new plan). */
export function templateFormValues(t: PlanTemplateInput | null, exponent: number): TemplateFormValues {
  const months = Object.fromEntries(CLAIM_CATEGORIES.map((c) => [c, String(t?.included.extendedLines.find((l) => l.category === c)?.extraMonths ?? "")])) as Record<ClaimCategory, string>;
  const major = (minor: number) => (exponent ? (minor / 10 ** exponent).toFixed(exponent) : String(minor));
  return {
    name: t?.name ?? "",
    summary: t?.summary ?? "",
    price: t ? major(t.priceMinor) : "",
    interval: t?.interval ?? "year",
    tasks: t ? [...t.included.tasks] : [],
    visitsPerYear: String(t?.included.visitsPerYear ?? 1),
    visitSharePct: String(t?.included.visitSharePct ?? 0),
    repairDiscountPct: String(t?.included.repairDiscountPct ?? 0),
    extraMonths: months,
    finishClasses: t ? [...t.fits.finishClasses] : [],
    pieceKinds: t ? [...t.fits.pieceKinds] : [],
    minTopArea: t?.fits.minTopAreaM2 == null ? "" : String(t.fits.minTopAreaM2),
    maxTopArea: t?.fits.maxTopAreaM2 == null ? "" : String(t.fits.maxTopAreaM2),
    refundRule: t?.refundRule ?? "none",
    transfers: t?.transfers ?? false,
    offered: t?.offered ?? true,
  };
}
