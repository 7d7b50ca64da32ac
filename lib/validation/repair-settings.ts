// The studio's repair prices, rounding and tax (settings → Repair prices and tax). Strings as typed;
// lib/repairs/settings turns them into minor units and basis points.
import { z } from "zod";
import { SURFACES } from "@/lib/care/vocabulary";
import { LINE_KINDS, LINE_UNITS, ROUNDING_RULES, TAX_MODES } from "@/lib/repairs/lines";

const pct = z
  .string({ error: "Enter a rate." })
  .trim()
  .regex(/^\d{1,3}(\.\d{1,2})?$/, "A percentage like 8.5 (at most two decimals).")
  .refine((v) => Number(v) <= 100, "A rate can't be above 100 %.");

export const priceListEntrySchema = z.object({
  key: z.string().trim().max(64).default(""),
  label: z.string({ error: "Name the task." }).trim().min(1, "Name the task.").max(120, "Use at most 120 characters."),
  kind: z.enum(LINE_KINDS, { error: "Pick a kind." }),
  unit: z.enum(LINE_UNITS, { error: "Pick a unit." }),
  /** The surface an area-priced task's size is read from (lib/repairs/price-list entrySurface); empty: not said. */
  surface: z.enum(["", ...SURFACES], { error: "Pick a surface." }).default(""),
  /** Major units as typed; empty on an hourly task means "at the labour rate". */
  price: z
    .string()
    .trim()
    .regex(/^(\d{1,9}(\.\d{1,3})?)?$/, "A plain amount like 85.00 (no currency sign), or empty."),
});

export const repairSettingsSchema = z
  .object({
    roundingRule: z.enum(ROUNDING_RULES, { error: "Pick how quotes are rounded." }),
    taxMode: z.enum(TAX_MODES, { error: "Pick how tax is charged." }),
    taxInclusive: z.boolean(),
    taxRates: z.object({ labour: pct, materials: pct, travel: pct, other: pct }),
    taxNumber: z.string().trim().max(60, "Use at most 60 characters."),
    priceList: z.array(priceListEntrySchema).min(1, "Keep at least one repair task.").max(40, "At most 40 tasks."),
  })
  .superRefine((v, ctx) => {
    v.priceList.forEach((e, i) => {
      if (e.price === "" && e.unit !== "h") ctx.addIssue({ code: "custom", path: ["priceList", i, "price"], message: "Give a price; only hourly tasks can follow the labour rate." });
    });
  });
export type RepairSettingsInput = z.input<typeof repairSettingsSchema>;
