import { requireAdmin } from "@/lib/auth/guards";
import { exportClientData } from "@/lib/clients/personal-data";
import { route } from "@/lib/http/route";
import { clientIdParam } from "@/lib/validation/clients";

export const dynamic = "force-dynamic";

/** Admins: everything the studio holds about one client, as a zip (data.json and their photos). */
export const GET = route<{ id: string }>(async (_req, ctx) => {
  const { id } = clientIdParam.parse(ctx.params);
  const { zip, filename } = await exportClientData(await requireAdmin(), id);
  return new Response(Buffer.from(zip), {
    headers: { "Content-Type": "application/zip", "Content-Disposition": `attachment; filename="${filename}"`, "Cache-Control": "private, no-store" },
  });
});
