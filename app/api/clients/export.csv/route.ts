import { exportClientsCsv } from "@/lib/clients/list";
import { route } from "@/lib/http/route";
import { clientListQuerySchema } from "@/lib/validation/clients";

export const dynamic = "force-dynamic";

/** The clients list's current search and filter (same query string as GET /api/clients) as CSV, every page. */
export const GET = route({ roles: ["admin", "staff"], query: clientListQuerySchema }, ({ actor, query }) => {
  const csv = exportClientsCsv(actor, query);
  const day = new Date().toISOString().slice(0, 10);
  return new Response("\uFEFF" + csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="clients-${actor.studio.slug}-${day}.csv"`,
      "Cache-Control": "private, no-store",
    },
  });
});
