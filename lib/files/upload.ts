import "server-only";
import { badRequest, payloadTooLarge } from "@/lib/errors";
import { readForm } from "@/lib/http/body";
import { MAX_UPLOAD_BYTES } from "@/lib/storage";

/** Room for the multipart boundary and part headers (and a few small text fields) around one file of MAX_UPLOAD_BYTES. */
export const MAX_UPLOAD_REQUEST_BYTES = MAX_UPLOAD_BYTES + 256 * 1024;

/** One uploaded file and the form's text fields. */
export type Upload = { data: Uint8Array; name: string; declaredType: string; fields: Record<string, string> };

/**
 * Reads a multipart photo upload: one file in `fileField` plus any text fields, through the bounded
 * reader (lib/http/body.ts), so no more than MAX_UPLOAD_REQUEST_BYTES is ever held: a declared
 * Content-Length over it is refused before reading, a longer stream is cut off, both with a 413.
 * `optional`: a form without the file (or with an empty one) gives `data` of length 0.
 */
export async function readUpload(req: Request, fileField = "file", opts: { optional?: boolean } = {}): Promise<Upload> {
  const form = await readForm(req, MAX_UPLOAD_REQUEST_BYTES);
  const fields: Record<string, string> = {};
  for (const [key, value] of form.entries()) if (typeof value === "string") fields[key] = value;
  const entries = form.getAll(fileField);
  if (entries.length > 1) throw badRequest("Send one photo per request.");
  const file = entries[0];
  if (file === undefined || (opts.optional && typeof file !== "string" && file.size === 0)) {
    if (opts.optional) return { data: new Uint8Array(0), name: "", declaredType: "", fields };
    throw badRequest(`Attach a photo in the field "${fileField}".`, { [fileField]: ["Choose a photo."] });
  }
  if (typeof file === "string") throw badRequest(`The field "${fileField}" must hold a file, not text.`);
  if (file.size > MAX_UPLOAD_BYTES) throw payloadTooLarge(MAX_UPLOAD_BYTES);
  return { data: new Uint8Array(await file.arrayBuffer()), name: file.name, declaredType: file.type, fields };
}
