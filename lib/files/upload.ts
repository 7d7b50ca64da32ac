import "server-only";
import { AppError, badRequest } from "@/lib/errors";
import { MAX_UPLOAD_BYTES } from "@/lib/storage";

/** Room for the multipart boundary and part headers around one file of MAX_UPLOAD_BYTES. */
export const MAX_UPLOAD_REQUEST_BYTES = MAX_UPLOAD_BYTES + 256 * 1024;

const tooLarge = () =>
  new AppError(413, "file_too_large", `That photo is larger than ${MAX_UPLOAD_BYTES / 1024 / 1024} MB. Send a smaller one (a phone's normal photo is well under it).`);

/**
 * Reads a multipart body holding one file in `field`, never buffering more than
 * MAX_UPLOAD_REQUEST_BYTES: a declared Content-Length over the cap is refused before reading, and a
 * body that runs past the cap while streaming is cut off with a 413.
 */
export async function readSingleFile(req: Request, field = "file"): Promise<{ data: Uint8Array; name: string; declaredType: string }> {
  const contentType = req.headers.get("content-type") ?? "";
  if (!/^multipart\/form-data;\s*boundary=/i.test(contentType)) {
    await req.body?.cancel().catch(() => {});
    throw new AppError(415, "multipart_required", `Send the photo as multipart/form-data, in a field named "${field}".`);
  }
  const declared = Number(req.headers.get("content-length") ?? "NaN");
  if (Number.isFinite(declared) && declared > MAX_UPLOAD_REQUEST_BYTES) {
    await req.body?.cancel().catch(() => {});
    throw tooLarge();
  }
  if (!req.body) throw badRequest(`Attach a photo in the field "${field}".`);

  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    total += value.byteLength;
    if (total > MAX_UPLOAD_REQUEST_BYTES) {
      await reader.cancel().catch(() => {});
      throw tooLarge();
    }
    chunks.push(value);
  }
  const body = Buffer.concat(chunks, total);

  let form: FormData;
  try {
    form = await new Response(body, { headers: { "content-type": contentType } }).formData();
  } catch {
    throw badRequest("The upload could not be read as multipart/form-data. Try again.");
  }
  const entries = form.getAll(field);
  if (entries.length === 0) throw badRequest(`Attach a photo in the field "${field}".`);
  if (entries.length > 1) throw badRequest("Send one photo per request.");
  const file = entries[0]!;
  if (typeof file === "string") throw badRequest(`The field "${field}" must hold a file, not text.`);
  if (file.size > MAX_UPLOAD_BYTES) throw tooLarge();
  return { data: new Uint8Array(await file.arrayBuffer()), name: file.name, declaredType: file.type };
}
