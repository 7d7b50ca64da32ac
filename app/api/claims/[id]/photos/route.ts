import { addClaimPhoto } from "@/lib/claims/photos";
import { readUpload } from "@/lib/files/upload";
import { route } from "@/lib/http/route";
import { idParam } from "@/lib/validation/claims";

export const dynamic = "force-dynamic";

/** One photo per request, multipart field `file`. Answers 201 with the photo and the URLs it is served from. */
export const POST = route({ roles: ["admin", "staff", "owner"], params: idParam, status: 201 }, async ({ req, actor, params }) => ({
  photo: await addClaimPhoto(actor, params.id, async () => (await readUpload(req, "file")).data),
}));
