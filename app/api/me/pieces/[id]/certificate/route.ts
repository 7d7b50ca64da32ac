import { requireUser } from "@/lib/auth/guards";
import { route } from "@/lib/http/route";
import { certificatePdf } from "@/lib/owner/certificate";

export const GET = route<{ id: string }>(async (_req, { params }) => {
  const user = await requireUser();
  const { buffer, filename } = await certificatePdf(user, params.id);
  return new Response(new Uint8Array(buffer), {
    headers: {
      "Content-Type": "application/pdf",
      "Content-Disposition": `attachment; filename="${filename}"`,
      "Cache-Control": "private, no-store",
    },
  });
});
