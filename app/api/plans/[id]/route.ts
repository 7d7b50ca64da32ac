import { z } from "zod";
import { route } from "@/lib/http/route";
import { updateTemplate } from "@/lib/plans/templates";
import { planTemplateSchema } from "@/lib/plans/validation";

const params = z.object({ id: z.string().min(1).max(64) });

// A change to a plan template is its next version; plans bought under the old one keep it.
export const PUT = route({ roles: ["admin"], params, body: planTemplateSchema, bodyLimit: 16_384 }, ({ actor, params, body }) => ({ plan: updateTemplate(actor, params.id, body) }));
