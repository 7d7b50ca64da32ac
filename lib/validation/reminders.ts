import { z } from "zod";
import { CARE_TASK_KINDS, REMINDER_STEPS } from "@/lib/care/vocabulary";

// Care reminders, refresh offers and unsubscribe: shared by the pages, actions and route handlers.

export const linkTokenField = z.string({ message: "This link is incomplete." }).trim().min(10, "This link is incomplete.").max(300, "This link is not one of ours.");

export const unsubscribeFormSchema = z.object({ t: linkTokenField, enable: z.enum(["true", "false"]).transform((v) => v === "true") });

/** RFC 8058: the one-click POST body is exactly List-Unsubscribe=One-Click. */
export const oneClickBodySchema = z.object({
  "List-Unsubscribe": z.literal("One-Click", { message: "Send List-Unsubscribe=One-Click to unsubscribe (RFC 8058)." }),
});

export const offerAcceptSchema = z.object({ token: linkTokenField });

export const LEDGER_STATUSES = ["queued", "sent", "failed", "skipped", "cancelled"] as const;

export const remindersQuerySchema = z.object({
  view: z.enum(["upcoming", "ledger"]).default("upcoming"),
  status: z.enum(LEDGER_STATUSES).optional(),
  kind: z.enum(CARE_TASK_KINDS).optional(),
  step: z.enum(REMINDER_STEPS).optional(),
  q: z.string().trim().max(100).optional(),
  days: z.coerce.number().int().min(1).max(90).default(30),
  limit: z.coerce.number().int().min(1).max(500).default(200),
});
export type RemindersQuery = z.output<typeof remindersQuerySchema>;

export const pauseSchema = z.object({ pieceId: z.string().trim().min(1).max(64), paused: z.boolean() });
export type PauseValues = z.output<typeof pauseSchema>;
export const ledgerIdSchema = z.object({ id: z.string().trim().min(1).max(64) });
