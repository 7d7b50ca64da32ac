import { z } from "zod";
import { CARE_TASK_KINDS, SURFACES } from "@/lib/care/vocabulary";
import { JOB_STATES } from "@/lib/care/vocabulary";
import { LINE_KINDS, LINE_SOURCES, LINE_UNITS } from "@/lib/repairs/lines";
import { inWords } from "@/lib/validation/words";

const id = z.string().min(1).max(64);

/** A surface's area as typed on a quote, m²: up to 50 m² (a very long dining top is under 4 m²). */
const area = z.coerce
  .number({ message: "Enter the area as a number." })
  .positive("The area must be more than 0.")
  .max(50, "That area is too large for one surface of a piece.");

/** Up to three decimals: 0.75 h, 1.5 m², 120 mL. */
const quantity = z.coerce
  .number({ message: "Enter a quantity." })
  .positive("The quantity must be more than 0.")
  .max(100_000, "That quantity is too large.")
  .refine((q) => Math.abs(Math.round(q * 1000) - q * 1000) < 1e-6, "Use at most three decimals.");

/** One quote line as staff send it; its money is always recomputed (lib/repairs/lines priceLines). */
export const quoteLineSchema = z.object({
  kind: z.enum(LINE_KINDS),
  source: z.enum(LINE_SOURCES),
  ref: z.string().max(120).optional(),
  description: z.string().trim().min(1, "Describe the line.").max(200, "Keep the description under 200 characters."),
  quantity,
  unit: z.enum(LINE_UNITS),
  unitPriceMinor: z.coerce.number({ message: "Enter a price." }).int("Whole minor units (cents).").min(0, "A price can't be negative.").max(100_000_000, "That price is too large."),
});

/**
 * What staff edit on a job's quote. The tasks, repairs, products, coats and travel are what the care
 * engine and the price list propose from; `lines` are the lines as sent (edited hours and quantities,
 * typed lines). Without `lines`, the proposal becomes the lines (typed lines already on the job stay).
 */
export const jobQuoteSchema = z
  .object({
    title: z.string().trim().min(1, "Give the job a title.").max(160, "Keep the title under 160 characters."),
    tasks: z.array(z.enum(CARE_TASK_KINDS)).max(10),
    /** Keys of the studio's repair price list. */
    repairs: z.array(z.string().min(1).max(64)).max(20).optional(),
    productIds: z.array(id).max(10, "At most 10 products."),
    coats: z.coerce.number().int().min(1, "At least one coat.").max(6, "At most six coats."),
    travel: z.boolean(),
    coveredPct: z.coerce.number({ error: "Enter the share as a number from 0 to 100." }).int("Use a whole percent, from 0 to 100.").min(0, "Enter a share from 0 to 100 %.").max(100, "Enter a share from 0 to 100 %."),
    notes: z.string().max(4000, "Keep notes under 4,000 characters.").default(""),
    /**
     * Sizes staff typed for surfaces the piece's record has no size for (m², one face), so the work on
     * them can be proposed (lib/repairs/pricing quoteAreaM2); the record's own size always wins.
     */
    areasM2: z.partialRecord(z.enum(SURFACES), area).optional(),
    /**
     * For a task whose finish is the outer coat of the top and of other surfaces too (an oiled top and
     * base), the other surfaces staff chose to price as well, by task (lib/repairs/pricing proposeLines).
     * Without it (quotes saved before it existed) the top alone is priced.
     */
    alsoSurfaces: z.partialRecord(z.enum(CARE_TASK_KINDS), z.array(z.enum(SURFACES).exclude(["top"])).max(SURFACES.length - 1)).optional(),
    lines: z.array(quoteLineSchema).max(40, "At most 40 lines.").optional(),
  })
  .refine((v) => v.tasks.length + (v.repairs?.length ?? 0) + (v.lines?.length ?? 0) > 0, { message: "Pick at least one task or add a line.", path: ["tasks"] });
export type JobQuoteInput = z.infer<typeof jobQuoteSchema>;
export type QuoteLineInput = z.infer<typeof quoteLineSchema>;

/**
 * What PATCH /api/jobs/[id] would refuse in a quote, the first message of each field by its path
 * ("coveredPct", "lines.0.quantity"): the quote builder checks the same schema on the press, so the
 * warranty share's bound shows beside the lines' problems rather than after they are fixed.
 */
export function quoteProblems(body: unknown): Record<string, string> {
  const problems: Record<string, string> = {};
  for (const issue of jobQuoteSchema.safeParse(body, { error: inWords }).error?.issues ?? []) problems[issue.path.join(".")] ??= issue.message;
  return problems;
}

export const createJobSchema = z.object({
  from: z.enum(["claim", "refresh_offer"]),
  id,
});

export const jobListQuerySchema = z.object({
  state: z.enum(JOB_STATES).optional(),
});

export const jobIdParams = z.object({ id });
/** A staff refund on a job: /api/jobs/[id]/refund/[refundId]. */
export const jobRefundParams = z.object({ id, refundId: id });
