import { NextResponse } from "next/server";
import { z } from "zod";
import { requireUser } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { deleteCareLogEntry, updateCareLogEntry } from "@/lib/owner/care-log";

type Params = { id: string; entryId: string };

export const PATCH = route<Params>(async (req, { params }) => {
  const user = await requireUser();
  const body = await parseJson(req, z.unknown());
  return NextResponse.json(await updateCareLogEntry(user, params.id, params.entryId, body));
});

export const DELETE = route<Params>(async (_req, { params }) => {
  const user = await requireUser();
  return NextResponse.json(await deleteCareLogEntry(user, params.id, params.entryId));
});
