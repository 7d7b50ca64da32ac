import { relations, sql } from "drizzle-orm";
import { index, integer, real, sqliteTable, text, uniqueIndex, type AnySQLiteColumn } from "drizzle-orm/sqlite-core";
import type { WarrantyPolicy } from "../lib/care/coverage";
import type { Quote } from "../lib/care/quote";
import type { ClaimSuggestion } from "../lib/claims/suggestion";
import type { ClaimAnswers } from "../lib/validation/claims";
import type { JobQuoteInput } from "../lib/validation/jobs";
import type { JobLine, PriceListEntry, PricingRules, RoundingRule, TaxMode, LineKind } from "../lib/repairs/lines";
import {
  CARE_LOG_SOURCES,
  CARE_TASK_KINDS,
  CLAIM_CATEGORIES,
  CLAIM_DECISIONS,
  CLAIM_STATES,
  FILE_PURPOSES,
  FINISH_CLASSES,
  JOB_ORIGINS,
  JOB_STATES,
  MAIL_QUEUE_STATUSES,
  MESSAGE_AUTHORS,
  MESSAGE_SOURCES,
  OFFER_STATUSES,
  OWNERSHIP_VIA,
  PAYMENT_REFUND_REASONS,
  PAYMENT_STATUSES,
  PIECE_KINDS,
  REMINDER_STEPS,
  RESIN_KINDS,
  SEND_STATUSES,
  SHAPE_KINDS,
  STUDIO_ROLES,
  SUN_EXPOSURES,
  SURFACES,
  THREAD_STATES,
  THREAD_SUBJECTS,
  TOKEN_PURPOSES,
  UNIT_SYSTEMS,
  UNMATCHED_REASONS,
  USES,
  VISIT_LOCATIONS,
  VISIT_PHOTO_KINDS,
  VISIT_STATES,
} from "../lib/care/vocabulary";
import { CONSENT_KINDS, CONSENT_SOURCES, CONTACT_METHODS, HANDOVER_BATCH_SOURCES, HANDOVER_BATCH_STATES, HANDOVER_ITEM_OUTCOMES } from "../lib/clients/vocabulary";
import { PLAN_STATES } from "../lib/plans/states";
import { PLAN_INTERVALS, PLAN_PAID_BY, PLAN_REFUND_RULES, type PlanFit, type PlanIncluded } from "../lib/plans/terms";

/** A claim's answers as filed (createClaimSchema); a row from before a question was added lacks it (read through lib/claims/coverage readAnswers). */
export type StoredClaimAnswers = Partial<ClaimAnswers>;
/** What a job's quote is proposed from (jobQuoteSchema without the lines as sent, which have their own column); a job made outside the quote form may hold less. */
export type StoredJobQuote = Partial<Omit<JobQuoteInput, "lines">>;

// Every studio-owned table carries studioId and every query filters by it.
// Timestamps are epoch milliseconds (Date in TypeScript); calendar dates are "YYYY-MM-DD" text.

const id = () =>
  text("id")
    .primaryKey()
    .$defaultFn(() => crypto.randomUUID());
const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .$defaultFn(() => new Date());
/** When the row last changed (epoch ms): set on insert here, and by every writer on UPDATE. */
const updatedAt = () =>
  integer("updated_at", { mode: "timestamp_ms" })
    .notNull()
    .$defaultFn(() => new Date());
/** The studio that owns the row (every query filters by it); the row goes with the studio. */
const studioRef = () =>
  text("studio_id")
    .notNull()
    .references((): AnySQLiteColumn => studios.id, { onDelete: "cascade" });

export const studios = sqliteTable("studios", {
  id: id(),
  slug: text("slug").notNull().unique(),
  name: text("name").notNull(),
  address: text("address").notNull().default(""),
  email: text("email").notNull().default(""),
  timeZone: text("time_zone").notNull().default("UTC"),
  /** ISO 3166-1 alpha-2: phone numbers typed without a +country code are read, and shown, as this country's. */
  country: text("country").notNull().default("US"),
  currency: text("currency").notNull().default("USD"),
  unitSystem: text("unit_system", { enum: UNIT_SYSTEMS }).notNull().default("metric"),
  /** Tax rate in basis points (8.25 % = 825): the one rate when taxMode is "single". */
  taxRateBp: integer("tax_rate_bp").notNull().default(0),
  /** none, one rate, or a rate per line kind (taxRatesBp). */
  taxMode: text("tax_mode").$type<TaxMode>().notNull().default("single"),
  /** Prices include tax (true) or tax is added on top (false). */
  taxInclusive: integer("tax_inclusive", { mode: "boolean" }).notNull().default(false),
  taxRatesBp: text("tax_rates_bp", { mode: "json" }).$type<Partial<Record<LineKind, number>>>().notNull().default(sql`'{}'`),
  /** Printed on quotes and receipts (VAT, GST or sales-tax registration). */
  taxNumber: text("tax_number").notNull().default(""),
  /** How quote lines are rounded: to the cent, whole units, or to 5/10. */
  roundingRule: text("rounding_rule").$type<RoundingRule>().notNull().default("cent"),
  /** The studio's repair tasks and default prices; empty means the built-in list (lib/repairs/price-list). */
  repairPriceList: text("repair_price_list", { mode: "json" }).$type<PriceListEntry[]>().notNull().default(sql`'[]'`),
  /** Labour rate per hour, in the currency's minor units. */
  labourRateMinor: integer("labour_rate_minor").notNull().default(0),
  travelFeeMinor: integer("travel_fee_minor").notNull().default(0),
  /** Local hour (0–23, the owner's time zone) at or after which care reminders go out. */
  reminderSendHour: integer("reminder_send_hour").notNull().default(9),
  /** Which reminder steps the studio sends (14 days before, on the day, 30 days after). */
  reminderSteps: text("reminder_steps", { mode: "json" })
    .$type<(typeof REMINDER_STEPS)[number][]>()
    .notNull()
    .default(sql`'["before_14d","due_day","after_30d"]'`),
  /** Storage key of the studio's logo (re-encoded PNG, lib/storage); null shows the studio's name only. */
  logoKey: text("logo_key"),
  /** One of the accent colours in lib/studio/brand.ts (each keeps AA contrast); "default" is Grainward's own. */
  accent: text("accent").notNull().default("default"),
  /** The studio's phone number as typed (printed on receipts and in e-mails). */
  phone: text("phone").notNull().default(""),
  /** The sender name on the studio's e-mails; empty uses the studio's name. */
  mailSenderName: text("mail_sender_name").notNull().default(""),
  /** The studio's own Stripe secret key, sealed with lib/crypto.ts encrypt("stripe-key"); null uses the install's key. */
  stripeSecretSealed: text("stripe_secret_sealed"),
  /** When that key last answered a check call (lib/studio/payments.ts). */
  stripeCheckedAt: integer("stripe_checked_at", { mode: "timestamp_ms" }),
  /** The signing secret of the studio's own webhook endpoint (/api/webhooks/stripe/studio/:id), sealed with encrypt("stripe-webhook-secret"); null: that endpoint refuses every event. */
  stripeWebhookSecretSealed: text("stripe_webhook_secret_sealed"),
  /** Set-up steps saved at least once (lib/studio/setup.ts); a skipped step stays out until saved. */
  setupDone: text("setup_done", { mode: "json" }).$type<string[]>().notNull().default(sql`'[]'`),
  createdAt: createdAt(),
});

export const studiosRelations = relations(studios, ({ many }) => ({
  memberships: many(memberships),
  pieces: many(pieces),
  finishProducts: many(finishProducts),
}));

export const users = sqliteTable("users", {
  id: id(),
  /** Stored lower-cased and trimmed. */
  email: text("email").notNull().unique(),
  name: text("name").notNull(),
  passwordHash: text("password_hash").notNull(),
  emailVerifiedAt: integer("email_verified_at", { mode: "timestamp_ms" }),
  timeZone: text("time_zone").notNull().default("UTC"),
  unitSystem: text("unit_system", { enum: UNIT_SYSTEMS }).notNull().default("metric"),
  /** When the person chose their units themselves; until then the first studio they register a piece from sets them (lib/owner/preferences). */
  unitSystemChosenAt: integer("unit_system_chosen_at", { mode: "timestamp_ms" }),
  remindersEnabled: integer("reminders_enabled", { mode: "boolean" }).notNull().default(true),
  /** When the owner deleted their account (lib/owner/account-delete.ts): the row stays, its name, e-mail and password gone, for the studios' books. */
  deletedAt: integer("deleted_at", { mode: "timestamp_ms" }),
  createdAt: createdAt(),
});

export const usersRelations = relations(users, ({ many }) => ({
  memberships: many(memberships),
  pieces: many(pieces),
}));

