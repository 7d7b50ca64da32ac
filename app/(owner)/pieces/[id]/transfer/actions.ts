"use server";

import { requireUser } from "@/lib/auth/guards";
import { releasePiece } from "@/lib/owner/transfer";
import { validatedAction } from "@/lib/validation/action";
import { releaseSchema } from "@/lib/validation/owner";

export async function releaseAction(pieceId: string, input: unknown) {
  return validatedAction(releaseSchema, async (values) => {
    const { code, pieceId: id } = await releasePiece(await requireUser(), pieceId, values);
    return { code, pieceId: id };
  })(input as never);
}
