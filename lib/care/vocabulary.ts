// The product's shared words. Pure: no imports. The database schema, the
// validation schemas and the care engine all take their enumerations from here.

export const PIECE_KINDS = [
  "dining_table",
  "coffee_table",
  "desk",
  "bench",
  "countertop",
  "console",
  "shelf",
  "other",
] as const;
export type PieceKind = (typeof PIECE_KINDS)[number];

export const FINISH_CLASSES = [
  "hardwax_oil",
  "ceramic_topcoat",
  "paste_wax",
  "film_finish",
  "epoxy_surface",
  "charred_oiled",
] as const;
export type FinishClass = (typeof FINISH_CLASSES)[number];

/** heavy: dining/kitchen/commercial; moderate: coffee table/desk; light: console/decor. */
export const USES = ["heavy", "moderate", "light", "outdoor_covered"] as const;
export type Use = (typeof USES)[number];

export const SUN_EXPOSURES = ["none", "indirect", "direct"] as const;
export type SunExposure = (typeof SUN_EXPOSURES)[number];

export const SURFACES = ["top", "base", "edges"] as const;
export type Surface = (typeof SURFACES)[number];
export const SURFACE_LABELS: Record<Surface, string> = { top: "Top", base: "Base", edges: "Edges" };

export const RESIN_KINDS = ["none", "deep_pour", "tabletop_coat"] as const;
export type ResinKind = (typeof RESIN_KINDS)[number];

export const SHAPE_KINDS = ["rectangle", "round", "oval", "measured"] as const;
export type ShapeKind = (typeof SHAPE_KINDS)[number];

export const CLAIM_CATEGORIES = [
  "crack_gap",
  "resin_clouding",
  "finish_wear",
  "finish_peeling",
  "structural",
  "scratch_dent",
  "other",
] as const;
export type ClaimCategory = (typeof CLAIM_CATEGORIES)[number];

export const STUDIO_ROLES = ["admin", "staff", "technician"] as const;
export type StudioRole = (typeof STUDIO_ROLES)[number];

export const FINISH_CLASS_LABELS: Record<FinishClass, string> = {
  hardwax_oil: "Hardwax oil",
  ceramic_topcoat: "Ceramic-type topcoat over oil",
  paste_wax: "Paste wax",
  film_finish: "Film finish (polyurethane, conversion varnish)",
  epoxy_surface: "Epoxy surface",
  charred_oiled: "Charred surface, oiled",
};

export const PIECE_KIND_LABELS: Record<PieceKind, string> = {
  dining_table: "Dining table",
  coffee_table: "Coffee table",
  desk: "Desk",
  bench: "Bench",
  countertop: "Countertop",
  console: "Console",
  shelf: "Shelf",
  other: "Other",
};

export const USE_LABELS: Record<Use, string> = {
  heavy: "Heavy use (dining, kitchen, commercial)",
  moderate: "Moderate use (coffee table, desk)",
  light: "Light use (console, decor)",
  outdoor_covered: "Outdoor, covered",
};

export const SUN_LABELS: Record<SunExposure, string> = {
  none: "No sun",
  indirect: "Indirect sun",
  direct: "Direct sun",
};

export const RESIN_LABELS: Record<ResinKind, string> = {
  none: "No resin",
  deep_pour: "Deep-pour casting",
  tabletop_coat: "Tabletop coat",
};

/** Classes that contain a drying oil: their rags can self-heat (NFPA tip sheet "Safety with oily rags"). */
export const OIL_FINISH_CLASSES: readonly FinishClass[] = ["hardwax_oil", "ceramic_topcoat", "charred_oiled"];

// ---- care engine additions (lib/care/schedule.ts) ----

/** Care task kinds: one per finish class, plus the yearly whole-piece check. */
export const CARE_TASK_KINDS = [
  "reoil",
  "topcoat_refresh",
  "rewax",
  "film_inspect",
  "resin_polish",
  "reoil_charred",
  "annual_check",
] as const;
export type CareTaskKind = (typeof CARE_TASK_KINDS)[number];

export const TASK_KIND_BY_FINISH_CLASS: Record<FinishClass, CareTaskKind> = {
  hardwax_oil: "reoil",
  ceramic_topcoat: "topcoat_refresh",
  paste_wax: "rewax",
  film_finish: "film_inspect",
  epoxy_surface: "resin_polish",
  charred_oiled: "reoil_charred",
};

export const CARE_TASK_LABELS: Record<CareTaskKind, string> = {
  reoil: "Re-oil",
  topcoat_refresh: "Topcoat refresh",
  rewax: "Re-wax",
  film_inspect: "Inspect film finish",
  resin_polish: "Polish and inspect resin",
  reoil_charred: "Re-oil charred surface",
  annual_check: "Annual clean and check",
};

/** Tasks a paid refresh visit would do, so a refresh offer can be attached to their reminders. */
export const REFRESH_TASK_KINDS: readonly CareTaskKind[] = ["reoil", "topcoat_refresh", "rewax", "resin_polish", "reoil_charred"];

/**
 * Exclusions a warranty line can name. sun_on_resin: resin exposed to daylight — the piece is kept
 * outdoors, or sun falls directly on it (epoxy yellows under UV whatever the owner does).
 * direct_sun_on_indoor_resin is the older, narrower term (indoor pieces only), kept for stored terms.
 */
