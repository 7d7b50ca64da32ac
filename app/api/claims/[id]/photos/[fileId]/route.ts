import { NextResponse } from "next/server";
import { z } from "zod";
import { removeClaimPhoto } from "@/lib/claims/photos";
import { currentViewer } from "@/lib/claims/viewer";
import { route } from "@/lib/http/route";

const params = z.object({ id: z.string().min(1).max(64), fileId: z.string().min(1).max(64) });

export const DELETE = route<{ id: string; fileId: string }>(async (_req, ctx) => {
  const { id, fileId } = params.parse(ctx.params);
  await removeClaimPhoto(await currentViewer(), id, fileId);
  return NextResponse.json({ ok: true });
});
