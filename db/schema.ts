import { relations, sql } from "drizzle-orm";
import { index, integer, real, sqliteTable, text, uniqueIndex } from "drizzle-orm/sqlite-core";
import {
  FINISH_CLASSES,
  PIECE_KINDS,
  RESIN_KINDS,
  SHAPE_KINDS,
  STUDIO_ROLES,
  SUN_EXPOSURES,
  SURFACES,
  USES,
} from "../lib/care/vocabulary";

// Every studio-owned table carries studioId and every query filters by it (DESIGN.md §1).
// Timestamps are epoch milliseconds (Date in TypeScript); calendar dates are "YYYY-MM-DD" text.

const id = () =>
  text("id")
    .primaryKey()
    .$defaultFn(() => crypto.randomUUID());
const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .$defaultFn(() => new Date());

export const UNIT_SYSTEMS = ["metric", "imperial"] as const;

export const studios = sqliteTable("studios", {
  id: id(),
  slug: text("slug").notNull().unique(),
  name: text("name").notNull(),
  address: text("address").notNull().default(""),
  email: text("email").notNull().default(""),
  timeZone: text("time_zone").notNull().default("UTC"),
  currency: text("currency").notNull().default("USD"),
  unitSystem: text("unit_system", { enum: UNIT_SYSTEMS }).notNull().default("metric"),
  /** Tax rate in basis points (8.25 % = 825). */
  taxRateBp: integer("tax_rate_bp").notNull().default(0),
  /** Labour rate per hour, in the currency's minor units. */
  labourRateMinor: integer("labour_rate_minor").notNull().default(0),
  travelFeeMinor: integer("travel_fee_minor").notNull().default(0),
  createdAt: createdAt(),
});

export const users = sqliteTable("users", {
  id: id(),
  /** Stored lower-cased and trimmed. */
  email: text("email").notNull().unique(),
  name: text("name").notNull(),
  passwordHash: text("password_hash").notNull(),
  emailVerifiedAt: integer("email_verified_at", { mode: "timestamp_ms" }),
  timeZone: text("time_zone").notNull().default("UTC"),
  unitSystem: text("unit_system", { enum: UNIT_SYSTEMS }).notNull().default("metric"),
  remindersEnabled: integer("reminders_enabled", { mode: "boolean" }).notNull().default(true),
  createdAt: createdAt(),
});

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

export const memberships = sqliteTable(
  "memberships",
  {
    id: id(),
    studioId: text("studio_id")
      .notNull()
      .references(() => studios.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: text("role", { enum: STUDIO_ROLES }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("memberships_studio_user_uq").on(t.studioId, t.userId), index("memberships_user_idx").on(t.userId)],
);

export const TOKEN_PURPOSES = ["verify_email", "password_reset"] as const;

/** Single-use e-mail tokens; only their SHA-256 is kept. */
export const userTokens = sqliteTable(
  "user_tokens",
  {
    id: id(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    purpose: text("purpose", { enum: TOKEN_PURPOSES }).notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("user_tokens_user_idx").on(t.userId, t.purpose)],
);

export const invitations = sqliteTable(
  "invitations",
  {
    id: id(),
    studioId: text("studio_id")
      .notNull()
      .references(() => studios.id, { onDelete: "cascade" }),
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

/** A container a finish product is sold in, with its price in the studio's minor units. */
export type ContainerSize = { ml: number; priceMinor: number };

export const finishProducts = sqliteTable(
  "finish_products",
  {
    id: id(),
    studioId: text("studio_id")
      .notNull()
      .references(() => studios.id, { onDelete: "cascade" }),
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
    archivedAt: integer("archived_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("finish_products_studio_idx").on(t.studioId)],
);

export const pieces = sqliteTable(
  "pieces",
  {
    id: id(),
    studioId: text("studio_id")
      .notNull()
      .references(() => studios.id, { onDelete: "cascade" }),
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
    registeredAt: integer("registered_at", { mode: "timestamp_ms" }),
    /** HMAC-SHA-256 of the normalized registration code, keyed by APP_SECRET: lookups compare this. */
    registrationCodeHash: text("registration_code_hash").notNull().unique(),
    /** The code encrypted with AES-256-GCM under a key from APP_SECRET, so a card can be printed again. */
    registrationCodeEnc: text("registration_code_enc").notNull(),
    remindersPaused: integer("reminders_paused", { mode: "boolean" }).notNull().default(false),
    archivedAt: integer("archived_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" })
      .notNull()
      .$defaultFn(() => new Date()),
  },
  (t) => [
    index("pieces_studio_idx").on(t.studioId, t.deliveredOn),
    index("pieces_owner_idx").on(t.ownerId),
  ],
);

export const finishLayers = sqliteTable(
  "finish_layers",
  {
    id: id(),
    studioId: text("studio_id")
      .notNull()
      .references(() => studios.id, { onDelete: "cascade" }),
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
  (t) => [index("finish_layers_piece_idx").on(t.pieceId, t.surface, t.position)],
);

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

export const studiosRelations = relations(studios, ({ many }) => ({
  memberships: many(memberships),
  pieces: many(pieces),
  finishProducts: many(finishProducts),
}));

export const usersRelations = relations(users, ({ many }) => ({
  memberships: many(memberships),
  pieces: many(pieces),
}));

export const membershipsRelations = relations(memberships, ({ one }) => ({
  studio: one(studios, { fields: [memberships.studioId], references: [studios.id] }),
  user: one(users, { fields: [memberships.userId], references: [users.id] }),
}));

export const piecesRelations = relations(pieces, ({ one, many }) => ({
  studio: one(studios, { fields: [pieces.studioId], references: [studios.id] }),
  owner: one(users, { fields: [pieces.ownerId], references: [users.id] }),
  layers: many(finishLayers),
}));

export const finishLayersRelations = relations(finishLayers, ({ one }) => ({
  piece: one(pieces, { fields: [finishLayers.pieceId], references: [pieces.id] }),
  product: one(finishProducts, { fields: [finishLayers.productId], references: [finishProducts.id] }),
  appliedBy: one(users, { fields: [finishLayers.appliedById], references: [users.id] }),
}));

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
