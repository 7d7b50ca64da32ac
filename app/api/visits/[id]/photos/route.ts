import { readUpload } from "@/lib/files/upload";
import { route } from "@/lib/http/route";
import { addVisitPhoto } from "@/lib/visits/photos";
import { visitIdParams } from "@/lib/validation/visits";

/** POST /api/visits/[id]/photos (multipart/form-data: file, kind=before|after) */
export const POST = route({ roles: ["admin", "staff", "technician"], params: visitIdParams, status: 201 }, ({ req, actor, params }) => addVisitPhoto(actor, params.id, () => readUpload(req, "file")));
