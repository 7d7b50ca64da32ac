import { z } from "zod";
import { removeClaimPhoto } from "@/lib/claims/photos";
import { route } from "@/lib/http/route";

const params = z.object({ id: z.string().min(1).max(64), fileId: z.string().min(1).max(64) });

export const DELETE = route({ roles: ["admin", "staff", "owner"], params }, async ({ actor, params }) => {
  await removeClaimPhoto(actor, params.id, params.fileId);
  return { ok: true };
});
