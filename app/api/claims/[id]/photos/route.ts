import { NextResponse } from "next/server";
import { addClaimPhoto } from "@/lib/claims/photos";
import { currentViewer } from "@/lib/claims/viewer";
import { readUpload } from "@/lib/files/upload";
import { route } from "@/lib/http/route";
import { idParam } from "@/lib/validation/claims";

export const dynamic = "force-dynamic";

/** One photo per request, multipart field `file`. Answers 201 with the photo and the URLs it is served from. */
export const POST = route<{ id: string }>(async (req, ctx) => {
  const { id } = idParam.parse(ctx.params);
  const photo = await addClaimPhoto(await currentViewer(), id, async () => (await readUpload(req, "file")).data);
  return NextResponse.json({ photo }, { status: 201 });
});
