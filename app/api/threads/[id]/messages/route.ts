import { z } from "zod";
import { route } from "@/lib/http/route";
import { replyToThread } from "@/lib/messages/service";
import { threadIdParam } from "@/lib/validation/messages";

/** A staff reply on the thread, `{ body }` (parsed by lib/messages); the owner is mailed with the thread's Reply-To. */
export const POST = route({ roles: ["admin", "staff"], params: threadIdParam, body: z.unknown(), bodyLimit: 64 * 1024, status: 201 }, ({ actor, params, body }) =>
  replyToThread(actor, params.id, body),
);
