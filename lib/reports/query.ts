// Query strings of the reports pages and the CSV route. Empty strings count as absent, so a GET form
// with a blank field gives the default.
import { z } from "zod";
import { CLAIM_CATEGORIES, REMINDER_STEPS } from "@/lib/care/vocabulary";
import { filterDate } from "@/lib/validation/dates";

const dropEmpty = (query: unknown) => (query && typeof query === "object" ? Object.fromEntries(Object.entries(query).filter(([, v]) => v !== "" && v != null)) : query);

export const claimRatesQuerySchema = z.preprocess(
  dropEmpty,
  z
    .object({
      from: filterDate().optional(),
      to: filterDate().optional(),
      category: z.enum([...CLAIM_CATEGORIES, "all"], { error: "Pick a kind of claim from the list." }).default("all"),
    })
    .refine((q) => !q.from || !q.to || q.from <= q.to, { message: "The period must start on or before its end.", path: ["to"] }),
);
export type ClaimRatesQuery = z.output<typeof claimRatesQuerySchema>;

export const REPORT_LISTS = ["reminders", "offers", "revenue", "answers"] as const;
export type ReportList = (typeof REPORT_LISTS)[number];

export const reportListQuerySchema = z.preprocess(
  dropEmpty,
  z.object({
    step: z.enum(REMINDER_STEPS).optional(),
    acted: z.enum(["yes", "no"]).optional(),
    status: z.enum(["offered", "accepted", "declined", "expired"]).optional(),
    month: z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, "Use a month like 2026-03.").optional(),
    answered: z.enum(["yes", "no"]).optional(),
  }),
);
export type ReportListQuery = z.output<typeof reportListQuerySchema>;
