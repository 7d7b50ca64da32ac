import { route } from "@/lib/http/route";
import { addCareLogEntry } from "@/lib/owner/care-log";
import { readCareLogBody } from "@/lib/owner/http";
import { idParam } from "@/lib/validation/pieces";

// JSON { taskKind, surface, doneOn, productUsed?, notes? }, or the same as multipart with an optional `photo`.
export const POST = route({ roles: ["owner"], params: idParam, status: 201 }, async ({ req, actor, params }) => {
  const { fields, photo } = await readCareLogBody(req);
  return addCareLogEntry(actor.user, params.id, fields, photo);
});
