import "server-only";
import { badRequest } from "@/lib/errors";
import { isForm, readJson } from "@/lib/http/body";
import { readUpload } from "@/lib/files/upload";

/** A care-log request body: JSON, or multipart form data with an optional `photo` file (both read through lib/http/body.ts). */
export async function readCareLogBody(req: Request): Promise<{ fields: Record<string, unknown>; photo: Uint8Array | null }> {
  if (!isForm(req)) {
    const body = await readJson(req);
    if (!body || typeof body !== "object" || Array.isArray(body)) throw badRequest("The request body must be a JSON object.");
    return { fields: body as Record<string, unknown>, photo: null };
  }
  const { data, fields } = await readUpload(req, "photo", { optional: true });
  return { fields, photo: data.byteLength > 0 ? data : null };
}
