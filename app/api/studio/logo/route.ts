import { NextResponse } from "next/server";
import { readUpload } from "@/lib/files/upload";
import { route } from "@/lib/http/route";
import { logoPath } from "@/lib/studio/brand";
import { removeLogo, uploadLogo } from "@/lib/studio/setup-steps";

/** POST /api/studio/logo (multipart/form-data: file): the studio's logo, re-encoded like piece photos. */
export const POST = route({ roles: ["admin"], status: 201 }, async ({ req, actor }) => {
  const studio = await uploadLogo(actor, async () => (await readUpload(req, "file")).data);
  return { logoUrl: logoPath(studio) };
});

/** DELETE /api/studio/logo: back to the studio's name alone. */
export const DELETE = route({ roles: ["admin"] }, async ({ actor }) => {
  await removeLogo(actor);
  return new NextResponse(null, { status: 204 });
});
