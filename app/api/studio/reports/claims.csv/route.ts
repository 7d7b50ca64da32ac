import { requireStaff } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { claimRatesCsv } from "@/lib/reports";

/** Claims per 100 pieces by species, finish class and resin for ?from&to&category, as CSV. */
export const GET = route(async (req) => {
  const ctx = await requireStaff();
  const { csv, rates } = claimRatesCsv(ctx, Object.fromEntries(req.nextUrl.searchParams));
  return new Response("\uFEFF" + csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="claims-per-100-${ctx.studio.slug}-${rates.from}-to-${rates.to}.csv"`,
      "Cache-Control": "private, no-store",
    },
  });
});
