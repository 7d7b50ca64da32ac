import { requireStaff } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { exportPiecesCsv } from "@/lib/pieces/csv";

/** The registry's current filter (same query string as GET /api/pieces) as CSV, every page. */
export const GET = route(async (req) => {
  const ctx = await requireStaff();
  const csv = exportPiecesCsv(ctx, Object.fromEntries(req.nextUrl.searchParams));
  const day = new Date().toISOString().slice(0, 10);
  return new Response("\uFEFF" + csv, {
    headers: {
      "Content-Type": "text/csv; charset=utf-8",
      "Content-Disposition": `attachment; filename="pieces-${ctx.studio.slug}-${day}.csv"`,
      "Cache-Control": "private, no-store",
    },
  });
});
