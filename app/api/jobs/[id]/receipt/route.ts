import { route } from "@/lib/http/route";
import { receiptPdf } from "@/lib/repairs/receipt";
import { jobIdParams } from "@/lib/validation/jobs";

/** The job's receipt as a PDF: its owner, and the studio's staff. */
export const GET = route({ roles: ["admin", "staff", "owner"], params: jobIdParams }, async ({ actor, params }) => {
  const { buffer, filename } = await receiptPdf(actor, params.id);
  return new Response(new Uint8Array(buffer), {
    headers: { "Content-Type": "application/pdf", "Content-Disposition": `attachment; filename="${filename}"`, "Cache-Control": "private, no-store" },
  });
});
