import { NextResponse } from "next/server";
import { route } from "@/lib/http/route";
import { importPiecesCsv } from "@/lib/pieces/csv";
import { handoversAfterImport } from "@/lib/pieces/handover";
import { importSchema } from "@/lib/validation/pieces";

/** A 2 MB CSV inside JSON (quotes and line breaks escaped) plus room for the other fields. */
const IMPORT_BODY_BYTES = 2_200_000;

/** { csv, commit, sendHandover }: commit false previews; commit true writes every row or none, then mails the buyers if asked. */
export const POST = route({ roles: ["admin", "staff"], body: importSchema, bodyLimit: IMPORT_BODY_BYTES }, async ({ actor, body }) => {
  const result = importPiecesCsv(actor, body);
  if (result.committed && body.sendHandover && result.buyers) result.handover = await handoversAfterImport(actor, result.buyers.pieceIds);
  return NextResponse.json(result, { status: result.ok ? (result.committed ? 201 : 200) : 422 });
});