/** Lucia sessions. The id is the SHA-256 of the token in the cookie, so a copy of the table signs nobody in. */
export const sessions = sqliteTable(
  "sessions",
  {
    id: text("id").primaryKey(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    /** Seconds since the epoch, as lucia's SQLite adapter writes it. */
    expiresAt: integer("expires_at").notNull(),
  },
  (t) => [index("sessions_user_idx").on(t.userId)],
);

export const sessionsRelations = relations(sessions, ({ one }) => ({
  user: one(users, { fields: [sessions.userId], references: [users.id] }),
}));

export const memberships = sqliteTable(
  "memberships",
  {
    id: id(),
    studioId: studioRef(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: text("role", { enum: STUDIO_ROLES }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("memberships_studio_user_uq").on(t.studioId, t.userId), index("memberships_user_idx").on(t.userId)],
);

export const membershipsRelations = relations(memberships, ({ one }) => ({
  studio: one(studios, { fields: [memberships.studioId], references: [studios.id] }),
  user: one(users, { fields: [memberships.userId], references: [users.id] }),
}));

/** Single-use e-mail tokens; only their SHA-256 is kept. */
export const userTokens = sqliteTable(
  "user_tokens",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    purpose: text("purpose", { enum: TOKEN_PURPOSES }).notNull(),
    /** change_email: the address the account moves to when the link is opened (lib/owner/account-email.ts). */
    newEmail: text("new_email"),
    tokenHash: text("token_hash").notNull().unique(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("user_tokens_user_idx").on(t.userId, t.purpose)],
);

export const userTokensRelations = relations(userTokens, ({ one }) => ({
  user: one(users, { fields: [userTokens.userId], references: [users.id] }),
}));

export const invitations = sqliteTable(
  "invitations",
  {
    id: id(),
    studioId: studioRef(),
    email: text("email").notNull(),
    role: text("role", { enum: STUDIO_ROLES }).notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    invitedById: text("invited_by_id").references(() => users.id, { onDelete: "set null" }),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    acceptedAt: integer("accepted_at", { mode: "timestamp_ms" }),
    revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("invitations_studio_idx").on(t.studioId)],
);

export const invitationsRelations = relations(invitations, ({ one }) => ({
  studio: one(studios, { fields: [invitations.studioId], references: [studios.id] }),
  invitedBy: one(users, { fields: [invitations.invitedById], references: [users.id] }),
}));

/** A container a finish product is sold in, with its price in the studio's minor units. */
export type ContainerSize = { ml: number; priceMinor: number };

export const finishProducts = sqliteTable(
  "finish_products",
  {
    id: id(),
    studioId: studioRef(),
    name: text("name").notNull(),
    finishClass: text("finish_class", { enum: FINISH_CLASSES }).notNull(),
    /** Coverage of one coat, m² per litre. */
    coverageM2PerL: real("coverage_m2_per_l").notNull(),
    containers: text("containers", { mode: "json" }).$type<ContainerSize[]>().notNull().default(sql`'[]'`),
    /** Wear interval overrides in months; null keeps the care engine's default for the class. */
    intervalHeavyMonths: integer("interval_heavy_months"),
    intervalModerateMonths: integer("interval_moderate_months"),
    intervalLightMonths: integer("interval_light_months"),
    safetyNotes: text("safety_notes").notNull().default(""),
    /** Cure time from the product label: hours until light use, days until full use; null keeps the class default (lib/care/cure.ts). */
    cureLightUseHours: integer("cure_light_use_hours"),
    cureFullDays: integer("cure_full_days"),
    archivedAt: integer("archived_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("finish_products_studio_idx").on(t.studioId)],
);

export const finishProductsRelations = relations(finishProducts, ({ one }) => ({
  studio: one(studios, { fields: [finishProducts.studioId], references: [studios.id] }),
}));

export const pieces = sqliteTable(
  "pieces",
  {
    id: id(),
    studioId: studioRef(),
    kind: text("kind", { enum: PIECE_KINDS }).notNull(),
    title: text("title").notNull(),
    shapeKind: text("shape_kind", { enum: SHAPE_KINDS }).notNull(),
    lengthMm: integer("length_mm"),
    widthMm: integer("width_mm"),
    diameterMm: integer("diameter_mm"),
    measuredAreaM2: real("measured_area_m2"),
    thicknessMm: integer("thickness_mm"),
    primarySpeciesId: text("primary_species_id").notNull(),
    secondarySpeciesId: text("secondary_species_id"),
    resinKind: text("resin_kind", { enum: RESIN_KINDS }).notNull().default("none"),
    resinPouredOn: text("resin_poured_on"),
    resinVolumeMl: integer("resin_volume_ml"),
    resinTint: text("resin_tint"),
    baseMaterial: text("base_material").notNull().default(""),
    baseFinish: text("base_finish").notNull().default(""),
    use: text("use", { enum: USES }).notNull(),
    sun: text("sun", { enum: SUN_EXPOSURES }).notNull().default("none"),
    deliveredOn: text("delivered_on").notNull(),
    deliveryAddress: text("delivery_address").notNull().default(""),
    internalNotes: text("internal_notes").notNull().default(""),
    ownerId: text("owner_id").references(() => users.id, { onDelete: "set null" }),
    /** The studio's record of the buyer or current owner (lib/clients); null when nobody is known. */
    clientId: text("client_id").references((): AnySQLiteColumn => clients.id, { onDelete: "set null" }),
    registeredAt: integer("registered_at", { mode: "timestamp_ms" }),
    /** HMAC-SHA-256 of the normalized registration code, keyed by APP_SECRET: lookups compare this. */
    registrationCodeHash: text("registration_code_hash").notNull().unique(),
    /** The code encrypted with AES-256-GCM under a key from APP_SECRET, so a card can be printed again. */
    registrationCodeEnc: text("registration_code_enc").notNull(),
    remindersPaused: integer("reminders_paused", { mode: "boolean" }).notNull().default(false),
    /** The warranty policy version in force at delivery; the piece keeps it when the policy changes. */
    warrantyPolicyId: text("warranty_policy_id").references(() => warrantyPolicies.id, { onDelete: "set null" }),
    archivedAt: integer("archived_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("pieces_studio_idx").on(t.studioId, t.deliveredOn),
    index("pieces_owner_idx").on(t.ownerId),
    // The clients list's per-row counts and filters (lib/clients/list.ts) read a client's pieces from this index alone.
    index("pieces_client_idx").on(t.clientId, t.archivedAt, t.ownerId, t.remindersPaused),
  ],
);

export const piecesRelations = relations(pieces, ({ one, many }) => ({
  studio: one(studios, { fields: [pieces.studioId], references: [studios.id] }),
  owner: one(users, { fields: [pieces.ownerId], references: [users.id] }),
  warrantyPolicy: one(warrantyPolicies, { fields: [pieces.warrantyPolicyId], references: [warrantyPolicies.id] }),
  layers: many(finishLayers),
  photos: many(files),
  careLog: many(careLogEntries),
  claims: many(claims),
}));

export const finishLayers = sqliteTable(
  "finish_layers",
  {
    id: id(),
    studioId: studioRef(),
    pieceId: text("piece_id")
      .notNull()
      .references(() => pieces.id, { onDelete: "cascade" }),
    surface: text("surface", { enum: SURFACES }).notNull(),
    /** Order within the surface's stack, 0 = first applied (closest to the wood). */
    position: integer("position").notNull(),
    finishClass: text("finish_class", { enum: FINISH_CLASSES }).notNull(),
    productId: text("product_id").references(() => finishProducts.id, { onDelete: "set null" }),
    productLabel: text("product_label").notNull().default(""),
    coats: integer("coats").notNull(),
    appliedOn: text("applied_on").notNull(),
    appliedById: text("applied_by_id").references(() => users.id, { onDelete: "set null" }),
    batchLot: text("batch_lot").notNull().default(""),
    notes: text("notes").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [index("finish_layers_piece_idx").on(t.pieceId, t.surface, t.position, t.finishClass)],
);

export const finishLayersRelations = relations(finishLayers, ({ one }) => ({
  piece: one(pieces, { fields: [finishLayers.pieceId], references: [pieces.id] }),
  product: one(finishProducts, { fields: [finishLayers.productId], references: [finishProducts.id] }),
  appliedBy: one(users, { fields: [finishLayers.appliedById], references: [users.id] }),
}));

export const auditLog = sqliteTable(
  "audit_log",
  {
    id: id(),
    studioId: text("studio_id").references(() => studios.id, { onDelete: "cascade" }),
    actorId: text("actor_id").references(() => users.id, { onDelete: "set null" }),
    action: text("action").notNull(),
    subjectType: text("subject_type").notNull(),
    subjectId: text("subject_id").notNull(),
    data: text("data", { mode: "json" }).$type<Record<string, unknown>>().notNull().default(sql`'{}'`),
    createdAt: createdAt(),
  },
  (t) => [index("audit_log_studio_idx").on(t.studioId, t.createdAt), index("audit_log_subject_idx").on(t.subjectType, t.subjectId)],
);

export const auditLogRelations = relations(auditLog, ({ one }) => ({
  studio: one(studios, { fields: [auditLog.studioId], references: [studios.id] }),
  actor: one(users, { fields: [auditLog.actorId], references: [users.id] }),
}));

/** Versions of a studio's warranty terms; a piece keeps the version in force at its delivery. */
export const warrantyPolicies = sqliteTable(
  "warranty_policies",
  {
    id: id(),
    studioId: studioRef(),
    version: integer("version").notNull(),
    /** First delivery date (YYYY-MM-DD) this version applies to. */
    effectiveFrom: text("effective_from").notNull(),
    policy: text("policy", { mode: "json" }).$type<WarrantyPolicy>().notNull(),
    createdById: text("created_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("warranty_policies_studio_version_uq").on(t.studioId, t.version)],
);

export const warrantyPoliciesRelations = relations(warrantyPolicies, ({ one }) => ({
  studio: one(studios, { fields: [warrantyPolicies.studioId], references: [studios.id] }),
  createdBy: one(users, { fields: [warrantyPolicies.createdById], references: [users.id] }),
}));

/** Who owned a piece when: registration starts an ownership, a release ends it. */
export const ownerships = sqliteTable(
  "ownerships",
  {
    id: id(),
    studioId: studioRef(),
    pieceId: text("piece_id")
      .notNull()
      .references(() => pieces.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    via: text("via", { enum: OWNERSHIP_VIA }).notNull(),
    startedAt: integer("started_at", { mode: "timestamp_ms" }).notNull(),
    endedAt: integer("ended_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("ownerships_piece_idx").on(t.pieceId), index("ownerships_user_idx").on(t.userId)],
);

export const ownershipsRelations = relations(ownerships, ({ one }) => ({
  studio: one(studios, { fields: [ownerships.studioId], references: [studios.id] }),
  piece: one(pieces, { fields: [ownerships.pieceId], references: [pieces.id] }),
  user: one(users, { fields: [ownerships.userId], references: [users.id] }),
}));

/** Uploaded images, re-encoded and stripped of metadata (lib/storage); served only through an authorized route. */
export const files = sqliteTable(
  "files",
  {
    id: id(),
    studioId: studioRef(),
    purpose: text("purpose", { enum: FILE_PURPOSES }).notNull(),
    pieceId: text("piece_id").references(() => pieces.id, { onDelete: "cascade" }),
    claimId: text("claim_id").references(() => claims.id, { onDelete: "cascade" }),
    /** Paths under DATA_DIR, random names. */
    storageKey: text("storage_key").notNull().unique(),
    thumbKey: text("thumb_key").notNull(),
    contentType: text("content_type").notNull(),
    width: integer("width").notNull(),
    height: integer("height").notNull(),
    bytes: integer("bytes").notNull(),
    uploadedById: text("uploaded_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("files_piece_idx").on(t.pieceId), index("files_claim_idx").on(t.claimId)],
);

export const filesRelations = relations(files, ({ one }) => ({
  piece: one(pieces, { fields: [files.pieceId], references: [pieces.id] }),
  claim: one(claims, { fields: [files.claimId], references: [claims.id] }),
}));

/** Care done on a piece: self-logged by its owner, or recorded at a visit. */
export const careLogEntries = sqliteTable(
  "care_log_entries",
  {
    id: id(),
    studioId: studioRef(),
    pieceId: text("piece_id")
      .notNull()
      .references(() => pieces.id, { onDelete: "cascade" }),
    /** Who logged it (the owner at the time, or a studio member). */
    userId: text("user_id").references(() => users.id, { onDelete: "set null" }),
    source: text("source", { enum: CARE_LOG_SOURCES }).notNull(),
    taskKind: text("task_kind", { enum: CARE_TASK_KINDS }).notNull(),
    /** Null: counts for every surface. */
    surface: text("surface", { enum: SURFACES }),
    doneOn: text("done_on").notNull(),
    productUsed: text("product_used").notNull().default(""),
    notes: text("notes").notNull().default(""),
    photoFileId: text("photo_file_id").references(() => files.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("care_log_piece_idx").on(t.pieceId, t.doneOn)],
);

export const careLogEntriesRelations = relations(careLogEntries, ({ one }) => ({
  piece: one(pieces, { fields: [careLogEntries.pieceId], references: [pieces.id] }),
  user: one(users, { fields: [careLogEntries.userId], references: [users.id] }),
  photo: one(files, { fields: [careLogEntries.photoFileId], references: [files.id] }),
}));

/**
 * The send ledger of care reminders: one row per reminder (task key + due date + step), claimed
 * before the message goes out, so no reminder is ever sent twice.
 */
export const reminderSends = sqliteTable(
  "reminder_sends",
  {
    id: id(),
    studioId: studioRef(),
    pieceId: text("piece_id")
      .notNull()
      .references(() => pieces.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    /** lib/care reminderKey(task, step). */
    reminderKey: text("reminder_key").notNull().unique(),
    taskKey: text("task_key").notNull(),
    taskKind: text("task_kind", { enum: CARE_TASK_KINDS }).notNull(),
    step: text("step", { enum: REMINDER_STEPS }).notNull(),
    dueOn: text("due_on").notNull(),
    status: text("status", { enum: SEND_STATUSES }).notNull(),
    attempts: integer("attempts").notNull().default(0),
    lastError: text("last_error"),
    nextAttemptAt: integer("next_attempt_at", { mode: "timestamp_ms" }),
    messageId: text("message_id"),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("reminder_sends_studio_idx").on(t.studioId, t.status, t.dueOn), index("reminder_sends_piece_idx").on(t.pieceId)],
);

export const reminderSendsRelations = relations(reminderSends, ({ one }) => ({
  studio: one(studios, { fields: [reminderSends.studioId], references: [studios.id] }),
  piece: one(pieces, { fields: [reminderSends.pieceId], references: [pieces.id] }),
  user: one(users, { fields: [reminderSends.userId], references: [users.id] }),
}));

/** A priced offer of a refresh visit, sent with the first reminder of a refresh task. */
export const refreshOffers = sqliteTable(
  "refresh_offers",
  {
    id: id(),
    studioId: studioRef(),
    pieceId: text("piece_id")
      .notNull()
      .references(() => pieces.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    taskKey: text("task_key").notNull(),
    dueOn: text("due_on").notNull(),
    priceMinor: integer("price_minor").notNull(),
    currency: text("currency").notNull(),
    /** The quote the price came from (lib/care quote output). */
    quote: text("quote", { mode: "json" }).$type<Quote>().notNull(),
    status: text("status", { enum: OFFER_STATUSES }).notNull().default("offered"),
    reminderSendId: text("reminder_send_id").references(() => reminderSends.id, { onDelete: "set null" }),
    acceptedAt: integer("accepted_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("refresh_offers_task_due_uq").on(t.taskKey, t.dueOn), index("refresh_offers_studio_idx").on(t.studioId, t.status)],
);

export const refreshOffersRelations = relations(refreshOffers, ({ one }) => ({
  studio: one(studios, { fields: [refreshOffers.studioId], references: [studios.id] }),
  piece: one(pieces, { fields: [refreshOffers.pieceId], references: [pieces.id] }),
  user: one(users, { fields: [refreshOffers.userId], references: [users.id] }),
  reminderSend: one(reminderSends, { fields: [refreshOffers.reminderSendId], references: [reminderSends.id] }),
}));

export const claims = sqliteTable(
  "claims",
  {
    id: id(),
    studioId: studioRef(),
    pieceId: text("piece_id")
      .notNull()
      .references(() => pieces.id, { onDelete: "cascade" }),
    ownerId: text("owner_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    category: text("category", { enum: CLAIM_CATEGORIES }).notNull(),
    noticedOn: text("noticed_on").notNull(),
    description: text("description").notNull(),
    /** The owner's answers to the coverage questions and the room climate they reported. */
    answers: text("answers", { mode: "json" }).$type<StoredClaimAnswers>().notNull(),
    state: text("state", { enum: CLAIM_STATES }).notNull().default("submitted"),
    decision: text("decision", { enum: CLAIM_DECISIONS }),
    coveredPct: integer("covered_pct"),
    decisionReason: text("decision_reason"),
    /** The coverage check's suggestion at the time of the decision (lib/care checkCoverage output). */
    suggestion: text("suggestion", { mode: "json" }).$type<ClaimSuggestion>(),
    firstAnsweredAt: integer("first_answered_at", { mode: "timestamp_ms" }),
    decidedAt: integer("decided_at", { mode: "timestamp_ms" }),
    decidedById: text("decided_by_id").references(() => users.id, { onDelete: "set null" }),
    /** Bumped on every state change; writers compare it to refuse a concurrent change. */
    version: integer("version").notNull().default(0),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("claims_studio_idx").on(t.studioId, t.state, t.createdAt), index("claims_owner_idx").on(t.ownerId), index("claims_piece_idx").on(t.pieceId)],
);

export const claimsRelations = relations(claims, ({ one, many }) => ({
  piece: one(pieces, { fields: [claims.pieceId], references: [pieces.id] }),
  owner: one(users, { fields: [claims.ownerId], references: [users.id] }),
  photos: many(files),
}));

export const repairJobs = sqliteTable(
  "repair_jobs",
  {
    id: id(),
    studioId: studioRef(),
    pieceId: text("piece_id")
      .notNull()
      .references(() => pieces.id, { onDelete: "cascade" }),
    ownerId: text("owner_id").references(() => users.id, { onDelete: "set null" }),
    origin: text("origin", { enum: JOB_ORIGINS }).notNull(),
    claimId: text("claim_id").references(() => claims.id, { onDelete: "set null" }),
    refreshOfferId: text("refresh_offer_id").references(() => refreshOffers.id, { onDelete: "set null" }),
    state: text("state", { enum: JOB_STATES }).notNull().default("draft"),
    title: text("title").notNull(),
    /** The quote's inputs (tasks, area, products, travel) as staff last edited them. */
    quoteInput: text("quote_input", { mode: "json" }).$type<StoredJobQuote>().notNull(),
    lines: text("lines", { mode: "json" }).$type<JobLine[]>().notNull(),
    /** What the care engine and the price list proposed when the quote was last priced, beside what was sent (lines). */
    proposedLines: text("proposed_lines", { mode: "json" }).$type<JobLine[]>().notNull().default(sql`'[]'`),
    /** Rounding and tax rules the lines were priced by. */
    pricingRules: text("pricing_rules", { mode: "json" }).$type<PricingRules | Record<string, never>>().notNull().default(sql`'{}'`),
    currency: text("currency").notNull(),
    coveredPct: integer("covered_pct").notNull().default(0),
    subtotalMinor: integer("subtotal_minor").notNull().default(0),
    coveredMinor: integer("covered_minor").notNull().default(0),
    /** The owner's part before tax (subtotal − covered, less the tax it holds when prices include tax). */
    netMinor: integer("net_minor").notNull().default(0),
    taxMinor: integer("tax_minor").notNull().default(0),
    totalMinor: integer("total_minor").notNull().default(0),
    /** Raised each time the quote is sent; part of the checkout idempotency key. */
    quoteVersion: integer("quote_version").notNull().default(0),
    notes: text("notes").notNull().default(""),
    quotedAt: integer("quoted_at", { mode: "timestamp_ms" }),
    approvedAt: integer("approved_at", { mode: "timestamp_ms" }),
    paidAt: integer("paid_at", { mode: "timestamp_ms" }),
    doneAt: integer("done_at", { mode: "timestamp_ms" }),
    cancelledAt: integer("cancelled_at", { mode: "timestamp_ms" }),
    createdById: text("created_by_id").references(() => users.id, { onDelete: "set null" }),
    version: integer("version").notNull().default(0),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("repair_jobs_studio_idx").on(t.studioId, t.state), index("repair_jobs_owner_idx").on(t.ownerId), index("repair_jobs_piece_idx").on(t.pieceId)],
);

export const repairJobsRelations = relations(repairJobs, ({ one, many }) => ({
  piece: one(pieces, { fields: [repairJobs.pieceId], references: [pieces.id] }),
  owner: one(users, { fields: [repairJobs.ownerId], references: [users.id] }),
  claim: one(claims, { fields: [repairJobs.claimId], references: [claims.id] }),
  payments: many(payments),
}));

/** One Stripe Checkout Session for a job's quote version, and what Stripe last reported about it. */
/**
 * Which Stripe account an object (a Checkout Session, charge or subscription) was made under: the
 * install's (STRIPE_SECRET_KEY) or the studio's own saved key. Every later call about it uses that
 * account's key (lib/payments/stripe.ts); null on rows made before this was recorded (the studio's current key).
 */
export const STRIPE_ACCOUNTS = ["install", "studio"] as const;

export const payments = sqliteTable(
  "payments",
  {
    id: id(),
    studioId: studioRef(),
    jobId: text("job_id")
      .notNull()
      .references(() => repairJobs.id, { onDelete: "cascade" }),
    quoteVersion: integer("quote_version").notNull(),
    checkoutSessionId: text("checkout_session_id").notNull().unique(),
    checkoutUrl: text("checkout_url"),
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    status: text("status", { enum: PAYMENT_STATUSES }).notNull().default("open"),
    paymentIntentId: text("payment_intent_id"),
    /** The Stripe account the Checkout Session (and so its charge) was made under. */
    stripeAccount: text("stripe_account", { enum: STRIPE_ACCOUNTS }),
    refundedMinor: integer("refunded_minor").notNull().default(0),
    /** Set when this payment is to be refunded in full; null while it counts (or is still open). */
    refundReason: text("refund_reason", { enum: PAYMENT_REFUND_REASONS }),
    /** When the refund was asked of Stripe; a reason without this is a refund still to ask for. */
    refundRequestedAt: integer("refund_requested_at", { mode: "timestamp_ms" }),
    paidAt: integer("paid_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("payments_job_idx").on(t.jobId)],
);

export const paymentsRelations = relations(payments, ({ one }) => ({
  job: one(repairJobs, { fields: [payments.jobId], references: [repairJobs.id] }),
}));

/**
 * Money the studio gives back on a paid job that stays as it is (done, booked or paid): all of a
 * payment or a part, with the reason the owner reads (lib/repairs/refunds.ts). A row is the claim,
 * written with the job's version moved on before Stripe is asked; `refundedAt` is set once Stripe took it.
 */
export const jobRefunds = sqliteTable(
  "job_refunds",
  {
    id: id(),
    studioId: studioRef(),
    jobId: text("job_id")
      .notNull()
      .references(() => repairJobs.id, { onDelete: "cascade" }),
    paymentId: text("payment_id")
      .notNull()
      .references(() => payments.id, { onDelete: "cascade" }),
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    /** In the staff member's words; the owner reads it in the refund mail, on the job page and the receipt. */
    reason: text("reason").notNull(),
    byId: text("by_id").references(() => users.id, { onDelete: "set null" }),
    stripeRefundId: text("stripe_refund_id"),
    refundedAt: integer("refunded_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [
    index("job_refunds_studio_job_idx").on(t.studioId, t.jobId),
    // The scheduler's pass (jobs/job-refunds.ts) reads only the refunds Stripe has not taken yet.
    index("job_refunds_pending_idx").on(t.createdAt).where(sql`refunded_at IS NULL`),
  ],
);

export type JobRefund = typeof jobRefunds.$inferSelect;

/**
 * A payment page that must be closed at Stripe because its job no longer waits for that payment: its
 * piece changed hands (lib/repairs/handed-on.ts). Written in the release's own transaction, before Stripe
 * is asked, so a close Stripe didn't answer is tried again by the scheduler's pass (jobs/checkout-closes.ts)
 * until Stripe confirms it (`outcome` "closed"; "paid" when the owner paid first), the page has expired on its own ("expired"),
 * or Stripe refused the close ("refused", not asked again).
 */
export const checkoutCloses = sqliteTable(
  "checkout_closes",
  {
    id: id(),
    studioId: studioRef(),
    paymentId: text("payment_id")
      .notNull()
      .references(() => payments.id, { onDelete: "cascade" }),
    /** When Stripe closes the page itself (lib/repairs/handed-on.ts CHECKOUT_PAGE_LIFETIME_MS after it was opened). */
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    tries: integer("tries").notNull().default(0),
    lastTriedAt: integer("last_tried_at", { mode: "timestamp_ms" }),
    outcome: text("outcome", { enum: ["closed", "expired", "paid", "refused"] }),
    settledAt: integer("settled_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("checkout_closes_payment_uq").on(t.paymentId),
    index("checkout_closes_studio_idx").on(t.studioId, t.createdAt),
    // The scheduler's pass reads only the closes Stripe has not confirmed yet.
    index("checkout_closes_due_idx").on(t.createdAt).where(sql`settled_at IS NULL`),
  ],
);

export type CheckoutClose = typeof checkoutCloses.$inferSelect;

/** Every Stripe webhook event recorded once by its id; a replay changes nothing. */
export const stripeEvents = sqliteTable("stripe_events", {
  id: text("id").primaryKey(),
  type: text("type").notNull(),
  objectId: text("object_id"),
  receivedAt: integer("received_at", { mode: "timestamp_ms" })
    .notNull()
    .$defaultFn(() => new Date()),
});

export type Studio = typeof studios.$inferSelect;
export type User = typeof users.$inferSelect;
export type Membership = typeof memberships.$inferSelect;
export type Invitation = typeof invitations.$inferSelect;
export type FinishProduct = typeof finishProducts.$inferSelect;
export type NewFinishProduct = typeof finishProducts.$inferInsert;
export type Piece = typeof pieces.$inferSelect;
export type NewPiece = typeof pieces.$inferInsert;
export type FinishLayer = typeof finishLayers.$inferSelect;
export type NewFinishLayer = typeof finishLayers.$inferInsert;
export type AuditEntry = typeof auditLog.$inferSelect;
export type WarrantyPolicyRow = typeof warrantyPolicies.$inferSelect;
export type Ownership = typeof ownerships.$inferSelect;
export type StoredFile = typeof files.$inferSelect;
export type CareLogRow = typeof careLogEntries.$inferSelect;
export type ReminderSend = typeof reminderSends.$inferSelect;
export type RefreshOffer = typeof refreshOffers.$inferSelect;
export type Claim = typeof claims.$inferSelect;
export type RepairJob = typeof repairJobs.$inferSelect;
export type Payment = typeof payments.$inferSelect;

// ---- visits: technician hours, time off, visits, their photos and the reminder ledger ----

/** A technician's weekly working hours in the studio's time zone; several ranges per weekday allowed. */
export const technicianHours = sqliteTable(
  "technician_hours",
  {
    id: id(),
    studioId: studioRef(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    /** ISO weekday, 1 = Monday … 7 = Sunday. */
    weekday: integer("weekday").notNull(),
    /** Local wall time "HH:MM". */
    start: text("start").notNull(),
    end: text("end").notNull(),
  },
  (t) => [index("technician_hours_studio_user_idx").on(t.studioId, t.userId)],
);

export const technicianHoursRelations = relations(technicianHours, ({ one }) => ({
  studio: one(studios, { fields: [technicianHours.studioId], references: [studios.id] }),
  user: one(users, { fields: [technicianHours.userId], references: [users.id] }),
}));

/** Days off and other exceptions: a whole local date, or a part of it (start/end local "HH:MM"). */
export const technicianTimeOff = sqliteTable(
  "technician_time_off",
  {
    id: id(),
    studioId: studioRef(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    date: text("date").notNull(),
    /** Both null: the whole day. */
    start: text("start"),
    end: text("end"),
    note: text("note").notNull().default(""),
    createdAt: createdAt(),
  },
  (t) => [index("technician_time_off_studio_user_idx").on(t.studioId, t.userId, t.date)],
);

export const technicianTimeOffRelations = relations(technicianTimeOff, ({ one }) => ({
  studio: one(studios, { fields: [technicianTimeOff.studioId], references: [studios.id] }),
  user: one(users, { fields: [technicianTimeOff.userId], references: [users.id] }),
}));

/** The studio's booking rules; a studio without a row uses the defaults below. */
export const visitRules = sqliteTable("visit_rules", {
  studioId: text("studio_id")
    .primaryKey()
    .references(() => studios.id, { onDelete: "cascade" }),
  travelBufferMin: integer("travel_buffer_min").notNull().default(30),
  leadTimeHours: integer("lead_time_hours").notNull().default(48),
  slotStepMin: integer("slot_step_min").notNull().default(30),
  /** Owners may move or cancel until this many hours before the visit; staff until it starts. */
  ownerChangeCutoffHours: integer("owner_change_cutoff_hours").notNull().default(24),
});

export const visitRulesRelations = relations(visitRules, ({ one }) => ({
  studio: one(studios, { fields: [visitRules.studioId], references: [studios.id] }),
}));

export const visits = sqliteTable(
  "visits",
  {
    id: id(),
    studioId: studioRef(),
    jobId: text("job_id")
      .notNull()
      .references(() => repairJobs.id, { onDelete: "cascade" }),
    pieceId: text("piece_id")
      .notNull()
      .references(() => pieces.id, { onDelete: "cascade" }),
    technicianId: text("technician_id")
      .notNull()
      .references(() => users.id, { onDelete: "restrict" }),
    startAt: integer("start_at", { mode: "timestamp_ms" }).notNull(),
    endAt: integer("end_at", { mode: "timestamp_ms" }).notNull(),
    locationKind: text("location_kind", { enum: VISIT_LOCATIONS }).notNull(),
    /** The address, as sent in LOCATION of the invite. */
    location: text("location").notNull(),
    /** RFC 5545 UID: stable for the life of the visit. */
    icsUid: text("ics_uid").notNull().unique(),
    /** RFC 5545 SEQUENCE: raised on every change that is sent (move, cancel). */
    sequence: integer("sequence").notNull().default(0),
    state: text("state", { enum: VISIT_STATES }).notNull().default("booked"),
    /** The job's state before the visit was booked (paid or covered), restored when it is cancelled. */
    jobStateBefore: text("job_state_before", { enum: JOB_STATES }).notNull(),
    bookedById: text("booked_by_id").references(() => users.id, { onDelete: "set null" }),
    cancelledAt: integer("cancelled_at", { mode: "timestamp_ms" }),
    cancelledById: text("cancelled_by_id").references(() => users.id, { onDelete: "set null" }),
    cancelReason: text("cancel_reason"),
    reportWork: text("report_work"),
    /** A name the technician typed at the visit (older reports only; the sign-off is now the owner's own, below). */
    reportSignOffName: text("report_sign_off_name"),
    reportLayerIds: text("report_layer_ids", { mode: "json" }).$type<string[]>(),
    reportedAt: integer("reported_at", { mode: "timestamp_ms" }),
    reportedById: text("reported_by_id").references(() => users.id, { onDelete: "set null" }),
    /** Why staff filed the report before the visit's start (null: filed after it started). */
    reportEarlyReason: text("report_early_reason"),
    /** The owner's sign-off: a single-use link in the visit-done mail (only its SHA-256 kept), confirmed by a POST. */
    signOffTokenHash: text("sign_off_token_hash").unique(),
    signOffExpiresAt: integer("sign_off_expires_at", { mode: "timestamp_ms" }),
    signedOffAt: integer("signed_off_at", { mode: "timestamp_ms" }),
    signedOffById: text("signed_off_by_id").references(() => users.id, { onDelete: "set null" }),
    /** When the latest invite (confirmation or change) went out; the reminder skips an invite sent within its window. */
    lastInviteAt: integer("last_invite_at", { mode: "timestamp_ms" }),
    version: integer("version").notNull().default(0),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("visits_studio_tech_start_idx").on(t.studioId, t.technicianId, t.startAt),
    index("visits_studio_start_idx").on(t.studioId, t.startAt),
    index("visits_job_idx").on(t.jobId),
    // At most one live visit per job.
    uniqueIndex("visits_job_booked_uq").on(t.jobId).where(sql`state = 'booked'`),
  ],
);

export const visitsRelations = relations(visits, ({ one, many }) => ({
  job: one(repairJobs, { fields: [visits.jobId], references: [repairJobs.id] }),
  piece: one(pieces, { fields: [visits.pieceId], references: [pieces.id] }),
  technician: one(users, { fields: [visits.technicianId], references: [users.id] }),
  photos: many(visitPhotos),
}));

/** Before/after photos of a visit (files rows with purpose "visit_photo" and the piece's id). */
export const visitPhotos = sqliteTable(
  "visit_photos",
  {
    id: id(),
    studioId: studioRef(),
    visitId: text("visit_id")
      .notNull()
      .references(() => visits.id, { onDelete: "cascade" }),
    fileId: text("file_id")
      .notNull()
      .references(() => files.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: VISIT_PHOTO_KINDS }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("visit_photos_visit_idx").on(t.visitId)],
);

export const visitPhotosRelations = relations(visitPhotos, ({ one }) => ({
  visit: one(visits, { fields: [visitPhotos.visitId], references: [visits.id] }),
  file: one(files, { fields: [visitPhotos.fileId], references: [files.id] }),
}));

/** Send ledger of visit reminders: one row per visit, kind and SEQUENCE, claimed before the message goes out. */
export const visitMailSends = sqliteTable(
  "visit_mail_sends",
  {
    id: id(),
    studioId: studioRef(),
    visitId: text("visit_id")
      .notNull()
      .references(() => visits.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: ["reminder_24h"] }).notNull(),
    sequence: integer("sequence").notNull(),
    status: text("status", { enum: SEND_STATUSES }).notNull(),
    attempts: integer("attempts").notNull().default(0),
    lastError: text("last_error"),
    claimedAt: integer("claimed_at", { mode: "timestamp_ms" }).notNull(),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }),
    messageId: text("message_id"),
  },
  (t) => [uniqueIndex("visit_mail_sends_uq").on(t.visitId, t.kind, t.sequence), index("visit_mail_sends_studio_idx").on(t.studioId, t.status)],
);

export const visitMailSendsRelations = relations(visitMailSends, ({ one }) => ({
  studio: one(studios, { fields: [visitMailSends.studioId], references: [studios.id] }),
  visit: one(visits, { fields: [visitMailSends.visitId], references: [visits.id] }),
}));

export type TechnicianHoursRow = typeof technicianHours.$inferSelect;
export type TechnicianTimeOffRow = typeof technicianTimeOff.$inferSelect;
export type VisitRulesRow = typeof visitRules.$inferSelect;
export type Visit = typeof visits.$inferSelect;
export type NewVisit = typeof visits.$inferInsert;
export type VisitPhoto = typeof visitPhotos.$inferSelect;
export type VisitMailSend = typeof visitMailSends.$inferSelect;

export type QueuedAttachment = { filename: string; contentBase64: string; contentType?: string; contentDisposition?: "attachment" | "inline"; cid?: string };
export const mailQueue = sqliteTable(
  "mail_queue",
  {
    id: id(),
    to: text("to", { mode: "json" }).$type<string[]>().notNull(),
    subject: text("subject").notNull(),
    html: text("html").notNull(),
    text: text("text").notNull(),
    headers: text("headers", { mode: "json" }).$type<Record<string, string>>(),
    replyTo: text("reply_to"),
    attachments: text("attachments", { mode: "json" }).$type<QueuedAttachment[]>(),
    status: text("status", { enum: MAIL_QUEUE_STATUSES }).notNull(),
    attempts: integer("attempts").notNull(),
    nextAttemptAt: integer("next_attempt_at", { mode: "timestamp_ms" }),
    lastError: text("last_error"),
    messageId: text("message_id"),
    createdAt: createdAt(),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" }).notNull(),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }),
  },
  (t) => [index("mail_queue_due_idx").on(t.status, t.nextAttemptAt)],
);
export type QueuedMail = typeof mailQueue.$inferSelect;

// ---- clients: the studio's record of the people it sold to or serves ----

/**
 * A person or household the studio sold to or serves. Not an account: a client may never sign in;
 * when one does (same e-mail, confirmed), userId links the two. E-mail lower-cased, unique per
 * studio; phone in E.164 (lib/clients/phone.ts). The current consent is on the row, its history in
 * client_consents.
 */
export const clients = sqliteTable(
  "clients",
  {
    id: id(),
    studioId: studioRef(),
    name: text("name").notNull(),
    email: text("email"),
    phone: text("phone"),
    address: text("address").notNull().default(""),
    preferredContact: text("preferred_contact", { enum: CONTACT_METHODS }).notNull().default("email"),
    /** IANA zone; null: the studio's. */
    timeZone: text("time_zone"),
    notes: text("notes").notNull().default(""),
    consentService: integer("consent_service", { mode: "boolean" }).notNull().default(false),
    consentOffers: integer("consent_offers", { mode: "boolean" }).notNull().default(false),
    userId: text("user_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("clients_studio_name_idx").on(t.studioId, t.name),
    // The clients list reads a page in name order (lib/clients/list.ts) and stops there.
    index("clients_studio_name_nocase_idx").on(t.studioId, sql`${t.name} COLLATE NOCASE`, t.id),
    index("clients_studio_phone_idx").on(t.studioId, t.phone),
    uniqueIndex("clients_studio_email_uq").on(t.studioId, t.email).where(sql`email IS NOT NULL`),
    uniqueIndex("clients_studio_user_uq").on(t.studioId, t.userId).where(sql`user_id IS NOT NULL`),
    index("clients_user_idx").on(t.userId),
  ],
);

export const clientsRelations = relations(clients, ({ one, many }) => ({
  studio: one(studios, { fields: [clients.studioId], references: [studios.id] }),
  user: one(users, { fields: [clients.userId], references: [users.id] }),
  consents: many(clientConsents),
}));

/** Every change of a client's consent: what, given or withdrawn, when and how. Never edited. */
export const clientConsents = sqliteTable(
  "client_consents",
  {
    id: id(),
    studioId: studioRef(),
    clientId: text("client_id")
      .notNull()
      .references(() => clients.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: CONSENT_KINDS }).notNull(),
    granted: integer("granted", { mode: "boolean" }).notNull(),
    /** When the person gave or withdrew it (may be before it was recorded). */
    givenAt: integer("given_at", { mode: "timestamp_ms" }).notNull(),
    source: text("source", { enum: CONSENT_SOURCES }).notNull(),
    note: text("note").notNull().default(""),
    recordedById: text("recorded_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("client_consents_studio_client_idx").on(t.studioId, t.clientId, t.givenAt)],
);

export const clientConsentsRelations = relations(clientConsents, ({ one }) => ({
  client: one(clients, { fields: [clientConsents.clientId], references: [clients.id] }),
}));

export type Client = typeof clients.$inferSelect;
export type NewClient = typeof clients.$inferInsert;
export type ClientConsent = typeof clientConsents.$inferSelect;

// ---- conversations: one thread per claim, repair job or visit; the studio's inbox ----

/** A conversation between a studio and the owner about one claim, repair job or visit (and so one piece). */
export const threads = sqliteTable(
  "threads",
  {
    id: id(),
    studioId: studioRef(),
    subject: text("subject", { enum: THREAD_SUBJECTS }).notNull(),
    claimId: text("claim_id").references(() => claims.id, { onDelete: "cascade" }),
    jobId: text("job_id").references(() => repairJobs.id, { onDelete: "cascade" }),
    visitId: text("visit_id").references(() => visits.id, { onDelete: "cascade" }),
    pieceId: text("piece_id")
      .notNull()
      .references(() => pieces.id, { onDelete: "cascade" }),
    /** The owner the studio talks with (the claim's or job's owner). */
    ownerId: text("owner_id").references(() => users.id, { onDelete: "set null" }),
    state: text("state", { enum: THREAD_STATES }).notNull().default("open"),
    assignedToId: text("assigned_to_id").references(() => users.id, { onDelete: "set null" }),
    /** When the oldest owner message not yet answered arrived; null when nothing waits on the studio. */
    waitingSince: integer("waiting_since", { mode: "timestamp_ms" }),
    lastMessageAt: integer("last_message_at", { mode: "timestamp_ms" }).notNull(),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("threads_studio_state_idx").on(t.studioId, t.state, t.lastMessageAt),
    index("threads_piece_idx").on(t.pieceId),
    // A client's timeline reads the messages of their threads (lib/clients/timeline.ts).
    index("threads_owner_idx").on(t.ownerId, t.studioId),
    uniqueIndex("threads_claim_uq").on(t.claimId),
    uniqueIndex("threads_job_uq").on(t.jobId),
    uniqueIndex("threads_visit_uq").on(t.visitId),
  ],
);

export const threadsRelations = relations(threads, ({ one }) => ({
  studio: one(studios, { fields: [threads.studioId], references: [studios.id] }),
  claim: one(claims, { fields: [threads.claimId], references: [claims.id] }),
  job: one(repairJobs, { fields: [threads.jobId], references: [repairJobs.id] }),
  visit: one(visits, { fields: [threads.visitId], references: [visits.id] }),
  piece: one(pieces, { fields: [threads.pieceId], references: [pieces.id] }),
  owner: one(users, { fields: [threads.ownerId], references: [users.id] }),
  assignedTo: one(users, { fields: [threads.assignedToId], references: [users.id] }),
}));

export const threadMessages = sqliteTable(
  "thread_messages",
  {
    id: id(),
    studioId: studioRef(),
    threadId: text("thread_id")
      .notNull()
      .references(() => threads.id, { onDelete: "cascade" }),
    author: text("author", { enum: MESSAGE_AUTHORS }).notNull(),
    authorId: text("author_id").references(() => users.id, { onDelete: "set null" }),
    source: text("source", { enum: MESSAGE_SOURCES }).notNull().default("web"),
    /** The sender's address of a message that came in by e-mail. */
    fromEmail: text("from_email"),
    /** Message-ID of an e-mailed message: the same mail delivered twice is added once. */
    emailMessageId: text("email_message_id").unique(),
    body: text("body").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("thread_messages_thread_idx").on(t.threadId, t.createdAt)],
);

export const threadMessagesRelations = relations(threadMessages, ({ one }) => ({
  studio: one(studios, { fields: [threadMessages.studioId], references: [studios.id] }),
  thread: one(threads, { fields: [threadMessages.threadId], references: [threads.id] }),
  author: one(users, { fields: [threadMessages.authorId], references: [users.id] }),
}));

/** Inbound mail that could not be added to a thread: kept for the studio's staff, never dropped. */
export const unmatchedMail = sqliteTable(
  "unmatched_mail",
  {
    id: id(),
    /** The studio it was probably meant for (null: no studio could be told). */
    studioId: text("studio_id").references(() => studios.id, { onDelete: "cascade" }),
    threadId: text("thread_id").references(() => threads.id, { onDelete: "set null" }),
    reason: text("reason", { enum: UNMATCHED_REASONS }).notNull(),
    emailMessageId: text("email_message_id").unique(),
    fromEmail: text("from_email").notNull(),
    toEmail: text("to_email").notNull(),
    subject: text("subject").notNull(),
    body: text("body").notNull(),
    receivedAt: integer("received_at", { mode: "timestamp_ms" }).notNull(),
    resolvedAt: integer("resolved_at", { mode: "timestamp_ms" }),
    resolvedById: text("resolved_by_id").references(() => users.id, { onDelete: "set null" }),
  },
  (t) => [index("unmatched_mail_studio_idx").on(t.studioId, t.receivedAt)],
);

export const unmatchedMailRelations = relations(unmatchedMail, ({ one }) => ({
  studio: one(studios, { fields: [unmatchedMail.studioId], references: [studios.id] }),
  thread: one(threads, { fields: [unmatchedMail.threadId], references: [threads.id] }),
  resolvedBy: one(users, { fields: [unmatchedMail.resolvedById], references: [users.id] }),
}));

export type Thread = typeof threads.$inferSelect;
export type ThreadMessage = typeof threadMessages.$inferSelect;
export type UnmatchedMail = typeof unmatchedMail.$inferSelect;

// ---- hand-over mail: the mail a buyer gets at delivery, and its one-tap registration link ----

/**
 * The hand-over mail of one piece to its buyer (a client of the studio): where it went, when it was
 * sent (again), when its link was opened and when the piece was registered through it. The link
 * carries a random token; only its SHA-256 is kept, bound to the piece and the address it was sent
 * to. A resend replaces the token; registering takes it (single use).
 */
export const pieceHandovers = sqliteTable(
  "piece_handovers",
  {
    id: id(),
    studioId: studioRef(),
    pieceId: text("piece_id")
      .notNull()
      .references(() => pieces.id, { onDelete: "cascade" }),
    clientId: text("client_id").references(() => clients.id, { onDelete: "set null" }),
    /** The address the link is bound to (lower-cased); null once the client is erased. */
    email: text("email"),
    tokenHash: text("token_hash").unique(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }),
    firstSentAt: integer("first_sent_at", { mode: "timestamp_ms" }),
    lastSentAt: integer("last_sent_at", { mode: "timestamp_ms" }),
    sendCount: integer("send_count").notNull().default(0),
    openedAt: integer("opened_at", { mode: "timestamp_ms" }),
    registeredAt: integer("registered_at", { mode: "timestamp_ms" }),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("piece_handovers_piece_uq").on(t.pieceId), index("piece_handovers_studio_client_idx").on(t.studioId, t.clientId)],
);

export const pieceHandoversRelations = relations(pieceHandovers, ({ one }) => ({
  studio: one(studios, { fields: [pieceHandovers.studioId], references: [studios.id] }),
  piece: one(pieces, { fields: [pieceHandovers.pieceId], references: [pieces.id] }),
  client: one(clients, { fields: [pieceHandovers.clientId], references: [clients.id] }),
}));

export type PieceHandover = typeof pieceHandovers.$inferSelect;

/**
 * A bulk hand-over mailing (staff's pick of pieces, or a CSV import's "send now"): sent outside the
 * request by lib/pieces/handover-batch.ts, one item per piece, each mailed at most once.
 */
export const handoverBatches = sqliteTable(
  "handover_batches",
  {
    id: id(),
    studioId: studioRef(),
    createdById: text("created_by_id").references(() => users.id, { onDelete: "set null" }),
    source: text("source", { enum: HANDOVER_BATCH_SOURCES }).notNull(),
    state: text("state", { enum: HANDOVER_BATCH_STATES }).notNull().default("queued"),
    createdAt: createdAt(),
    startedAt: integer("started_at", { mode: "timestamp_ms" }),
    finishedAt: integer("finished_at", { mode: "timestamp_ms" }),
    /** Touched as the runner goes: a running batch not touched for a while is taken up again. */
    updatedAt: updatedAt(),
  },
  (t) => [index("handover_batches_studio_idx").on(t.studioId, t.createdAt)],
);

export const handoverBatchesRelations = relations(handoverBatches, ({ one }) => ({
  studio: one(studios, { fields: [handoverBatches.studioId], references: [studios.id] }),
  createdBy: one(users, { fields: [handoverBatches.createdById], references: [users.id] }),
}));

export const handoverBatchItems = sqliteTable(
  "handover_batch_items",
  {
    id: id(),
    batchId: text("batch_id")
      .notNull()
      .references(() => handoverBatches.id, { onDelete: "cascade" }),
    studioId: studioRef(),
    pieceId: text("piece_id")
      .notNull()
      .references(() => pieces.id, { onDelete: "cascade" }),
    outcome: text("outcome", { enum: HANDOVER_ITEM_OUTCOMES }).notNull().default("pending"),
    /** Why it was skipped (a HandoverBlock or "already_sent") or failed (the error, in words). */
    reason: text("reason"),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("handover_batch_items_piece_uq").on(t.batchId, t.pieceId), index("handover_batch_items_outcome_idx").on(t.batchId, t.outcome)],
);

export const handoverBatchItemsRelations = relations(handoverBatchItems, ({ one }) => ({
  batch: one(handoverBatches, { fields: [handoverBatchItems.batchId], references: [handoverBatches.id] }),
  studio: one(studios, { fields: [handoverBatchItems.studioId], references: [studios.id] }),
  piece: one(pieces, { fields: [handoverBatchItems.pieceId], references: [pieces.id] }),
}));

/**
 * A care plan a studio sells: one row per version. Changing a template inserts the next version with
 * the same lineageId and marks the old one superseded; a running plan keeps the version it was bought under.
 */
export const planTemplates = sqliteTable(
  "plan_templates",
  {
    id: id(),
    studioId: studioRef(),
    /** Shared by every version of one template (the first version's id). */
    lineageId: text("lineage_id").notNull(),
    version: integer("version").notNull().default(1),
    name: text("name").notNull(),
    summary: text("summary").notNull().default(""),
    included: text("included", { mode: "json" }).$type<PlanIncluded>().notNull(),
    fits: text("fits", { mode: "json" }).$type<PlanFit>().notNull(),
    /** Price per interval before tax (or including it when the studio's prices include tax), minor units. */
    priceMinor: integer("price_minor").notNull(),
    interval: text("interval", { enum: PLAN_INTERVALS }).notNull().default("year"),
    currency: text("currency").notNull(),
    refundRule: text("refund_rule", { enum: PLAN_REFUND_RULES }).notNull().default("none"),
    /** Whether the plan moves with the piece when it changes hands. */
    transfers: integer("transfers", { mode: "boolean" }).notNull().default(false),
    /** Offered to owners; a withdrawn template keeps its running plans. */
    offered: integer("offered", { mode: "boolean" }).notNull().default(true),
    supersededAt: integer("superseded_at", { mode: "timestamp_ms" }),
    createdById: text("created_by_id").references(() => users.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("plan_templates_lineage_version_uq").on(t.lineageId, t.version), index("plan_templates_studio_idx").on(t.studioId)],
);

export const planTemplatesRelations = relations(planTemplates, ({ one }) => ({
  studio: one(studios, { fields: [planTemplates.studioId], references: [studios.id] }),
  createdBy: one(users, { fields: [planTemplates.createdById], references: [users.id] }),
}));

/** One piece under one plan template version, for one owner; its state lives in lib/plans/states.ts. */
export const planSubscriptions = sqliteTable(
  "plan_subscriptions",
  {
    id: id(),
    studioId: studioRef(),
    templateId: text("template_id")
      .notNull()
      .references(() => planTemplates.id),
    pieceId: text("piece_id")
      .notNull()
      .references(() => pieces.id, { onDelete: "cascade" }),
    ownerId: text("owner_id").references(() => users.id, { onDelete: "set null" }),
    /**
     * The person the plan was bought for, who pays it: kept when the plan passes on with its piece and
     * ownerId becomes null (lib/plans/transfer.ts), so mail about their money finds them from our records.
     */
    payerId: text("payer_id").references(() => users.id, { onDelete: "set null" }),
    state: text("state", { enum: PLAN_STATES }).notNull().default("awaiting_payment"),
    paidBy: text("paid_by", { enum: PLAN_PAID_BY }).notNull().default("card"),
    /** What a staff-started plan was paid with ("bank transfer", "cash at the studio"). */
    paidByNote: text("paid_by_note").notNull().default(""),
    stripeCustomerId: text("stripe_customer_id"),
    stripeSubscriptionId: text("stripe_subscription_id").unique(),
    checkoutSessionId: text("checkout_session_id").unique(),
    checkoutUrl: text("checkout_url"),
    /**
     * Set while this plan's payment page may be open (from just before it is asked of Stripe until it is
     * known closed, paid or the plan leaves awaiting_payment): at most one plan of a piece has it, across
     * processes (plan_subscriptions_one_open_checkout_uq; lib/plans/subscriptions.ts startPlanCheckout).
     */
    checkoutClaimedAt: integer("checkout_claimed_at", { mode: "timestamp_ms" }),
    /** The Stripe account the plan's checkout, subscription and invoices were made under. */
    stripeAccount: text("stripe_account", { enum: STRIPE_ACCOUNTS }),
    /**
     * A change of hands not yet finished at Stripe (lib/plans/transfer.ts): "stripe" — Stripe is still
     * to be told; "refund" — the refund is still to be paid and the owner mailed. Null when nothing is left.
     */
    transferStep: text("transfer_step", { enum: ["stripe", "refund"] }),
    /** Gross amount per interval the plan was bought at (tax as the studio set it then). */
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    periodStart: integer("period_start", { mode: "timestamp_ms" }),
    periodEnd: integer("period_end", { mode: "timestamp_ms" }),
    graceEndsAt: integer("grace_ends_at", { mode: "timestamp_ms" }),
    startedAt: integer("started_at", { mode: "timestamp_ms" }),
    lapsedAt: integer("lapsed_at", { mode: "timestamp_ms" }),
    endedAt: integer("ended_at", { mode: "timestamp_ms" }),
    /** When a cancelled plan stops covering (the period's end, or the end of the plan month under a pro-rata refund rule). */
    endsAt: integer("ends_at", { mode: "timestamp_ms" }),
    createdById: text("created_by_id").references(() => users.id, { onDelete: "set null" }),
    version: integer("version").notNull().default(0),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [
    index("plan_subscriptions_studio_idx").on(t.studioId, t.state),
    index("plan_subscriptions_piece_idx").on(t.pieceId),
    index("plan_subscriptions_owner_idx").on(t.ownerId),
    uniqueIndex("plan_subscriptions_one_open_checkout_uq").on(t.pieceId).where(sql`checkout_claimed_at IS NOT NULL`),
  ],
);

export const planSubscriptionsRelations = relations(planSubscriptions, ({ one }) => ({
  studio: one(studios, { fields: [planSubscriptions.studioId], references: [studios.id] }),
  template: one(planTemplates, { fields: [planSubscriptions.templateId], references: [planTemplates.id] }),
  piece: one(pieces, { fields: [planSubscriptions.pieceId], references: [pieces.id] }),
  owner: one(users, { fields: [planSubscriptions.ownerId], references: [users.id] }),
  createdBy: one(users, { fields: [planSubscriptions.createdById], references: [users.id] }),
}));

/** A plan period's payment (a Stripe invoice, or a staff-recorded payment by other means). */
export const planInvoices = sqliteTable(
  "plan_invoices",
  {
    id: id(),
    studioId: studioRef(),
    subscriptionId: text("subscription_id")
      .notNull()
      .references(() => planSubscriptions.id, { onDelete: "cascade" }),
    stripeInvoiceId: text("stripe_invoice_id").unique(),
    status: text("status", { enum: ["paid", "failed"] }).notNull(),
    amountMinor: integer("amount_minor").notNull(),
    taxMinor: integer("tax_minor").notNull().default(0),
    currency: text("currency").notNull(),
    /** false when the amount or the template version is not the plan's current one (kept, not counted). */
    counts: integer("counts", { mode: "boolean" }).notNull().default(true),
    /**
     * What staff decided about a paid invoice held because its amount or version wasn't the plan's
     * (lib/plans/held.ts): taken as the period's payment, taken with the difference paid back, or paid
     * back in full with the plan ended; or, with no one deciding (lib/plans/stripe-sync.ts), paid back at
     * once: "refunded_after_end", a renewal charged for a period after the plan's end; "refunded_not_owed",
     * the first payment of a plan for a piece another plan already covered. Null while it waits for staff
     * (or when nothing was held).
     */
    heldResolution: text("held_resolution", { enum: ["accepted", "difference_refunded", "refunded_and_ended", "refunded_after_end", "refunded_not_owed"] }),
    /** What was paid back of a held invoice (minor units). */
    heldRefundedMinor: integer("held_refunded_minor").notNull().default(0),
    heldResolvedAt: integer("held_resolved_at", { mode: "timestamp_ms" }),
    heldResolvedById: text("held_resolved_by_id").references(() => users.id, { onDelete: "set null" }),
    periodStart: integer("period_start", { mode: "timestamp_ms" }),
    periodEnd: integer("period_end", { mode: "timestamp_ms" }),
    at: integer("at", { mode: "timestamp_ms" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("plan_invoices_studio_idx").on(t.studioId, t.at), index("plan_invoices_subscription_idx").on(t.subscriptionId)],
);

export const planInvoicesRelations = relations(planInvoices, ({ one }) => ({
  studio: one(studios, { fields: [planInvoices.studioId], references: [studios.id] }),
  subscription: one(planSubscriptions, { fields: [planInvoices.subscriptionId], references: [planSubscriptions.id] }),
}));

/**
 * Money given back when a plan ends early, by the template's refund rule (lib/plans/refund.ts). One per
 * plan: the row is claimed (requested) in the same transaction that checks the plan's version, before
 * any money moves, so two cancellations at once can't both refund.
 */
export const planRefunds = sqliteTable(
  "plan_refunds",
  {
    id: id(),
    studioId: studioRef(),
    subscriptionId: text("subscription_id")
      .notNull()
      .unique()
      .references(() => planSubscriptions.id, { onDelete: "cascade" }),
    /** The plan's version the refund was asked against. */
    subscriptionVersion: integer("subscription_version").notNull(),
    amountMinor: integer("amount_minor").notNull(),
    currency: text("currency").notNull(),
    /** Whole unused months refunded, of monthsInPeriod. */
    months: integer("months").notNull(),
    reason: text("reason", { enum: ["cancelled", "changed_hands"] }).notNull(),
    /**
     * requested: claimed, not yet confirmed by Stripe; refunded: Stripe confirmed; other_means: a plan paid
     * by other means, paid back by the studio; refused: Stripe answered no (nothing moved; not asked again,
     * refusedWords says why, for staff).
     */
    status: text("status", { enum: ["requested", "refunded", "other_means", "refused"] }).notNull().default("requested"),
    /** Why the payment service refused the refund, in staff's words (lib/plans/refund.ts); null unless refused. */
    refusedWords: text("refused_words"),
    refusedAt: integer("refused_at", { mode: "timestamp_ms" }),
    stripeRefundId: text("stripe_refund_id"),
    requestedById: text("requested_by_id").references(() => users.id, { onDelete: "set null" }),
    refundedAt: integer("refunded_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("plan_refunds_studio_idx").on(t.studioId)],
);

export type PlanRefund = typeof planRefunds.$inferSelect;

/** An included visit the scheduler turned into studio work: one per plan and due date. */
export const planVisits = sqliteTable(
  "plan_visits",
  {
    id: id(),
    studioId: studioRef(),
    subscriptionId: text("subscription_id")
      .notNull()
      .references(() => planSubscriptions.id, { onDelete: "cascade" }),
    dueOn: text("due_on").notNull(),
    jobId: text("job_id").references(() => repairJobs.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("plan_visits_subscription_due_uq").on(t.subscriptionId, t.dueOn),
    index("plan_visits_studio_idx").on(t.studioId),
    // A job's page finds the plan visit it is by job (lib/repairs/jobs.ts visitPlanName); a deleted job nulls its job_id through it.
    index("plan_visits_job_idx").on(t.jobId),
  ],
);

export const planVisitsRelations = relations(planVisits, ({ one }) => ({
  studio: one(studios, { fields: [planVisits.studioId], references: [studios.id] }),
  subscription: one(planSubscriptions, { fields: [planVisits.subscriptionId], references: [planSubscriptions.id] }),
  job: one(repairJobs, { fields: [planVisits.jobId], references: [repairJobs.id] }),
}));

export type PlanTemplate = typeof planTemplates.$inferSelect;
export type PlanSubscription = typeof planSubscriptions.$inferSelect;
export type PlanInvoice = typeof planInvoices.$inferSelect;
