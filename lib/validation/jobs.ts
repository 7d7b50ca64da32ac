import { z } from "zod";
import { CARE_TASK_KINDS } from "@/lib/care/vocabulary";
import { JOB_STATES } from "@/lib/care/vocabulary";

const id = z.string().min(1).max(64);

/** What staff edit on a job's quote; the totals are always recomputed by lib/care quote(). */
export const jobQuoteSchema = z.object({
  title: z.string().trim().min(1, "Give the job a title.").max(160),
  tasks: z.array(z.enum(CARE_TASK_KINDS)).min(1, "Pick at least one task.").max(10),
  productIds: z.array(id).max(10, "At most 10 products."),
  coats: z.coerce.number().int().min(1, "At least one coat.").max(6, "At most six coats."),
  travel: z.boolean(),
  coveredPct: z.coerce.number().int().min(0).max(100),
  notes: z.string().max(4000, "Keep notes under 4,000 characters.").default(""),
});
export type JobQuoteInput = z.infer<typeof jobQuoteSchema>;

export const createJobSchema = z.object({
  from: z.enum(["claim", "refresh_offer"]),
  id,
});

export const jobListQuerySchema = z.object({
  state: z.enum(JOB_STATES).optional(),
});

export const jobIdParams = z.object({ id });
