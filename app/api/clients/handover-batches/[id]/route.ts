import { after } from "next/server";
import { route } from "@/lib/http/route";
import { handoverBatchProgress, startHandoverBatch } from "@/lib/pieces/handover-batch";
import { idParam } from "@/lib/validation/pieces";

export const dynamic = "force-dynamic";

/** A mailing's progress and summary; one nobody works on any more (the server stopped) is taken up again. */
export const GET = route({ roles: ["admin", "staff"], params: idParam }, ({ actor, params }) => {
  const progress = handoverBatchProgress(actor, params.id);
  if (progress.stalled) after(() => startHandoverBatch(progress.id));
  return { batch: progress };
});
