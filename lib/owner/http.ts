import "server-only";
import { z } from "zod";
import { AppError, badRequest } from "@/lib/errors";
import { MAX_UPLOAD_BYTES } from "@/lib/storage";
import { parseJson } from "@/lib/http/route";

/** A care-log request body: JSON, or multipart form data with an optional `photo` file. */
export async function readCareLogBody(req: Request): Promise<{ fields: Record<string, unknown>; photo: Uint8Array | null }> {
  const type = req.headers.get("content-type") ?? "";
  if (!type.startsWith("multipart/form-data")) {
    const body = await parseJson(req, z.unknown());
    if (!body || typeof body !== "object" || Array.isArray(body)) throw badRequest("The request body must be a JSON object.");
    return { fields: body as Record<string, unknown>, photo: null };
  }
  const length = Number(req.headers.get("content-length") ?? "0");
  if (length > MAX_UPLOAD_BYTES + 64 * 1024) throw new AppError(413, "file_too_large", "That photo is over the 15 MB limit. Send a smaller one.");
  let form: FormData;
  try {
    form = await req.formData();
  } catch {
    throw badRequest("The form data could not be read.");
  }
  const fields: Record<string, unknown> = {};
  let photo: Uint8Array | null = null;
  for (const [key, value] of form.entries()) {
    if (key === "photo") {
      if (typeof value !== "string" && value.size > 0) photo = new Uint8Array(await value.arrayBuffer());
    } else if (typeof value === "string") fields[key] = value;
  }
  return { fields, photo };
}
