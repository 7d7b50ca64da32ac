import { route } from "@/lib/http/route";
import { reissueRegistrationCode } from "@/lib/pieces/registry";
import { idParam } from "@/lib/validation/pieces";

/** Reissues the piece's registration code; the old code stops working at once (the answer is never stored: private, no-store). */
export const POST = route({ roles: ["admin", "staff"], params: idParam }, ({ actor, params }) => reissueRegistrationCode(actor, params.id));
