import { z } from "zod";
import { route } from "@/lib/http/route";
import { renderDrawerCard } from "@/lib/pieces/card";
import { idParam } from "@/lib/validation/pieces";

const query = z.object({ size: z.enum(["4x6", "a6"]).default("4x6"), download: z.enum(["1", "0"]).optional() });

export const GET = route({ roles: ["admin", "staff"], params: idParam, query }, async ({ actor, params, query }) => {
  const { pdf, filename } = await renderDrawerCard(actor, params.id, query.size);
  return new Response(new Uint8Array(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `${query.download === "1" ? "attachment" : "inline"}; filename="${filename}"`,
      "Cache-Control": "private, no-store",
    },
  });
});
