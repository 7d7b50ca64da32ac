"use server";

import { action } from "@/lib/http/action";
import { releasePiece } from "@/lib/owner/transfer";
import { releaseSchema } from "@/lib/validation/owner";

export async function releaseAction(pieceId: string, input: unknown) {
  return action({ roles: ["owner"], schema: releaseSchema }, async (values, actor) => {
    const { code, pieceId: id } = await releasePiece(actor.user, pieceId, values);
    return { code, pieceId: id };
  })(input as never);
}
