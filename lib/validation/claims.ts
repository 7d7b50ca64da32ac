import { z } from "zod";
import { CLAIM_AGE_FILTERS, CLAIM_CATEGORIES, CLAIM_DECISIONS, CLAIM_STATES } from "@/lib/care/vocabulary";
import { pastDate } from "./dates";

// Shared by the claim forms (react-hook-form's zod resolver) and the claim route handlers.


export const ANSWER_VALUES = ["yes", "no", "unsure"] as const;
const answer = z.enum(ANSWER_VALUES, "Choose yes, no or not sure.");


const optionalNumber = (min: number, max: number, what: string) =>
  z
    .number(`Enter ${what} as a number.`)
    .refine((n) => Number.isFinite(n), `Enter ${what} as a number.`)
    .min(min, `${what[0]!.toUpperCase()}${what.slice(1)} must be at least ${min}.`)
    .max(max, `${what[0]!.toUpperCase()}${what.slice(1)} must be at most ${max}.`)
    .nullish();

const fToC = (f: number) => ((f - 32) * 5) / 9;
const round1 = (n: number) => Math.round(n * 10) / 10;

/** The largest temperature change within a day an owner can report, by unit: 40 °C = 72 °F (a difference: × 9/5). */
export const MAX_DAILY_TEMP_CHANGE = { C: 40, F: 72 } as const;

/**
 * The room's driest and dampest conditions, as the owner read them, and the largest change within a
 * day (% RH, and degrees). Either all four readings or none. The owner types temperatures in the unit
 * they chose (their preference by default); they are stored in °C, to 0.1 °C: a reading converts
 * as (°F − 32) × 5/9, a change within a day as °F × 5/9 (no offset). Parsing stored answers again
 * leaves them as they are.
 */
export const roomClimateSchema = z
  .object({
    unit: z.enum(["C", "F"]).default("C"),
    driestTemp: optionalNumber(-20, 122, "the temperature"),
    driestRh: optionalNumber(0, 100, "the humidity"),
    dampestTemp: optionalNumber(-20, 122, "the temperature"),
    dampestRh: optionalNumber(0, 100, "the humidity"),
    dailySwingPct: optionalNumber(0, 100, "the daily change"),
    /** Largest temperature change within a day, in `unit` degrees (a difference), if the owner knows it. */
    dailyTempSwing: optionalNumber(0, 1000, "the daily temperature change"), // the limit by unit is checked below
  })
  .superRefine((r, ctx) => {
    const readings = { driestTemp: r.driestTemp, driestRh: r.driestRh, dampestTemp: r.dampestTemp, dampestRh: r.dampestRh };
    const given = Object.values(readings).filter((v) => v != null).length;
    if (given > 0 && given < 4) {
      for (const [k, v] of Object.entries(readings)) {
        if (v == null) ctx.addIssue({ code: "custom", path: [k], message: "Fill in all four readings, or leave them all empty." });
      }
    }
    if (given === 4 && r.driestRh! > r.dampestRh!) {
      ctx.addIssue({ code: "custom", path: ["dampestRh"], message: "The dampest humidity should be at least the driest." });
    }
    const [lo, hi] = r.unit === "F" ? [-4, 122] : [-20, 50];
    for (const k of ["driestTemp", "dampestTemp"] as const) {
      const t = r[k];
      if (t != null && (t < lo || t > hi)) ctx.addIssue({ code: "custom", path: [k], message: `Enter a room temperature between ${lo} and ${hi} °${r.unit}.` });
    }
    const maxChange = MAX_DAILY_TEMP_CHANGE[r.unit];
    if (r.dailyTempSwing != null && r.dailyTempSwing > maxChange) {
      ctx.addIssue({ code: "custom", path: ["dailyTempSwing"], message: `Enter a change within a day between 0 and ${maxChange} °${r.unit}.` });
    }
  })
  .transform((r) => {
    if (r.unit === "C") return { ...r, unit: "C" as const };
    const reading = (t: number | null | undefined) => (t == null ? t : round1(fToC(t)));
    return {
      ...r,
      unit: "C" as const,
      driestTemp: reading(r.driestTemp),
      dampestTemp: reading(r.dampestTemp),
      dailyTempSwing: r.dailyTempSwing == null ? r.dailyTempSwing : round1((r.dailyTempSwing * 5) / 9),
    };
  });

export const claimAnswersSchema = z.object({
  heat: answer,
  chemicals: answer,
  impact: answer,
  usedOutdoors: answer,
  directSun: answer,
  room: roomClimateSchema.optional(),
});
export type ClaimAnswersInput = z.input<typeof claimAnswersSchema>;
export type ClaimAnswers = z.output<typeof claimAnswersSchema>;

export const createClaimSchema = z.object({
  pieceId: z.string().trim().min(1, "Choose the piece.").max(64),
  category: z.enum(CLAIM_CATEGORIES, "Choose what kind of damage it is."),
  noticedOn: pastDate("Enter the date you noticed it, like 2026-03-14."),
  description: z
    .string()
    .trim()
    .min(10, "Tell the studio a little more (at least 10 characters).")
    .max(4000, "Use at most 4,000 characters."),
  answers: claimAnswersSchema,
});
export type CreateClaimInput = z.input<typeof createClaimSchema>;

export const claimMessageSchema = z.object({
  body: z.string().trim().min(1, "Write a message first.").max(4000, "Use at most 4,000 characters."),
  /** Staff only: ask the owner for more information (the claim waits on the owner). */
  requestInfo: z.boolean().optional(),
});
export type ClaimMessageInput = z.input<typeof claimMessageSchema>;

export const claimDecisionSchema = z
  .object({
    decision: z.enum(CLAIM_DECISIONS, "Choose a decision."),
    coveredPct: z.number().int("Use a whole percentage.").min(1, "Between 1 and 99 %.").max(99, "Between 1 and 99 %.").nullish(),
    reason: z.string().trim().max(2000, "Use at most 2,000 characters.").default(""),
    /** The claim version the decider saw; a newer version answers 409. */
    expectedVersion: z.number().int().min(0).optional(),
  })
  .superRefine((d, ctx) => {
    if (d.decision === "partly_covered" && d.coveredPct == null) ctx.addIssue({ code: "custom", path: ["coveredPct"], message: "Enter the covered share, 1–99 %." });
    if (d.decision === "declined" && d.reason.length < 5) ctx.addIssue({ code: "custom", path: ["reason"], message: "Tell the owner why (they will see this)." });
  });
export type ClaimDecisionInput = z.input<typeof claimDecisionSchema>;

export const claimStateSchema = z.object({
  to: z.enum(CLAIM_STATES, "Unknown state."),
  expectedVersion: z.number().int().min(0).optional(),
});

export { CLAIM_AGE_FILTERS };

export const claimListQuerySchema = z.object({
  state: z.enum([...CLAIM_STATES, "open", "all"]).default("open"),
  category: z.enum([...CLAIM_CATEGORIES, "all"]).default("all"),
  age: z.enum(CLAIM_AGE_FILTERS).default("any"),
  pieceId: z.string().max(64).optional().transform((v) => (v ? v : undefined)),
  sort: z.enum(["oldest", "newest"]).default("oldest"),
  /** Words from the piece's title, the owner's name or e-mail. */
  q: z.string().trim().max(100, "Search with at most 100 characters.").default(""),
  page: z.coerce.number({ error: "Page must be a number." }).int("Page must be a whole number.").min(1, "Pages start at 1.").max(100_000).default(1),
});
export type ClaimListQuery = z.output<typeof claimListQuerySchema>;

export const idParam = z.object({ id: z.string().min(1).max(64) });
