import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { AppError } from "@/lib/errors";
import { parseJson, route } from "@/lib/http/route";
import { importPiecesCsv } from "@/lib/pieces/csv";
import { importSchema } from "@/lib/validation/pieces";

/** { csv, commit }: commit false previews; commit true writes every row or none. */
export const POST = route(async (req) => {
  const ctx = await requireStaff();
  if (Number(req.headers.get("content-length") ?? 0) > 2_200_000) throw new AppError(413, "file_too_large", "The file is larger than 2 MB; split it.");
  const body = await parseJson(req, importSchema);
  const result = importPiecesCsv(ctx, body);
  return NextResponse.json(result, { status: result.ok ? (result.committed ? 201 : 200) : 422 });
});
