// Shared set-up for the visit tests: a studio in America/New_York with a technician, hours, an owner
// and a paid (or covered) repair job on their piece. Invented, like all test data.
import type { User } from "lucia";
import { ZodError } from "zod";
import { getDb } from "@/db/client";
import { repairJobs, users, type Studio } from "@/db/schema";
import { ownerActor as ownerOf, type Actor } from "@/lib/auth/actor";
import type { StudioContext } from "@/lib/auth/guards";
import type { CareTaskKind } from "@/lib/care/vocabulary";
import { AppError } from "@/lib/errors";
import { putTechnicianHours } from "@/lib/visits/technicians";
import { visitReportSchema, type VisitReportInput } from "@/lib/validation/visits";
import { createPiece, createProduct, createStudio, createUser, memberContext } from "../support/fixtures";

export function luciaUser(u: typeof users.$inferSelect): User {
  return { id: u.id, email: u.email, name: u.name, emailVerifiedAt: u.emailVerifiedAt, timeZone: u.timeZone, unitSystem: u.unitSystem, remindersEnabled: u.remindersEnabled };
}

/** The request's Actor (lib/auth/actor.ts) as the visit routes pass it: a member acts in their role. */
export const staffActor = (ctx: StudioContext): Actor => ctx;
export const techActor = (ctx: StudioContext): Actor => ctx;
export const ownerActor = (u: User): Actor => ownerOf(u);

export const WEEKDAYS_9_TO_5 = [1, 2, 3, 4, 5].map((weekday) => ({ weekday, start: "09:00", end: "17:00" }));

export function addJob(studio: Studio, pieceId: string, ownerId: string, productId: string, state: "paid" | "covered" = "paid", tasks: CareTaskKind[] = ["reoil"]) {
  return getDb()
    .insert(repairJobs)
    .values({
      studioId: studio.id,
      pieceId,
      ownerId,
      origin: "studio",
      title: "Re-oil the top (invented test job)",
      quoteInput: { title: "Re-oil the top", tasks, productIds: [productId], coats: 1, travel: true, coveredPct: state === "covered" ? 100 : 0, notes: "" },
      lines: [],
      currency: "USD",
      state,
      paidAt: state === "paid" ? new Date() : null,
    })
    .returning()
    .get();
}

export async function visitWorld(opts: { timeZone?: string; state?: "paid" | "covered"; hours?: { weekday: number; start: string; end: string }[] } = {}) {
  const studio = createStudio({ timeZone: opts.timeZone ?? "America/New_York", address: "2 Workshop Row, Testville (invented)", email: "shop@test-studio.example" });
  const staff = await memberContext(studio, "staff");
  const tech = await memberContext(studio, "technician");
  const ownerRow = await createUser({ name: "Test Owner (invented)" });
  const owner = luciaUser(ownerRow);
  const { piece } = createPiece(studio, { ownerId: owner.id, deliveryAddress: "5 Test Road, Testville (invented)" });
  const product = createProduct(studio);
  const job = addJob(studio, piece.id, owner.id, product.id, opts.state ?? "paid");
  putTechnicianHours(staff, tech.user.id, { hours: opts.hours ?? WEEKDAYS_9_TO_5, timeOff: [] });
  return { studio, staff, tech, owner, piece, product, job };
}

/** The HTTP status a call ends in: 200, an AppError's status, or 400 for a ZodError (what lib/http/route answers for it). */
export async function statusOf(p: Promise<unknown> | (() => unknown)): Promise<number> {
  try {
    await (typeof p === "function" ? p() : p);
    return 200;
  } catch (e) {
    if (e instanceof AppError) return e.status;
    if (e instanceof ZodError) return 400;
    throw e;
  }
}

/** A visit report as POST /api/visits/[id]/report parses it (defaults filled, unknown fields dropped), for submitReport. */
export function reportInput(body: VisitReportInput & Record<string, unknown>) {
  return visitReportSchema.parse(body);
}
