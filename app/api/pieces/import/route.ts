import { after, NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { importPiecesCsv } from "@/lib/pieces/csv";
import { createHandoverBatch, startHandoverBatch } from "@/lib/pieces/handover-batch";
import { importSchema } from "@/lib/validation/pieces";

/** A 2 MB CSV inside JSON (quotes and line breaks escaped) plus room for the other fields. */
const IMPORT_BODY_BYTES = 2_200_000;

/** { csv, commit, sendHandover }: commit false previews; commit true writes every row or none, then (if asked) a hand-over mailing to the buyers, sent after the answer. */
export const POST = route({ roles: ["admin", "staff"], body: importSchema, bodyLimit: IMPORT_BODY_BYTES }, async ({ actor, body }) => {
  const result = importPiecesCsv(actor, body);
  if (result.committed && body.sendHandover && result.buyers?.pieceIds.length) {
    const batch = createHandoverBatch(actor, { pieceIds: result.buyers.pieceIds }, "import");
    after(() => startHandoverBatch(batch.id));
    result.handover = { batchId: batch.id, total: batch.total };
  }
  return NextResponse.json(result, { status: result.ok ? (result.committed ? 201 : 200) : 422 });
});
