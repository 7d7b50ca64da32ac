import { z } from "zod";
import { requireStaff } from "@/lib/auth/guards";
import { parseQuery, route } from "@/lib/http/route";
import { renderDrawerCard } from "@/lib/pieces/card";
import { idParam } from "@/lib/validation/pieces";

const query = z.object({ size: z.enum(["4x6", "a6"]).default("4x6"), download: z.enum(["1", "0"]).optional() });

export const GET = route<{ id: string }>(async (req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const { size, download } = parseQuery(req, query);
  const { pdf, filename } = await renderDrawerCard(await requireStaff(), id, size);
  return new Response(new Uint8Array(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `${download === "1" ? "attachment" : "inline"}; filename="${filename}"`,
      "Cache-Control": "private, no-store",
    },
  });
});
