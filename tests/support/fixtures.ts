// Test data made through the same tables the product writes. Invented, like all test data.
import { and, eq } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { auditLog, claims, finishLayers, finishProducts, memberships, pieces, studios, users, type Studio } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { hashPassword } from "@/lib/auth/password";
import type { StudioRole } from "@/lib/care/vocabulary";
import { newRegistrationCode } from "@/lib/pieces/registration";
import { planTemplateSchema } from "@/lib/plans/validation";

let counter = 0;
export const unique = (prefix: string) => `${prefix}-${process.pid}-${Date.now().toString(36)}-${++counter}`;

/** The audit log's rows about one subject (a plan, a claim, …) for one action. */
export const auditsOf = (subjectId: string, action: string) => getDb().select().from(auditLog).where(and(eq(auditLog.subjectId, subjectId), eq(auditLog.action, action))).all();

export function createStudio(overrides: Partial<typeof studios.$inferInsert> = {}): Studio {
  return getDb()
    .insert(studios)
    .values({ slug: unique("studio"), name: "Test Studio (invented)", timeZone: "America/New_York", ...overrides })
    .returning()
    .get();
}

export async function createUser(overrides: Partial<typeof users.$inferInsert> & { password?: string } = {}) {
  const { password = "correct horse battery", ...rest } = overrides;
  return getDb()
    .insert(users)
    .values({ email: `${unique("user")}@test.example`, name: "Test Person", passwordHash: await hashPassword(password), ...rest })
    .returning()
    .get();
}

/** A StudioContext as lib/auth's guards would return it, for calling lib/ functions directly. */
export async function memberContext(studio: Studio, role: StudioRole): Promise<StudioContext> {
  const user = await createUser();
  getDb().insert(memberships).values({ studioId: studio.id, userId: user.id, role }).run();
  const luciaUser: User = {
    id: user.id,
    email: user.email,
    name: user.name,
    emailVerifiedAt: user.emailVerifiedAt,
    timeZone: user.timeZone,
    unitSystem: user.unitSystem,
    remindersEnabled: user.remindersEnabled,
  };
  return { user: luciaUser, studio, role };
}

export function createPiece(studio: Studio, overrides: Partial<typeof pieces.$inferInsert> = {}) {
  const { code, hash, enc } = newRegistrationCode();
  const piece = getDb()
    .insert(pieces)
    .values({
      studioId: studio.id,
      kind: "dining_table",
      title: "Test table (invented)",
      shapeKind: "rectangle",
      lengthMm: 2000,
      widthMm: 900,
      primarySpeciesId: "black_walnut",
      use: "heavy",
      deliveredOn: "2025-06-01",
      registrationCodeHash: hash,
      registrationCodeEnc: enc,
      ...overrides,
    })
    .returning()
    .get();
  getDb()
    .insert(finishLayers)
    .values({ studioId: studio.id, pieceId: piece.id, surface: "top", position: 0, finishClass: "hardwax_oil", coats: 2, appliedOn: piece.deliveredOn })
    .run();
  return { piece, code };
}

/** An accepted claim, as the triage desk leaves it, for repair-job tests. */
export function createAcceptedClaim(studio: Studio, pieceId: string, ownerId: string, decision: "covered" | "partly_covered" | "chargeable", coveredPct?: number) {
  return getDb()
    .insert(claims)
    .values({
      studioId: studio.id,
      pieceId,
      ownerId,
      category: "finish_wear",
      noticedOn: "2026-10-01",
      description: "Rings from a vase (invented test claim).",
      answers: {},
      state: "accepted",
      decision,
      coveredPct: decision === "covered" ? 100 : decision === "partly_covered" ? (coveredPct ?? 50) : 0,
      decidedAt: new Date(),
    })
    .returning()
    .get();
}

export function createProduct(studio: Studio, overrides: Partial<typeof finishProducts.$inferInsert> = {}) {
  return getDb()
    .insert(finishProducts)
    .values({ studioId: studio.id, name: "Test hardwax oil (invented)", finishClass: "hardwax_oil", coverageM2PerL: 24, containers: [{ ml: 125, priceMinor: 1900 }], ...overrides })
    .returning()
    .get();
}

/** A care plan template's form values, as POST /api/plans parses them: a yearly re-oiling plan for oiled dining tables unless overridden. */
export function planTemplateInput(overrides: Record<string, unknown> = {}) {
  return planTemplateSchema.parse({
    name: "Finish keeping (invented)",
    included: { tasks: ["reoil"], visitsPerYear: 1, visitSharePct: 0, extendedLines: [], repairDiscountPct: 0 },
    fits: { finishClasses: ["hardwax_oil"], pieceKinds: ["dining_table"], minTopAreaM2: 0.5, maxTopAreaM2: 4 },
    priceMinor: 15_190,
    interval: "year",
    ...overrides,
  });
}
