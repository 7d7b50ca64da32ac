// What staff may send for a plan template and for starting a plan by other means.
import { z } from "zod";
import { CARE_TASK_KINDS, CLAIM_CATEGORIES, FINISH_CLASSES, PIECE_KINDS } from "@/lib/care/vocabulary";
import { PLAN_INTERVALS, PLAN_REFUND_RULES } from "./terms";

const area = z.number().min(0).max(100).nullable();

export const planTemplateSchema = z
  .object({
    name: z.string().trim().min(2, "Give the plan a name.").max(80),
    summary: z.string().trim().max(600).default(""),
    included: z.object({
      tasks: z.array(z.enum(CARE_TASK_KINDS)).max(CARE_TASK_KINDS.length).default([]),
      visitsPerYear: z.number().int().min(0).max(12),
      visitSharePct: z.number().int().min(0).max(100).default(0),
      extendedLines: z
        .array(z.object({ category: z.enum(CLAIM_CATEGORIES), extraMonths: z.number().int().min(1).max(120) }))
        .max(CLAIM_CATEGORIES.length)
        .refine((ls) => new Set(ls.map((l) => l.category)).size === ls.length, "Each warranty line once.")
        .default([]),
      repairDiscountPct: z.number().int().min(0).max(100).default(0),
    }),
    fits: z
      .object({
        finishClasses: z.array(z.enum(FINISH_CLASSES)).max(FINISH_CLASSES.length).default([]),
        pieceKinds: z.array(z.enum(PIECE_KINDS)).max(PIECE_KINDS.length).default([]),
        minTopAreaM2: area.default(null),
        maxTopAreaM2: area.default(null),
      })
      .refine((f) => f.minTopAreaM2 == null || f.maxTopAreaM2 == null || f.minTopAreaM2 <= f.maxTopAreaM2, { message: "The smallest top can't be larger than the largest.", path: ["maxTopAreaM2"] }),
    priceMinor: z.number().int().min(1, "A plan needs a price.").max(100_000_000),
    interval: z.enum(PLAN_INTERVALS).default("year"),
    refundRule: z.enum(PLAN_REFUND_RULES).default("none"),
    transfers: z.boolean().default(false),
    offered: z.boolean().default(true),
  })
  .strict();
export type PlanTemplateInput = z.output<typeof planTemplateSchema>;

export const startPlanSchema = z
  .object({
    pieceId: z.string().min(1).max(64),
    templateId: z.string().min(1).max(64),
    /** How the client paid, for the record ("bank transfer 14 Nov"). */
    paidByNote: z.string().trim().min(2, "Say how the client paid.").max(200),
  })
  .strict();

export const buyPlanSchema = z.object({ pieceId: z.string().min(1).max(64), templateId: z.string().min(1).max(64) }).strict();
