import { readUpload } from "@/lib/files/upload";
import { route } from "@/lib/http/route";
import { addPiecePhoto } from "@/lib/pieces/photos";
import { idParam } from "@/lib/validation/pieces";

/** POST /api/pieces/[id]/photos (multipart/form-data: file) */
export const POST = route({ roles: ["admin", "staff"], params: idParam, status: 201 }, async ({ req, actor, params }) => ({
  photo: await addPiecePhoto(actor, params.id, async () => (await readUpload(req, "file")).data),
}));
