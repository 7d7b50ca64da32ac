import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { parseJson, route } from "@/lib/http/route";
import { importPiecesCsv } from "@/lib/pieces/csv";
import { handoversAfterImport } from "@/lib/pieces/handover";
import { importSchema } from "@/lib/validation/pieces";

/** A 2 MB CSV inside JSON (quotes and line breaks escaped) plus room for the other fields. */
const IMPORT_BODY_BYTES = 2_200_000;

/** { csv, commit, sendHandover }: commit false previews; commit true writes every row or none, then mails the buyers if asked. */
export const POST = route(async (req) => {
  const ctx = await requireStaff();
  const body = await parseJson(req, importSchema, { limit: IMPORT_BODY_BYTES });
  const result = importPiecesCsv(ctx, body);
  if (result.committed && body.sendHandover && result.buyers) result.handover = await handoversAfterImport(ctx, result.buyers.pieceIds);
  return NextResponse.json(result, { status: result.ok ? (result.committed ? 201 : 200) : 422 });
});
