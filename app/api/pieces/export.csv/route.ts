import { route } from "@/lib/http/route";
import { exportPiecesCsv } from "@/lib/pieces/csv";
import { pieceListQuerySchema } from "@/lib/validation/pieces";

/** The registry's current filter (same query string as GET /api/pieces) as CSV, every page. */
export const GET = route({ roles: ["admin", "staff"], query: pieceListQuerySchema }, ({ actor, query }) => {
  const csv = exportPiecesCsv(actor, query);
  const day = new Date().toISOString().slice(0, 10);
  return new Response("\uFEFF" + csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="pieces-${actor.studio.slug}-${day}.csv"`,
      "Cache-Control": "private, no-store",
    },
  });
});
