import { NextResponse } from "next/server";
import { createClaim } from "@/lib/claims/file-claim";
import { listOwnerClaims, listStudioClaims } from "@/lib/claims/list";
import { currentViewer } from "@/lib/claims/viewer";
import { parseJson, parseQuery, route } from "@/lib/http/route";
import { claimListQuerySchema, createClaimSchema } from "@/lib/validation/claims";

export const dynamic = "force-dynamic";

/** Staff: the studio's queue with filters (state, category, age, pieceId, sort). Owners: their own claims. */
export const GET = route(async (req) => {
  const viewer = await currentViewer();
  if (viewer.staff) return NextResponse.json(listStudioClaims(viewer.staff, parseQuery(req, claimListQuerySchema)));
  return NextResponse.json({ claims: listOwnerClaims(viewer.user) });
});

export const POST = route(async (req) => {
  const viewer = await currentViewer();
  const claim = await createClaim(viewer, await parseJson(req, createClaimSchema));
  return NextResponse.json({ claim }, { status: 201 });
});
