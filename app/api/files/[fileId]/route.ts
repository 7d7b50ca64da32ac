import { z } from "zod";
import { getFileForViewer } from "@/lib/files/access";
import { route } from "@/lib/http/route";

export const dynamic = "force-dynamic";

const params = z.object({ fileId: z.string().min(1).max(64) });
const query = z.object({ thumb: z.string().optional() });

/** A stored image (`?thumb=1`: its thumbnail) for a viewer allowed to see it; 404 for anyone else. */
export const GET = route({ roles: ["owner", "admin", "staff", "technician"], params, query }, async ({ actor, params, query }) => {
  const thumb = query.thumb === "1";
  const file = await getFileForViewer(actor.user.id, params.fileId, { thumb });
  return new Response(new Uint8Array(file.data), {
    headers: {
      "Content-Type": file.contentType,
      "Content-Length": String(file.data.byteLength),
      "Cache-Control": "private, max-age=3600",
      "X-Content-Type-Options": "nosniff",
      "Content-Disposition": `inline; filename="${params.fileId}${thumb ? "-thumb" : ""}.jpg"`,
      ETag: file.etag,
      Vary: "Cookie",
    },
  });
});
