import { NextResponse } from "next/server";
import { z } from "zod";
import { requireStaff } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { getThread, updateThread } from "@/lib/messages/service";
import { threadIdParam } from "@/lib/validation/messages";

export const dynamic = "force-dynamic";

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const { id } = threadIdParam.parse(ctx.params);
  return NextResponse.json(getThread(await requireStaff(), id));
});

/** `{ assignedToId?, state? }`: assign to a staff member (null: nobody), mark done or open again. */
export const PATCH = route<{ id: string }>(async (req, ctx) => {
  const { id } = threadIdParam.parse(ctx.params);
  const studio = await requireStaff();
  return NextResponse.json(updateThread(studio, id, await parseJson(req, z.unknown())));
});
