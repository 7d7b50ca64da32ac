import { NextResponse } from "next/server";
import { requireAdmin } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { createPolicyVersion, listPolicyVersions } from "@/lib/settings";
import { policyVersionSchema } from "@/lib/validation/settings";

/** Warranty policy versions, newest first (admins). */
export const GET = route(async () => {
  const ctx = await requireAdmin();
  return NextResponse.json({ versions: listPolicyVersions(ctx) });
});

/** A new version effective from a date; earlier versions and the pieces stamped with them stay as they are. */
export const POST = route(async (req) => {
  const ctx = await requireAdmin();
  const body = await parseJson(req, policyVersionSchema);
  const row = createPolicyVersion(ctx, body);
  return NextResponse.json({ id: row.id, version: row.version, effectiveFrom: row.effectiveFrom }, { status: 201 });
});
