// Schemas of the visit API and forms: booking, moving, cancelling, the week view's query,
// technician hours and time off, and the technician's visit report. Instants are ISO 8601 strings with
// an offset (or Z); local times "HH:MM" in the studio's time zone; dates "YYYY-MM-DD".
import { z } from "zod";
import { FINISH_CLASSES, SURFACES, VISIT_LOCATIONS, VISIT_PHOTO_KINDS } from "@/lib/care/vocabulary";
import { EARLIEST_DATE, utcToday, visitDay, visitRecordDate, VISIT_YEARS_AHEAD } from "@/lib/validation/dates";
import { addMonths } from "@/lib/care/dates";

const id = z.string().trim().min(1).max(64);

/** An instant in the visit calendar's window (1900 to two years ahead), e.g. 2026-12-08T17:00:00Z. */
export const instant = z.iso.datetime({ offset: true, error: "Use an ISO 8601 instant, e.g. 2026-12-08T17:00:00Z." }).superRefine((s, ctx) => {
  const ms = Date.parse(s);
  if (Number.isNaN(ms)) return; // the format check above has said so
  const day = new Date(ms).toISOString().slice(0, 10);
  const today = utcToday();
  if (day < EARLIEST_DATE) ctx.addIssue({ code: "custom", message: "That date is before 1900; check the year." });
  else if (day > addMonths(today, 12 * VISIT_YEARS_AHEAD)) ctx.addIssue({ code: "custom", message: `Visits are planned up to ${VISIT_YEARS_AHEAD} years ahead; pick an earlier date.` });
});

const HHMM = /^([01]\d|2[0-3]):[0-5]\d$|^24:00$/;
export const hhmm = z.string().trim().regex(HHMM, "Use a time like 09:00.");
const minutes = (v: string) => Number(v.slice(0, 2)) * 60 + Number(v.slice(3, 5));

export const visitIdParams = z.object({ id });

/** GET /api/jobs/[id]/slots?from&to — both optional: from defaults to now, to to 14 days after from. */
export const slotsQuerySchema = z
  .object({ from: instant.optional(), to: instant.optional() })
  .refine((q) => !q.from || !q.to || Date.parse(q.to) > Date.parse(q.from), { message: "to must be after from.", path: ["to"] })
  .refine((q) => !q.from || !q.to || Date.parse(q.to) - Date.parse(q.from) <= 62 * 86_400_000, { message: "Ask for at most 62 days at a time.", path: ["to"] });
export type SlotsQuery = z.output<typeof slotsQuerySchema>;

/** POST /api/visits */
export const bookVisitSchema = z.object({
  jobId: id,
  technicianId: id,
  start: instant,
  location: z.enum(VISIT_LOCATIONS).optional(),
});
export type BookVisitInput = z.input<typeof bookVisitSchema>;

/** PATCH /api/visits/[id]: a new start, optionally with another technician. */
export const moveVisitSchema = z.object({
  start: instant,
  technicianId: id.optional(),
  location: z.enum(VISIT_LOCATIONS).optional(),
});
export type MoveVisitInput = z.input<typeof moveVisitSchema>;

export const cancelVisitSchema = z.object({ reason: z.string().trim().max(500, "Keep the reason under 500 characters.").default("") });

/** GET /api/visits?technician&from&to — the week view. */
export const listVisitsQuerySchema = z
  .object({
    technician: id.optional(),
    from: instant,
    to: instant,
    includeCancelled: z.enum(["0", "1"]).optional(),
  })
  .refine((q) => Date.parse(q.to) > Date.parse(q.from), { message: "to must be after from.", path: ["to"] })
  .refine((q) => Date.parse(q.to) - Date.parse(q.from) <= 62 * 86_400_000, { message: "Ask for at most 62 days at a time.", path: ["to"] });

