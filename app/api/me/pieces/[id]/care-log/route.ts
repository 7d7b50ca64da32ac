import { NextResponse } from "next/server";
import { requireUser } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { addCareLogEntry } from "@/lib/owner/care-log";
import { readCareLogBody } from "@/lib/owner/http";

// JSON { taskKind, surface, doneOn, productUsed?, notes? }, or the same as multipart with an optional `photo`.
export const POST = route<{ id: string }>(async (req, { params }) => {
  const user = await requireUser();
  const { fields, photo } = await readCareLogBody(req);
  return NextResponse.json(await addCareLogEntry(user, params.id, fields, photo), { status: 201 });
});
