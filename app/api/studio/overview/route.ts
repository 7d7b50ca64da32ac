import { route } from "@/lib/http/route";
import { getOverview } from "@/lib/overview";

/** The overview's figures as JSON (the same object the /studio page renders). */
export const GET = route({ roles: ["admin", "staff"] }, ({ actor }) => getOverview(actor));
