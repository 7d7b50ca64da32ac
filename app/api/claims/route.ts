import { NextResponse } from "next/server";
import { z } from "zod";
import { createClaim, listOwnerClaims, listStudioClaims } from "@/lib/claims/service";
import { currentViewer } from "@/lib/claims/viewer";
import { parseJson, route } from "@/lib/http/route";

export const dynamic = "force-dynamic";

/** Staff: the studio's queue with filters (state, category, age, pieceId, sort). Owners: their own claims. */
export const GET = route(async (req) => {
  const viewer = await currentViewer();
  if (viewer.staff) return NextResponse.json(listStudioClaims(viewer.staff, Object.fromEntries(req.nextUrl.searchParams)));
  return NextResponse.json({ claims: listOwnerClaims(viewer.user) });
});

export const POST = route(async (req) => {
  const viewer = await currentViewer();
  const claim = await createClaim(viewer, await parseJson(req, z.unknown()));
  return NextResponse.json({ claim }, { status: 201 });
});
