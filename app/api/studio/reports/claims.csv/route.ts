import { route } from "@/lib/http/route";
import { claimRatesCsv } from "@/lib/reports";

/** Claims per 100 pieces by species, finish class and resin for ?from&to&category (parsed by lib/reports), as CSV. */
export const GET = route({ roles: ["admin", "staff"] }, ({ req, actor }) => {
  const { csv, rates } = claimRatesCsv(actor, Object.fromEntries(req.nextUrl.searchParams));
  return new Response("\uFEFF" + csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="claims-per-100-${actor.studio.slug}-${rates.from}-to-${rates.to}.csv"`,
      "Cache-Control": "private, no-store",
    },
  });
});
