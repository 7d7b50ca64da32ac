import { z } from "zod";
import { route } from "@/lib/http/route";
import { CARD_LAYOUTS, MAX_CARDS_PER_PDF, renderDrawerCards } from "@/lib/pieces/card";

// GET /api/pieces/cards?ids=a,b,c&layout=letter  or  ?all=unregistered&layout=4x6
// One PDF of drawer cards for the studio's staff: the chosen pieces (at most 200; an id that is not one
// of the studio's pieces is a 404 and nothing is printed) or every piece not yet registered.
const query = z
  .object({
    ids: z
      .string()
      .max(MAX_CARDS_PER_PDF * 65)
      .transform((s) => s.split(",").map((x) => x.trim()).filter(Boolean))
      .pipe(z.array(z.string().min(1).max(64)).max(MAX_CARDS_PER_PDF, `Print at most ${MAX_CARDS_PER_PDF} cards at a time.`))
      .optional(),
    all: z.literal("unregistered").optional(),
    layout: z.enum(CARD_LAYOUTS, { message: "Choose Letter or A4 sheets, or 4×6 in or A6 cards." }).default("letter"),
    download: z.enum(["1", "0"]).optional(),
  })
  .refine((q) => !!q.ids?.length !== !!q.all, { message: "Choose some pieces, or all pieces not yet registered." });

export const GET = route({ roles: ["admin", "staff"], query }, async ({ actor, query: q }) => {
  const { pdf, filename } = await renderDrawerCards(actor, q.all ? { unregistered: true } : { ids: q.ids! }, q.layout);
  return new Response(new Uint8Array(pdf), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `${q.download === "0" ? "inline" : "attachment"}; filename="${filename}"`,
      "Cache-Control": "private, no-store",
    },
  });
});
