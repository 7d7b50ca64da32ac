import { route } from "@/lib/http/route";
import { replyToThread, studioThread } from "@/lib/messages/service";
import { messageFormSchema, threadIdParam } from "@/lib/validation/messages";

/** A staff reply on the thread, `{ body }`; another studio's thread is a 404 whatever was sent. The owner is mailed with the thread's Reply-To. */
export const POST = route(
  { roles: ["admin", "staff"], params: threadIdParam, load: ({ actor, params }) => studioThread(actor, params.id), body: messageFormSchema, bodyLimit: 64 * 1024, status: 201 },
  ({ actor, loaded, body }) => replyToThread(actor, loaded, body),
);
