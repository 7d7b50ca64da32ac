import { NextResponse } from "next/server";
import { z } from "zod";
import { requireUser } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { getPreferences, updatePreferences } from "@/lib/owner/preferences";

export const GET = route(async () => {
  const user = await requireUser();
  return NextResponse.json({ preferences: getPreferences(user) });
});

export const PATCH = route(async (req) => {
  const user = await requireUser();
  const body = await parseJson(req, z.unknown());
  return NextResponse.json({ preferences: updatePreferences(user, body) });
});
