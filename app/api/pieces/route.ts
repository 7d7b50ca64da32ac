import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { deliverPiece } from "@/lib/pieces/handover-delivery";
import { listPieces } from "@/lib/pieces/registry";
import { deliverPieceSchema } from "@/lib/validation/clients";

export const GET = route(async (req) => {
  const ctx = await requireStaff();
  return NextResponse.json(listPieces(ctx, Object.fromEntries(req.nextUrl.searchParams)));
});

export const POST = route(async (req) => {
  const ctx = await requireStaff();
  const body = await parseJson(req, deliverPieceSchema);
  return NextResponse.json(await deliverPiece(ctx, body), { status: 201 });
});
