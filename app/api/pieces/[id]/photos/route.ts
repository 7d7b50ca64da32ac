import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { readUpload } from "@/lib/files/upload";
import { route } from "@/lib/http/route";
import { addPiecePhoto } from "@/lib/pieces/photos";
import { idParam } from "@/lib/validation/pieces";

/** POST /api/pieces/[id]/photos (multipart/form-data: file) */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const studio = await requireStaff();
  return NextResponse.json({ photo: await addPiecePhoto(studio, id, async () => (await readUpload(req, "file")).data) }, { status: 201 });
});
