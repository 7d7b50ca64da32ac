import { route } from "@/lib/http/route";
import { certificatePdf } from "@/lib/owner/certificate";
import { idParam } from "@/lib/validation/pieces";

export const GET = route({ roles: ["owner"], params: idParam }, async ({ actor, params }) => {
  const { buffer, filename } = await certificatePdf(actor.user, params.id);
  return new Response(new Uint8Array(buffer), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `attachment; filename="${filename}"`,
      "Cache-Control": "private, no-store",
    },
  });
});
