import { z } from "zod";
import { route } from "@/lib/http/route";
import { notFound } from "@/lib/errors";
import { studioLogo } from "@/lib/studio/setup-steps";

export const dynamic = "force-dynamic";

const params = z.object({ studioId: z.string().min(1).max(64) });

/** GET /api/studio-logo/[studioId]: a studio's logo, public (it is on its e-mails and owners' pages); 404 without one. */
export const GET = route({ params }, async ({ params }) => {
  const data = await studioLogo(params.studioId);
  if (!data) throw notFound("This studio has no logo.");
  return new Response(new Uint8Array(data), {
    headers: { "Content-Type": "image/jpeg", "Content-Length": String(data.byteLength), "X-Content-Type-Options": "nosniff", "Content-Disposition": "inline", "Cache-Control": "public, max-age=86400" },
  });
});
