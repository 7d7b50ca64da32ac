import { after } from "next/server";
import { z } from "zod";
import { route } from "@/lib/http/route";
import { createHandoverBatch, handoverCandidates, MAX_BATCH_PIECES, recentHandoverBatches, startHandoverBatch } from "@/lib/pieces/handover-batch";

export const dynamic = "force-dynamic";

const pickSchema = z.union([
  z.object({ all: z.literal(true) }),
  z.object({ pieceIds: z.array(z.string().min(1).max(64)).min(1, "Pick at least one piece.").max(MAX_BATCH_PIECES) }),
]);

/** The pieces whose buyer never had the hand-over mail, and the latest mailings. */
export const GET = route({ roles: ["admin", "staff"] }, ({ actor }) => ({ candidates: handoverCandidates(actor), batches: recentHandoverBatches(actor) }));

/** { pieceIds } or { all: true }: writes the mailing and answers 202; the mail goes out after the answer. */
export const POST = route({ roles: ["admin", "staff"], body: pickSchema, status: 202 }, ({ actor, body }) => {
  const batch = createHandoverBatch(actor, body);
  after(() => startHandoverBatch(batch.id));
  return { batch };
});
