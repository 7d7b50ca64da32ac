import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { createPiece, listPieces } from "@/lib/pieces/registry";
import { createPieceSchema } from "@/lib/validation/pieces";

export const GET = route(async (req) => {
  const ctx = await requireStaff();
  return NextResponse.json(listPieces(ctx, Object.fromEntries(req.nextUrl.searchParams)));
});

export const POST = route(async (req) => {
  const ctx = await requireStaff();
  const body = await parseJson(req, createPieceSchema);
  return NextResponse.json(createPiece(ctx, body), { status: 201 });
});
