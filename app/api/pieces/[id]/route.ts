import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { deletePiece, getPieceDetail, updatePiece } from "@/lib/pieces/registry";
import { idParam, piecePatchSchema } from "@/lib/validation/pieces";

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  return NextResponse.json(getPieceDetail(await requireStaff(), id));
});

export const PATCH = route<{ id: string }>(async (req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const studio = await requireStaff();
  const body = await parseJson(req, piecePatchSchema);
  return NextResponse.json({ piece: updatePiece(studio, id, body) });
});

export const DELETE = route<{ id: string }>(async (_req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  return NextResponse.json(await deletePiece(await requireStaff(), id));
});
