// Studio scoping of the lib/ queries: another studio's piece is a 404, never a leak.
import { describe, expect, it } from "vitest";
import { AppError } from "@/lib/errors";
import { getStudioPiece, listOwnerPieces, listStudioPieces, studioCounts } from "@/lib/pieces/queries";
import { createPiece, createStudio, createUser, memberContext } from "../support/fixtures";

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
