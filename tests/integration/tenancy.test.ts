// Studio scoping of the lib/ queries: another studio's piece is a 404, never a leak; the outbox shows
// a studio only its own mail.
import { describe, expect, it } from "vitest";
import { requestPasswordReset } from "@/lib/auth/accounts";
import { AppError } from "@/lib/errors";
import { listOutbox } from "@/lib/mail/outbox";
import { releasePiece } from "@/lib/owner/transfer";
import { getStudioPiece, listOwnerPieces, listStudioPieces, studioCounts } from "@/lib/pieces/queries";
import { createPiece, createStudio, createUser, memberContext } from "../support/fixtures";
import { waitForMail } from "../support/mail";

describe("studio scoping", () => {
  it("staff of one studio cannot read another studio's piece by id", async () => {
    const a = createStudio({ name: "Studio A (invented)" });
    const b = createStudio({ name: "Studio B (invented)" });
    const { piece } = createPiece(a);
    const staffA = await memberContext(a, "staff");
    const staffB = await memberContext(b, "staff");

    expect(getStudioPiece(staffA, piece.id).id).toBe(piece.id);
    let caught: unknown;
    try {
      getStudioPiece(staffB, piece.id);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(AppError);
    expect((caught as AppError).status).toBe(404);

    expect(listStudioPieces(staffB).map((p) => p.id)).not.toContain(piece.id);
    expect(studioCounts(staffB).delivered).toBe(0);
    expect(studioCounts(staffA).delivered).toBe(1);
  });

  it("never hands out the registration code's hash or sealed copy with a piece", async () => {
    const a = createStudio();
    const { piece, code } = createPiece(a);
    const staff = await memberContext(a, "admin");
    const read = getStudioPiece(staff, piece.id);
    expect(JSON.stringify(read)).not.toContain(piece.registrationCodeHash);
    expect(JSON.stringify(read)).not.toContain(code);
    expect(read).not.toHaveProperty("registrationCodeEnc");
  });

  it("an owner sees only their own pieces, from every studio", async () => {
    const a = createStudio();
    const b = createStudio();
    const owner = await createUser();
    const other = await createUser();
    const mine1 = createPiece(a, { ownerId: owner.id }).piece;
    const mine2 = createPiece(b, { ownerId: owner.id }).piece;
    createPiece(a, { ownerId: other.id });
    const ids = listOwnerPieces({ id: owner.id } as never).map((p) => p.id).sort();
    expect(ids).toEqual([mine1.id, mine2.id].sort());
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
