import { route } from "@/lib/http/route";
import { addCareLogEntry } from "@/lib/owner/care-log";
import { readCareLogBody } from "@/lib/owner/http";
import { careLogSchema } from "@/lib/validation/owner";
import { idParam } from "@/lib/validation/pieces";
import { inWords } from "@/lib/validation/words";

// JSON { taskKind, surface, doneOn, productUsed?, notes? }, or the same as multipart with an optional `photo`;
// the fields are parsed here with careLogSchema (route()'s `body` reads JSON only).
export const POST = route({ roles: ["owner"], params: idParam, status: 201 }, async ({ req, actor, params }) => {
  const { fields, photo } = await readCareLogBody(req);
  return addCareLogEntry(actor.user, params.id, careLogSchema.parse(fields, { error: inWords }), photo);
});
