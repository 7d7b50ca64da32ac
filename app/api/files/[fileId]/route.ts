import { z } from "zod";
import { requireUser } from "@/lib/auth/guards";
import { getFileForViewer } from "@/lib/files/access";
import { route } from "@/lib/http/route";

export const dynamic = "force-dynamic";

const params = z.object({ fileId: z.string().min(1).max(64) });

/** A stored image (`?thumb=1`: its thumbnail) for a viewer allowed to see it; 404 for anyone else. */
export const GET = route<{ fileId: string }>(async (req, ctx) => {
  const { fileId } = params.parse(ctx.params);
  const user = await requireUser();
  const thumb = req.nextUrl.searchParams.get("thumb") === "1";
  const file = await getFileForViewer(user.id, fileId, { thumb });
  return new Response(new Uint8Array(file.data), {
    headers: {
      "Content-Type": file.contentType,
      "Content-Length": String(file.data.byteLength),
      "Cache-Control": "private, max-age=3600",
      "X-Content-Type-Options": "nosniff",
      "Content-Disposition": `inline; filename="${fileId}${thumb ? "-thumb" : ""}.jpg"`,
      ETag: file.etag,
      Vary: "Cookie",
    },
  });
});
