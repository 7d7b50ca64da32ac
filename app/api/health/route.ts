import { checkHealth } from "@/lib/health";
import { route } from "@/lib/http/route";

export const dynamic = "force-dynamic";

export const GET = route({}, () => checkHealth());
