// The owner's piece page reads its studio brand and three "anything here?" flags in one query
// (lib/owner/pieces.ts ownedPieceShell) and skips the full queries of the sections whose flag is off:
// conversations, visit photos, care plans. Each flag must turn on as soon as its section could show
// something, else the page would hide a real conversation, photo or plan. Real SQLite file; invented
// studios, owners and pieces.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { pieces, repairJobs, threads, visits } from "@/db/schema";
import { ownerConversations } from "@/lib/messages/service";
import { ownedPieceShell } from "@/lib/owner/pieces";
import { createTemplate } from "@/lib/plans/templates";
import { plansForMyPiece } from "@/lib/plans/offers";
import { planTemplateSchema } from "@/lib/plans/validation";
import { studioBrand } from "@/lib/studio/brand-query";
import { createAcceptedClaim, createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";

const NOW = new Date("2026-03-15T18:00:00Z");

async function ownedPiece() {
  const studio = createStudio({ name: "Shell Studio (invented)", accent: "default" });
  const me = await createUser({ emailVerifiedAt: new Date() });
  const { piece } = createPiece(studio, { ownerId: me.id, registeredAt: new Date("2025-06-10T12:00:00Z") });
  return { studio, me, piece };
}

describe("the piece page's shell read", () => {
  it("gives the studio's brand and no flags for a piece with nothing else; someone else's or an archived piece gives null", async () => {
    const { studio, me, piece } = await ownedPiece();
    const shell = ownedPieceShell(me, piece.id);
    expect(shell).toEqual({ brand: studioBrand(studio.id), has: { conversations: false, visits: false, plans: false } });
    // What the skipped sections would have shown: nothing.
    expect(ownerConversations(me, { pieceId: piece.id })).toEqual([]);
    expect(plansForMyPiece(me, piece.id, NOW)).toMatchObject({ current: null, offers: [] });

    const stranger = await createUser();
    expect(ownedPieceShell(stranger, piece.id)).toBeNull();
    expect(ownedPieceShell(me, "no-such-piece")).toBeNull();
    getDb().update(pieces).set({ archivedAt: new Date() }).where(eq(pieces.id, piece.id)).run();
    expect(ownedPieceShell(me, piece.id)).toBeNull();
  });

  it("turns on the conversations flag when the piece gets a thread, and the section then has it", async () => {
    const { studio, me, piece } = await ownedPiece();
    const claim = createAcceptedClaim(studio, piece.id, me.id, "covered");
    getDb().insert(threads).values({ studioId: studio.id, subject: "claim", claimId: claim.id, pieceId: piece.id, ownerId: me.id, lastMessageAt: NOW }).run();
    expect(ownedPieceShell(me, piece.id)?.has).toEqual({ conversations: true, visits: false, plans: false });
    expect(ownerConversations(me, { pieceId: piece.id })).toHaveLength(1);
  });

  it("turns on the visits flag when a studio visit is booked for the piece", async () => {
    const { studio, me, piece } = await ownedPiece();
    const staff = await memberContext(studio, "staff");
    const job = getDb()
      .insert(repairJobs)
      .values({ studioId: studio.id, pieceId: piece.id, ownerId: me.id, origin: "studio", state: "paid", title: "Re-oil the top (invented)", quoteInput: {}, lines: [], currency: "USD", totalMinor: 9_000 })
      .returning()
      .get();
    getDb().insert(visits).values({ studioId: studio.id, jobId: job.id, pieceId: piece.id, technicianId: staff.user.id, startAt: NOW, endAt: NOW, locationKind: "owner", location: "1 Invented Lane", icsUid: unique("uid"), state: "booked", jobStateBefore: "paid" }).run();
    expect(ownedPieceShell(me, piece.id)?.has).toEqual({ conversations: false, visits: true, plans: false });
  });

  it("turns on the plans flag when the studio has a plan template (the section decides whether it fits)", async () => {
    const { studio, me, piece } = await ownedPiece();
    const admin = await memberContext(studio, "admin");
    createTemplate(
      admin,
      planTemplateSchema.parse({
        name: "Oil keeping (invented)",
        included: { tasks: ["reoil"], visitsPerYear: 1, visitSharePct: 0, extendedLines: [], repairDiscountPct: 0 },
        fits: { finishClasses: [], pieceKinds: [], minTopAreaM2: null, maxTopAreaM2: null },
        priceMinor: 9_900,
        interval: "year",
      }),
    );
    expect(ownedPieceShell(me, piece.id)?.has).toEqual({ conversations: false, visits: false, plans: true });
    expect(plansForMyPiece(me, piece.id, NOW).offers.map((o) => o.name)).toEqual(["Oil keeping (invented)"]);
  });
});
