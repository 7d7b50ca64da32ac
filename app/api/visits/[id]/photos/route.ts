import { NextResponse } from "next/server";
import { requireStudioMember } from "@/lib/auth/guards";
import { badRequest } from "@/lib/errors";
import { route } from "@/lib/http/route";
import { addVisitPhoto } from "@/lib/visits/service";
import { visitIdParams } from "@/lib/validation/visits";

/** POST /api/visits/[id]/photos (multipart/form-data: file, kind=before|after) */
export const POST = route<{ id: string }>(async (req, { params }) => {
  const { id } = visitIdParams.parse(params);
  const ctx = await requireStudioMember();
  let form: FormData;
  try {
    form = await req.formData();
  } catch {
    throw badRequest("Send the photo as multipart/form-data with the fields file and kind.");
  }
  return NextResponse.json(await addVisitPhoto(ctx, id, form.get("file"), form.get("kind")), { status: 201 });
});
