import { NextResponse } from "next/server";
import { requireStaff } from "@/lib/auth/guards";
import { AppError, badRequest } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { addPiecePhoto } from "@/lib/pieces/photos";
import { MAX_UPLOAD_BYTES } from "@/lib/storage";
import { idParam } from "@/lib/validation/pieces";

export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const studio = await requireStaff();
  const length = Number(req.headers.get("content-length") ?? 0);
  if (length > MAX_UPLOAD_BYTES + 64 * 1024) throw new AppError(413, "file_too_large", "That photo is larger than 15 MB. Send a smaller one.");
  let form: FormData;
  try {
    form = await req.formData();
  } catch {
    throw badRequest("Send the photo as multipart/form-data in the field \"file\".");
  }
  return NextResponse.json({ photo: await addPiecePhoto(studio, id, form.get("file")) }, { status: 201 });
});
