import { route } from "@/lib/http/route";
import { claimRatesCsv } from "@/lib/reports";
import { claimRatesQuerySchema } from "@/lib/reports/query";

/** Claims per 100 pieces by species, finish class and resin for ?from&to&category, as CSV. */
export const GET = route({ roles: ["admin", "staff"], query: claimRatesQuerySchema }, ({ actor, query }) => {
  const { csv, rates } = claimRatesCsv(actor, query);
  return new Response("\uFEFF" + csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="claims-per-100-${actor.studio.slug}-${rates.from}-to-${rates.to}.csv"`,
      "Cache-Control": "private, no-store",
    },
  });
});
