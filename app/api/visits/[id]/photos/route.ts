import { NextResponse } from "next/server";
import { requireStudioMember } from "@/lib/auth/guards";
import { readUpload } from "@/lib/files/upload";
import { route } from "@/lib/http/route";
import { addVisitPhoto } from "@/lib/visits/photos";
import { visitIdParams } from "@/lib/validation/visits";

/** POST /api/visits/[id]/photos (multipart/form-data: file, kind=before|after) */
export const POST = route<{ id: string }>(async (req, { params }) => {
  const { id } = visitIdParams.parse(params);
  const ctx = await requireStudioMember();
  return NextResponse.json(await addVisitPhoto(ctx, id, () => readUpload(req, "file")), { status: 201 });
});