export const CLAIM_EXCLUSIONS = ["heat", "chemicals", "impact", "outdoor_use_of_indoor_piece", "direct_sun_on_indoor_resin", "sun_on_resin"] as const;
export type ClaimExclusion = (typeof CLAIM_EXCLUSIONS)[number];

/** The exclusions in words for studio staff (the terms editor and its change list). */
export const CLAIM_EXCLUSION_LABELS: Record<ClaimExclusion, string> = {
  heat: "Heat (hot cookware, heaters, fireplaces)",
  chemicals: "Solvents, cleaners, alcohol spills",
  impact: "Knocks and drops",
  outdoor_use_of_indoor_piece: "Outdoor use of an indoor piece",
  direct_sun_on_indoor_resin: "Direct sun on indoor resin (older terms; indoor pieces only)",
  sun_on_resin: "Sun on resin, indoors or out (resin yellows in daylight)",
};

export const CARE_TASK_STATUSES = ["upcoming", "due", "overdue", "done"] as const;
export type CareTaskStatus = (typeof CARE_TASK_STATUSES)[number];

export const REMINDER_STEPS = ["before_14d", "due_day", "after_30d"] as const;
export type ReminderStep = (typeof REMINDER_STEPS)[number];

/** Repair job states: draft → quoted → approved → paid (or covered) → scheduled → done; cancelled from any open state. */
export const JOB_STATES = ["draft", "quoted", "approved", "paid", "covered", "scheduled", "done", "cancelled"] as const;
export type JobState = (typeof JOB_STATES)[number];

/** Visit states: booked → done, or booked → cancelled. A move keeps it booked and raises its SEQUENCE. */
export const VISIT_STATES = ["booked", "cancelled", "done"] as const;
export type VisitState = (typeof VISIT_STATES)[number];

/** Where a visit happens: at the owner's place (the piece's address) or at the studio's shop. */
export const VISIT_LOCATIONS = ["owner", "studio"] as const;
export type VisitLocation = (typeof VISIT_LOCATIONS)[number];

export const VISIT_STATE_LABELS: Record<VisitState, string> = { booked: "Booked", cancelled: "Cancelled", done: "Done" };

/** How far apart offered visit start times can be, in minutes (a studio setting). */
export const SLOT_STEPS = [15, 30, 60] as const;

// ---- values the records store (db/schema.ts columns) ----

export const UNIT_SYSTEMS = ["metric", "imperial"] as const;
export const TOKEN_PURPOSES = ["verify_email", "password_reset", "change_email"] as const;
export const OWNERSHIP_VIA = ["registration", "transfer"] as const;
export const FILE_PURPOSES = ["piece_photo", "claim_photo", "care_log_photo", "visit_photo"] as const;
export const CARE_LOG_SOURCES = ["owner", "visit", "studio"] as const;
/** Who logged the care, as staff read it after the task: "Re-oil (top) · by the owner". */
export const CARE_LOG_SOURCE_WORDS: Record<(typeof CARE_LOG_SOURCES)[number], string> = { owner: "by the owner", visit: "at a visit", studio: "by the studio" };
export const SEND_STATUSES = ["queued", "sent", "failed", "skipped", "cancelled"] as const;
export const OFFER_STATUSES = ["offered", "accepted", "declined", "expired"] as const;
/** Claim states (lib/claims/states.ts): submitted → in_review → (awaiting_owner ↔ in_review) → accepted | declined; accepted → repair_booked → closed. */
export const CLAIM_STATES = ["submitted", "in_review", "awaiting_owner", "accepted", "declined", "repair_booked", "closed"] as const;
/** The claims queue's "Filed" filter (lib/validation/claims.ts claimListQuerySchema, components/claims/claim-queue.tsx). */
export const CLAIM_AGE_FILTERS = ["any", "under_2d", "2_to_7d", "over_7d"] as const;
export const CLAIM_DECISIONS = ["covered", "partly_covered", "chargeable", "declined"] as const;
/** Where a repair job came from; "plan" is an included visit of a care plan (lib/plans/visits.ts), whose covered part the plan pays, not the warranty. */
export const JOB_ORIGINS = ["claim", "refresh_offer", "studio", "plan"] as const;
export const PAYMENT_STATUSES = ["open", "paid", "expired", "refunded", "partially_refunded"] as const;
/**
 * Why a captured payment is (being) given back in full: all but "job_cancelled" the product decides on
 * its own (the payment does not count toward its job); "job_cancelled" is a cancelled job.
 */
export const PAYMENT_REFUND_REASONS = ["older_quote", "already_paid", "not_awaiting_payment", "job_cancelled", "piece_handed_on"] as const;
export const VISIT_PHOTO_KINDS = ["before", "after"] as const;
/**
 * Mail that could not be handed to SMTP when it was sent (lib/mail sendMail), kept as rendered so the
 * scheduler can try again with a back-off. Reminders and visit reminders keep their own ledgers and
 * never come here.
 */
export const MAIL_QUEUE_STATUSES = ["waiting", "sending", "sent", "gave_up"] as const;
export const THREAD_SUBJECTS = ["claim", "job", "visit"] as const;
/** The inbox state of a thread: unread until a staff member opens it, done when handled. */
export const THREAD_STATES = ["unread", "open", "done"] as const;
export const MESSAGE_AUTHORS = ["owner", "staff"] as const;
export const MESSAGE_SOURCES = ["web", "email"] as const;
export const UNMATCHED_REASONS = ["no_token", "bad_token", "wrong_sender", "closed", "empty"] as const;
