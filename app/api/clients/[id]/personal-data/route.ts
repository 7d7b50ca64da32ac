import { exportClientData } from "@/lib/clients/personal-data";
import { route } from "@/lib/http/route";
import { clientIdParam } from "@/lib/validation/clients";

export const dynamic = "force-dynamic";

/** Admins: everything the studio holds about one client, as a zip (data.json and their photos). */
export const GET = route({ roles: ["admin"], params: clientIdParam }, async ({ actor, params }) => {
  const { zip, filename } = await exportClientData(actor, params.id);
  return new Response(Buffer.from(zip), {
    headers: { "Content-Type": "application/zip", "Content-Disposition": `attachment; filename="${filename}"`, "Cache-Control": "private, no-store" },
  });
});
