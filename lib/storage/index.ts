// The shared storage module for uploaded images (piece photos, claim photos, care-log and visit
// photos). Every upload is checked by its content, never its name or declared type; decoded with a
// pixel limit read from its header before any decode; decoded in turn with other accounts' uploads
// (./image-queue.ts); rotated by its orientation; re-encoded as JPEG, which drops
// all metadata (EXIF, GPS, XMP, ICC); and stored under DATA_DIR with a random name, with a thumbnail.
import fs from "node:fs/promises";
import path from "node:path";
import { randomBytes } from "node:crypto";
import { fileTypeFromBuffer } from "file-type";
import sharp from "sharp";
import { env } from "@/lib/env";
import { payloadTooLarge, unprocessable, unsupportedMediaType } from "@/lib/errors";
import { withImageSlot } from "./image-queue";

export const MAX_UPLOAD_BYTES = 15 * 1024 * 1024;
/**
 * 25 megapixels: above a 24 MP camera's 6000 × 4000 and a phone's usual 12 MP; a larger image costs
 * seconds of CPU to decode (a 39 MP PNG of a few kilobytes took ~2 s). Common practice, no published source.
 */
export const MAX_INPUT_PIXELS = 25_000_000;
const ACCEPTED = new Set(["image/jpeg", "image/png", "image/webp"]);
const FULL_MAX_EDGE = 4096;
const THUMB_EDGE = 480;

export type StoredImage = {
  storageKey: string;
  thumbKey: string;
  contentType: "image/jpeg";
  width: number;
  height: number;
  bytes: number;
};

const HOW_TO_SEND_JPEG =
  "Send a JPEG, PNG or WebP photo instead. On an iPhone, set Settings → Camera → Formats → Most Compatible for new photos, or send a screenshot of the photo.";

function describe(mime: string | undefined): string {
  if (!mime) return "That file isn't an image we can read.";
  if (mime === "image/heic" || mime === "image/heif" || mime === "image/avif") return "That photo is in the HEIC/HEIF format, which we can't accept.";
  return `That file is ${mime}, not a photo we can accept.`;
}

const SHARP_FORMAT: Record<string, string> = { "image/jpeg": "jpeg", "image/png": "png", "image/webp": "webp" };

const unreadable = () => unprocessable("unreadable_image", `That image looks damaged or incomplete, so we couldn't read it. ${HOW_TO_SEND_JPEG}`);

/**
 * Checks, cleans and stores one image uploaded by `account` (the uploader's user id, whose uploads
 * are queued together). Throws a 413/415/422/429 AppError with a message a person can act on.
 */
export async function storeImage(data: Uint8Array, account: string): Promise<StoredImage> {
  if (data.byteLength > MAX_UPLOAD_BYTES) throw payloadTooLarge(MAX_UPLOAD_BYTES);
  if (data.byteLength === 0) throw unprocessable("empty_file", "That file is empty.");
  const type = await fileTypeFromBuffer(data);
  if (!type || !ACCEPTED.has(type.mime)) throw unsupportedMediaType(`${describe(type?.mime)} ${HOW_TO_SEND_JPEG}`);

  // The header alone (no pixels decoded) says how large the image is: refuse a large one before it
  // waits in the queue or costs any decoding.
  const meta = await sharp(data, { limitInputPixels: false })
    .metadata()
    .catch(() => null);
  if (!meta?.width || !meta.height || meta.format !== SHARP_FORMAT[type.mime]) throw unreadable();
  if (meta.width * meta.height > MAX_INPUT_PIXELS) {
    throw unprocessable(
      "image_too_large",
      `That image has more than ${MAX_INPUT_PIXELS / 1_000_000} megapixels. Send a smaller version of it (most phones' normal photos are fine).`,
    );
  }

  const { full, thumb } = await withImageSlot(account, async () => {
    // limitInputPixels again, in case a decoder finds more pixels than the header said.
    const input = () => sharp(data, { limitInputPixels: MAX_INPUT_PIXELS, failOn: "error", sequentialRead: true });
    try {
      // Only the first frame of an animated image is read (sharp's default).
      // Both outputs come from the source: the thumbnail uses JPEG shrink-on-load and runs alongside.
      // No withMetadata(): the re-encoded files carry no EXIF, GPS, XMP or ICC.
      const [fullOut, thumbOut] = await Promise.all([
        input()
          .rotate()
          .resize({ width: FULL_MAX_EDGE, height: FULL_MAX_EDGE, fit: "inside", withoutEnlargement: true })
          .flatten({ background: "#ffffff" })
          .jpeg({ quality: 85 })
          .toBuffer({ resolveWithObject: true }),
        input()
          .rotate()
          .resize({ width: THUMB_EDGE, height: THUMB_EDGE, fit: "inside", withoutEnlargement: true })
          .flatten({ background: "#ffffff" })
          .jpeg({ quality: 78 })
          .toBuffer(),
      ]);
      return { full: fullOut, thumb: thumbOut };
    } catch {
      throw unreadable();
    }
  });

  const name = randomBytes(16).toString("hex");
  const storageKey = path.posix.join("files", name.slice(0, 2), `${name}.jpg`);
  const thumbKey = path.posix.join("files", name.slice(0, 2), `${name}.thumb.jpg`);
  await fs.mkdir(path.dirname(absolutePath(storageKey)), { recursive: true });
  try {
    // "wx": a random name that already exists is never overwritten.
    await fs.writeFile(absolutePath(storageKey), full.data, { flag: "wx" });
    await fs.writeFile(absolutePath(thumbKey), thumb, { flag: "wx" });
  } catch (e) {
    await removeStoredFiles(storageKey, thumbKey);
    throw e;
  }
  return { storageKey, thumbKey, contentType: "image/jpeg", width: full.info.width, height: full.info.height, bytes: full.data.byteLength };
}

function absolutePath(key: string): string {
  const root = path.resolve(env.DATA_DIR);
  const p = path.resolve(root, key);
  if (!p.startsWith(root + path.sep)) throw new Error("storage key escapes DATA_DIR");
  return p;
}

/** Reads a stored file; callers authorize the viewer first. */
export function readStoredFile(key: string): Promise<Buffer> {
  return fs.readFile(absolutePath(key));
}

export async function removeStoredFiles(...keys: string[]): Promise<void> {
  await Promise.all(keys.map((k) => fs.rm(absolutePath(k), { force: true })));
}
