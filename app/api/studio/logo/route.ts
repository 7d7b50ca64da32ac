import { NextResponse } from "next/server";
import { requireAdmin } from "@/lib/auth/guards";
import { readUpload } from "@/lib/files/upload";
import { route } from "@/lib/http/route";
import { logoPath } from "@/lib/studio/brand";
import { removeLogo, uploadLogo } from "@/lib/studio/setup-steps";

/** POST /api/studio/logo (multipart/form-data: file): the studio's logo, re-encoded like piece photos. */
export const POST = route(async (req) => {
  const ctx = await requireAdmin();
  const studio = await uploadLogo(ctx, async () => (await readUpload(req, "file")).data);
  return NextResponse.json({ logoUrl: logoPath(studio) }, { status: 201 });
});

/** DELETE /api/studio/logo: back to the studio's name alone. */
export const DELETE = route(async () => {
  const ctx = await requireAdmin();
  await removeLogo(ctx);
  return new NextResponse(null, { status: 204 });
});
