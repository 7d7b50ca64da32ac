import { route } from "@/lib/http/route";
import { listInbox, ownerSubject, postOwnerMessage } from "@/lib/messages/service";
import { inboxQuerySchema, messageFormSchema, messageSubjectSchema } from "@/lib/validation/messages";

export const dynamic = "force-dynamic";

/** The studio's inbox: `?view=waiting|mine|all|done|unmatched` (staff). */
export const GET = route({ roles: ["admin", "staff"], query: inboxQuerySchema }, ({ actor, query }) => listInbox(actor, query));

/**
 * An owner writes about a claim, repair job or visit of theirs: `?about=claim|job|visit&id=…`, body `{ body }`.
 * What it is about is found before the body is read: someone else's is a 404 whatever was sent.
 */
export const POST = route(
  { roles: ["owner"], query: messageSubjectSchema, load: ({ actor, query }) => ownerSubject(actor.user, query), body: messageFormSchema, bodyLimit: 64 * 1024, status: 201 },
  ({ actor, loaded, body }) => postOwnerMessage(actor.user, loaded, body),
);