const hoursRange = z
  .object({
    weekday: z.number({ error: "Pick a weekday." }).int().min(1, "Weekdays are 1 (Monday) to 7 (Sunday).").max(7, "Weekdays are 1 (Monday) to 7 (Sunday)."),
    start: hhmm,
    end: hhmm,
  })
  .refine((r) => minutes(r.end) > minutes(r.start), { message: "Ends before it starts.", path: ["end"] });

const timeOff = z
  .object({
    date: visitDay(),
    start: hhmm.nullable().optional(),
    end: hhmm.nullable().optional(),
    note: z.string().trim().max(200, "Keep the note under 200 characters.").default(""),
  })
  .refine((t) => (t.start == null) === (t.end == null), { message: "Give both times for part of a day, or neither for the whole day.", path: ["end"] })
  .refine((t) => t.start == null || t.end == null || minutes(t.end) > minutes(t.start), { message: "Ends before it starts.", path: ["end"] });

/** GET/PUT /api/technicians/[id]/hours: the whole weekly pattern and the time off, replaced together. */
export const technicianHoursSchema = z
  .object({
    hours: z.array(hoursRange).max(28, "At most 28 ranges a week."),
    timeOff: z.array(timeOff).max(200, "At most 200 days off at a time.").default([]),
  })
  .superRefine((v, ctx) => {
    v.hours.forEach((a, i) => {
      v.hours.forEach((b, j) => {
        if (j <= i || a.weekday !== b.weekday) return;
        if (minutes(a.start) < minutes(b.end) && minutes(b.start) < minutes(a.end)) {
          ctx.addIssue({ code: "custom", message: "Two ranges on the same day overlap.", path: ["hours", j, "start"] });
        }
      });
    });
  });
export type TechnicianHoursInput = z.input<typeof technicianHoursSchema>;

/**
 * One new finish layer recorded at a visit. Its surface has no default: a layer logged on the top when
 * the base was refreshed moves the wrong stack's next care date (the form proposes the surface of the
 * layer it refreshes, lib/visits/technician-day.ts, and leaves an added layer's to be chosen).
 */
export const reportLayerSchema = z.object({
  surface: z.enum(SURFACES, { error: "Choose the surface this layer went on." }),
  finishClass: z.enum(FINISH_CLASSES, { error: "Pick a finish class." }),
  productId: z.string().trim().max(64).nullable().optional(),
  productLabel: z.string().trim().max(200, "Keep the product under 200 characters.").default(""),
  coats: z.coerce.number({ error: "Coats must be a number." }).int("Whole coats.").min(1, "At least one coat.").max(20, "At most 20 coats."),
  appliedOn: visitRecordDate(),
  batchLot: z.string().trim().max(100, "Keep the batch or lot under 100 characters.").default(""),
});

/** POST /api/visits/[id]/report */
export const visitReportSchema = z.object({
  work: z.string().trim().min(1, "Say what was done.").max(4000, "Keep it under 4,000 characters."),
  layers: z.array(reportLayerSchema).max(10, "At most 10 layers in one report."),
  /** Staff only: why the report is filed before the visit's start (recorded in the audit log). */
  earlyReason: z.string().trim().max(500, "Keep the reason under 500 characters.").default(""),
});
export type VisitReportInput = z.input<typeof visitReportSchema>;
export type VisitReportValues = z.output<typeof visitReportSchema>;

export const visitPhotoKindSchema = z.enum(VISIT_PHOTO_KINDS, { error: "Say whether it is a before or an after photo." });

/** The calendar's edit form: a local date and time in the studio's zone (turned into `start` for PATCH). */
export const visitEditFormSchema = z.object({
  date: visitDay(),
  time: hhmm,
  technicianId: id,
});
export type VisitEditFormValues = z.output<typeof visitEditFormSchema>;

/** The owner's sign-off form: the token of the link in the report mail. */
export const signOffSchema = z.object({ token: z.string({ message: "This link is incomplete." }).min(10, "This link is incomplete.").max(200, "This link is not one of ours.") });
