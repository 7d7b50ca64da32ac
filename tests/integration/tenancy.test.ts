// Studio scoping of the live queries behind the registry, the piece page, the overview and the
// owner's list: another studio's piece is a 404 and never turns up in a list, a search or a count;
// the outbox shows a studio only its own mail.
import { describe, expect, it } from "vitest";
import { requestPasswordReset } from "@/lib/auth/accounts";
import { AppError } from "@/lib/errors";
import { listOutbox } from "@/lib/mail/outbox";
import { getOverview } from "@/lib/overview";
import { getMyPiece, listMyPieces } from "@/lib/owner/pieces";
import { releasePiece } from "@/lib/owner/transfer";
import { createPiece as recordPiece, getPieceDetail, listPieces } from "@/lib/pieces/registry";
import { createPieceSchema, pieceListQuerySchema } from "@/lib/validation/pieces";
import { createPiece, createStudio, createUser, memberContext } from "../support/fixtures";
import { waitForMail } from "../support/mail";

function statusOf(fn: () => unknown): number | "ok" {
  try {
    fn();
    return "ok";
  } catch (e) {
    if (e instanceof AppError) return e.status;
    throw e;
  }
}

// A fixed instant: the pieces are delivered in 2025, the overview counts every delivered piece.
const NOW = new Date("2026-03-02T12:00:00Z");

describe("studio scoping", () => {
  it("staff of one studio cannot read another studio's piece by id, find it by title or code, or count it", async () => {
    const a = createStudio({ name: "Studio A (invented)" });
    const b = createStudio({ name: "Studio B (invented)" });
    const staffA = await memberContext(a, "staff");
    const staffB = await memberContext(b, "staff");
    // Recorded the way staff record a piece, so it is in the search index too.
    const record = (ctx: typeof staffA, title: string) =>
      recordPiece(ctx, createPieceSchema.parse({ kind: "console", title, shapeKind: "rectangle", lengthMm: 1800, widthMm: 450, primarySpeciesId: "black_cherry", use: "moderate", deliveredOn: "2025-02-01", layers: [{ surface: "top", finishClass: "paste_wax", coats: 2, appliedOn: "2025-01-30" }] }));
    const { piece, registrationCode: code } = record(staffA, "Quillfern sideboard (invented)");
    record(staffB, "Studio B bench (invented)");

    expect(getPieceDetail(staffA, piece.id, NOW).piece.id).toBe(piece.id);
    expect(statusOf(() => getPieceDetail(staffB, piece.id, NOW))).toBe(404);

    // The registry: the plain list, the full-text search, the typed registration code.
    for (const q of ["", "Quillfern", code]) {
      expect(listPieces(staffA, pieceListQuerySchema.parse({ q }), NOW).rows.map((r) => r.id)).toContain(piece.id);
      expect(listPieces(staffB, pieceListQuerySchema.parse({ q }), NOW).rows.map((r) => r.id)).not.toContain(piece.id);
    }
    expect(listPieces(staffB, pieceListQuerySchema.parse({ q: "Quillfern" }), NOW).total).toBe(0);

    expect(getOverview(staffA, NOW).pieces.delivered).toBe(1);
    expect(getOverview(staffB, NOW).pieces.delivered).toBe(1);
  });

  it("never hands out the registration code's hash or sealed copy with a piece", async () => {
    const a = createStudio();
    const { piece, code } = createPiece(a);
    const staff = await memberContext(a, "admin");
    const read = JSON.stringify(getPieceDetail(staff, piece.id, NOW));
    expect(read).not.toContain(piece.registrationCodeHash);
    expect(read).not.toContain(piece.registrationCodeEnc);
    expect(read).not.toContain(code);
    const listed = JSON.stringify(listPieces(staff, pieceListQuerySchema.parse({}), NOW));
    expect(listed).not.toContain(piece.registrationCodeHash);
    expect(listed).not.toContain(code);
  });

  it("an owner sees only their own pieces, from every studio; another owner's piece is a 404", async () => {
    const a = createStudio();
    const b = createStudio();
    const owner = await createUser({ timeZone: "UTC" });
    const other = await createUser({ timeZone: "UTC" });
    const mine1 = createPiece(a, { ownerId: owner.id }).piece;
    const mine2 = createPiece(b, { ownerId: owner.id }).piece;
    const theirs = createPiece(a, { ownerId: other.id }).piece;
    const ids = listMyPieces(owner, NOW).map((p) => p.id).sort();
    expect(ids).toEqual([mine1.id, mine2.id].sort());
    expect(statusOf(() => getMyPiece(owner, mine1.id, NOW))).toBe("ok");
    expect(statusOf(() => getMyPiece(owner, theirs.id, NOW))).toBe(404);
  });
});

describe("the development outbox", () => {
  it("shows a studio's admins only their own studio's mail, and never an account's reset or confirmation link", async () => {
    const a = createStudio({ name: "Studio A (invented)" });
    const b = createStudio({ name: "Studio B (invented)" });
    const adminA = await memberContext(a, "admin");
    const adminB = await memberContext(b, "admin");
    const staffA = await memberContext(a, "staff");
    const owner = await createUser({ timeZone: "UTC" });
    const { piece } = createPiece(a, { ownerId: owner.id });

    // Studio mail: the piece's release sends the owner a fresh code and tells the studio's admins.
    await releasePiece(owner, piece.id, { confirm: true });
    await waitForMail({ to: owner.email, subject: /code/i });
    // Account mail: a password reset for studio A's staff member (its link hands over the account).
    await requestPasswordReset({ email: staffA.user.email }, "203.0.113.7");
    const reset = await waitForMail({ to: staffA.user.email, subject: /reset/i });
    expect(reset.text).toContain("/reset-password?token=");

    const seenByA = (await listOutbox(adminA)).messages;
    const seenByB = (await listOutbox(adminB)).messages;
    expect(seenByA.map((m) => m.to).flat()).toContain(owner.email);
    expect(seenByA.map((m) => m.to).flat()).toContain(adminA.user.email);
    // Another studio's admin sees none of it, and nobody sees the reset link.
    expect(seenByB.filter((m) => [owner.email, staffA.user.email, adminA.user.email].some((e) => m.to.includes(e)))).toEqual([]);
    for (const m of [...seenByA, ...seenByB]) {
      expect(m.to).not.toContain(staffA.user.email);
      expect(`${m.text}${m.html}`).not.toMatch(/reset-password|verify-email/);
    }
  });
});
