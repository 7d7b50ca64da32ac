import { route } from "@/lib/http/route";
import { resolveUnmatched } from "@/lib/messages/service";
import { threadIdParam } from "@/lib/validation/messages";

/** Staff set aside an e-mail that matched no conversation, once dealt with (it stays on record). */
export const POST = route({ roles: ["admin", "staff"], params: threadIdParam }, ({ actor, params }) => {
  resolveUnmatched(actor, params.id);
  return { ok: true };
});
