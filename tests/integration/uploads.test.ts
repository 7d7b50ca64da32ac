// Photo uploads through the real multipart reader (lib/files/upload), the shared storage module
// (lib/storage: file-type, sharp, the per-account decode queue) and the database, with real image
// decoding. Images are generated.
import fs from "node:fs/promises";
import path from "node:path";
import exifr from "exifr";
import sharp from "sharp";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { files } from "@/db/schema";
import { addClaimPhoto, removeClaimPhoto } from "@/lib/claims/photos";
import { getClaim } from "@/lib/claims/view-claim";
import { AppError } from "@/lib/errors";
import { getFileForViewer } from "@/lib/files/access";
import { MAX_UPLOAD_REQUEST_BYTES, readUpload } from "@/lib/files/upload";
import { MAX_INPUT_PIXELS, MAX_UPLOAD_BYTES, readStoredFile, removeStoredFiles, storeImage } from "@/lib/storage";
import { IMAGE_QUEUE } from "@/lib/storage/image-queue";
import { claimWorld, fileClaim, forceState, hugeBlankPng, photoJpeg } from "./claims-helpers";

function multipart(bytes: Uint8Array, name = "photo.jpg", type = "image/jpeg", field = "file"): Request {
  const form = new FormData();
  form.append(field, new File([new Uint8Array(bytes)], name, { type }));
  return new Request("http://localhost/api/claims/x/photos", { method: "POST", body: form });
}

async function caught(p: Promise<unknown>): Promise<AppError> {
  try {
    await p;
  } catch (e) {
    if (e instanceof AppError) return e;
    throw e;
  }
  throw new Error("expected an AppError, got success");
}

async function uploadVia(req: Request) {
  const w = await claimWorld();
  const claim = await fileClaim(w.ownerV, w.piece.id);
  return { w, claim, result: addClaimPhoto(w.ownerV, claim.id, async () => (await readUpload(req)).data) };
}

describe("claim photo uploads: refused content", () => {
  it("a text file renamed .jpg and sent as image/jpeg → 415 with a message", async () => {
    const { result, claim } = await uploadVia(multipart(new TextEncoder().encode("these are not the pixels you are looking for\n".repeat(20)), "crack.jpg"));
    const e = await caught(result);
    expect(e.status).toBe(415);
    expect(e.message).toMatch(/JPEG, PNG or WebP/);
    expect(getDb().select().from(files).all().filter((f) => f.claimId === claim.id)).toHaveLength(0);
  });

  it("a PDF declared as image/png → 415 naming what it is", async () => {
    const pdf = new TextEncoder().encode("%PDF-1.4\n1 0 obj << /Type /Catalog >> endobj\ntrailer << /Root 1 0 R >>\n%%EOF\n");
    const e = await caught((await uploadVia(multipart(pdf, "photo.png", "image/png"))).result);
    expect(e.status).toBe(415);
    expect(e.message).toMatch(/application\/pdf/);
  });

  it("an SVG (even one that draws a picture) → 415", async () => {
    const svg = new TextEncoder().encode('<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg" width="10" height="10"><rect width="10" height="10"/><script>alert(1)</script></svg>');
    const e = await caught((await uploadVia(multipart(svg, "photo.svg", "image/svg+xml"))).result);
    expect([415, 422]).toContain(e.status);
    expect(e.status).toBe(415);
    expect(e.message.length).toBeGreaterThan(20);
  });

  it("a truncated JPEG → 422 saying it looks damaged", async () => {
    const jpeg = await photoJpeg();
    const e = await caught((await uploadVia(multipart(jpeg.subarray(0, Math.floor(jpeg.length * 0.6))))).result);
    expect(e.status).toBe(422);
    expect(e.message).toMatch(/damaged or incomplete/);
  });

  it("a HEIC photo → 415 with how to send a JPEG instead", async () => {
    // An ISO-BMFF 'ftyp' box with the heic brand is what identifies the format.
    const heic = Buffer.concat([Buffer.from([0, 0, 0, 0x18]), Buffer.from("ftypheic"), Buffer.from([0, 0, 0, 0]), Buffer.from("mif1heic"), Buffer.alloc(200)]);
    const e = await caught((await uploadVia(multipart(heic, "IMG_0001.HEIC", "image/heic"))).result);
    expect(e.status).toBe(415);
    expect(e.message).toMatch(/HEIC/);
    expect(e.message).toMatch(/Most Compatible/);
  });

  it("a request that is not multipart → 415; no file in the field → 400; two files → 400", async () => {
    const notMultipart = new Request("http://localhost/x", { method: "POST", body: "hello", headers: { "content-type": "image/jpeg" } });
    expect((await caught(readUpload(notMultipart))).status).toBe(415);
    const wrongField = multipart(await photoJpeg({ width: 50, height: 50 }), "a.jpg", "image/jpeg", "photo");
    expect((await caught(readUpload(wrongField))).status).toBe(400);
    const two = new FormData();
    two.append("file", new File([new Uint8Array(4)], "a.jpg"));
    two.append("file", new File([new Uint8Array(4)], "b.jpg"));
    expect((await caught(readUpload(new Request("http://localhost/x", { method: "POST", body: two })))).status).toBe(400);
  });
});

describe("claim photo uploads: size limits", () => {
  it("a 16 MB file → 413 (storage module and multipart reader)", async () => {
    const big = new Uint8Array(16 * 1024 * 1024);
    big.set(await photoJpeg({ width: 64, height: 64 }));
    expect((await caught(storeImage(big, "account-a"))).status).toBe(413);
    const { result } = await uploadVia(multipart(big));
    const e = await caught(result);
    expect(e.status).toBe(413);
    expect(e.code).toBe("payload_too_large");
    expect(e.message).toBe("That is too large: we take up to 15 MB at a time. Send a smaller one.");
  });

  it("a declared Content-Length over the cap is refused before any of the body is read", async () => {
    let pulled = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(c) {
        pulled++;
        c.enqueue(new Uint8Array(64 * 1024));
      },
    });
    const req = new Request("http://localhost/x", {
      method: "POST",
      body,
      duplex: "half",
      headers: { "content-type": "multipart/form-data; boundary=x", "content-length": String(16 * 1024 * 1024) },
    } as RequestInit);
    expect((await caught(readUpload(req))).status).toBe(413);
    expect(pulled).toBeLessThanOrEqual(1); // a stream may pre-pull one chunk; nothing more is read
  });

  it("a body with no Content-Length that never ends is cut off just past the cap", async () => {
    let sent = 0;
    const body = new ReadableStream<Uint8Array>({
      pull(c) {
        sent += 256 * 1024;
        c.enqueue(new Uint8Array(256 * 1024));
      },
    });
    const req = new Request("http://localhost/x", { method: "POST", body, duplex: "half", headers: { "content-type": "multipart/form-data; boundary=x" } } as RequestInit);
    expect((await caught(readUpload(req))).status).toBe(413);
    expect(sent).toBeLessThan(MAX_UPLOAD_REQUEST_BYTES + 3 * 256 * 1024);
    expect(MAX_UPLOAD_REQUEST_BYTES).toBeLessThan(MAX_UPLOAD_BYTES + 1024 * 1024);
  });

  it("a 20,000 × 20,000 PNG (400 megapixels in 48 kB) is refused from its header without exhausting memory", async () => {
    const png = hugeBlankPng();
    expect(png.byteLength).toBeLessThan(200_000);
    const meta = await sharp(png, { limitInputPixels: false }).metadata(); // the file is a valid 20k × 20k PNG
    expect([meta.width, meta.height]).toEqual([20_000, 20_000]);
    global.gc?.();
    const before = process.memoryUsage().rss;
    const { result } = await uploadVia(multipart(png, "huge.png", "image/png"));
    const e = await caught(result);
    const grew = process.memoryUsage().rss - before;
    expect(e.status).toBe(422);
    expect(e.message).toMatch(/25 megapixels/);
    // A full decode would need 400 MB even at one byte per pixel.
    expect(grew).toBeLessThan(150 * 1024 * 1024);
  });
});

describe("claim photo uploads: accepted photos are cleaned", () => {
  it("a JPEG carrying GPS EXIF is stored with no EXIF at all, and served only through its URL", async () => {
    const original = await photoJpeg({ gps: true });
    const gps = await exifr.gps(Buffer.from(original));
    expect(gps?.latitude).toBeCloseTo(48.8567, 3); // the test image does carry a location
    const { result, w, claim } = await uploadVia(multipart(original, "IMG_2201.jpg"));
    const photo = await result;
    expect(photo.url).toBe(`/api/files/${photo.id}`);
    expect(photo.thumbUrl).toBe(`/api/files/${photo.id}?thumb=1`);
    const row = getDb().select().from(files).all().find((f) => f.id === photo.id)!;
    expect(row).toMatchObject({ purpose: "claim_photo", claimId: claim.id, pieceId: w.piece.id, studioId: w.studio.id, contentType: "image/jpeg" });
    expect(path.basename(row.storageKey)).toMatch(/^[0-9a-f]{32}\.jpg$/);
    for (const key of [row.storageKey, row.thumbKey]) {
      const stored = await readStoredFile(key);
      expect(await exifr.parse(stored, true)).toBeUndefined();
      expect(await exifr.gps(stored)).toBeUndefined();
      const m = await sharp(stored).metadata();
      expect(m.format).toBe("jpeg");
      expect(m.exif).toBeUndefined();
      expect(m.xmp).toBeUndefined();
      expect(m.icc).toBeUndefined();
    }
    const thumb = await sharp(await readStoredFile(row.thumbKey)).metadata();
    expect(Math.max(thumb.width!, thumb.height!)).toBeLessThanOrEqual(480);
    expect(getClaim(w.staff, claim.id).photos.map((p) => p.id)).toEqual([photo.id]);
  });

  it("a photo whose stored file is gone answers 404 with words, not a 500; its thumbnail still serves", async () => {
    const { result, w } = await uploadVia(multipart(await photoJpeg(), "crack.jpg"));
    const photo = await result;
    const row = getDb().select().from(files).all().find((f) => f.id === photo.id)!;
    expect((await getFileForViewer(w.owner.id, photo.id)).data.byteLength).toBeGreaterThan(100);
    await removeStoredFiles(row.storageKey);
    const e = await caught(getFileForViewer(w.owner.id, photo.id));
    expect(e.status).toBe(404);
    expect(e.message).toBe("This photo is no longer stored.");
    expect((await getFileForViewer(w.owner.id, photo.id, { thumb: true })).contentType).toBe("image/jpeg");
  });

  it("rotates by the EXIF orientation before dropping it", async () => {
    const rotated = await photoJpeg({ width: 400, height: 200, orientation: 6 }); // 6 = rotate 90° clockwise to view
    expect((await sharp(rotated).metadata()).orientation).toBe(6);
    const stored = await storeImage(rotated, "account-a");
    expect([stored.width, stored.height]).toEqual([200, 400]);
  });

  it("PNG and WebP are accepted and re-encoded as JPEG", async () => {
    const png = await sharp({ create: { width: 300, height: 200, channels: 4, background: { r: 10, g: 90, b: 90, alpha: 0.5 } } }).png().toBuffer();
    const webp = await sharp({ create: { width: 300, height: 200, channels: 3, background: "#336699" } }).webp().toBuffer();
    for (const b of [png, webp]) {
      const s = await storeImage(new Uint8Array(b), "account-a");
      expect(s.contentType).toBe("image/jpeg");
      expect((await sharp(await readStoredFile(s.storageKey)).metadata()).format).toBe("jpeg");
    }
  });

  it("holds at most 10 photos; the owner may remove one while the claim is new, not after review starts", async () => {
    const w = await claimWorld();
    const claim = await fileClaim(w.ownerV, w.piece.id);
    const jpeg = await photoJpeg({ width: 120, height: 90 });
    const ids: string[] = [];
    for (let i = 0; i < 10; i++) ids.push((await addClaimPhoto(w.ownerV, claim.id, async () => jpeg)).id);
    expect((await caught(addClaimPhoto(w.ownerV, claim.id, async () => jpeg))).status).toBe(409);
    const removed = getDb().select().from(files).all().find((f) => f.id === ids[0])!;
    await removeClaimPhoto(w.ownerV, claim.id, ids[0]!);
    await expect(fs.stat(path.join(process.env.DATA_DIR!, removed.storageKey))).rejects.toThrow();
    await addClaimPhoto(w.ownerV, claim.id, async () => jpeg);
    forceState(claim.id, "in_review");
    expect((await caught(removeClaimPhoto(w.ownerV, claim.id, ids[1]!))).status).toBe(409);
  });

  it("staff cannot add photos to the owner's claim, and nobody can once it is decided", async () => {
    const w = await claimWorld();
    const claim = await fileClaim(w.ownerV, w.piece.id);
    const jpeg = await photoJpeg({ width: 60, height: 60 });
    let read = false;
    const e = await caught(addClaimPhoto(w.staff, claim.id, async () => ((read = true), jpeg)));
    expect(e.status).toBe(403);
    expect(read).toBe(false);
    forceState(claim.id, "accepted");
    expect((await caught(addClaimPhoto(w.ownerV, claim.id, async () => jpeg))).status).toBe(409);
  });
});

describe("expensive images", () => {
  it("a 5 kB PNG declaring 39 megapixels is refused from its header, quickly, even while the queue is full", async () => {
    const png = hugeBlankPng(6250, 6240); // 39.0 MP of 1-bit grey: a few kilobytes, ~2 s of CPU to decode
    expect(png.byteLength).toBeLessThan(10_000);
    // Fill the uploader's own queue with slow images first: the refusal must not wait behind them.
    const slow = hugeBlankPng(5000, 4900); // 24.5 MP, accepted
    let settled = 0;
    const busy = Array.from({ length: IMAGE_QUEUE.PER_ACCOUNT }, () => storeImage(slow, "flooder-39").catch((e: unknown) => e).finally(() => settled++));
    const e = await caught(storeImage(png, "flooder-39"));
    expect(e.status).toBe(422);
    expect(e.code).toBe("image_too_large");
    expect(e.message).toMatch(/more than 25 megapixels/);
    // Refused from the header: the answer came before any of the slow decodes queued ahead of it ended.
    expect(settled).toBe(0);
    expect(6250 * 6240).toBeGreaterThan(MAX_INPUT_PIXELS);
    await Promise.all(busy);
  });

  it("one account flooding uploads gets 429 with Retry-After, and another account's upload goes ahead of the flood", async () => {
    const slow = hugeBlankPng(5000, 4900); // 24.5 MP: under the limit, and each costs a real decode
    const small = await photoJpeg({ width: 200, height: 150 });
    const done: string[] = [];
    const flood = Array.from({ length: 10 }, (_, i) =>
      storeImage(slow, "flooder").then(
        () => (done.push(`flood ${i}`), "stored"),
        (e: unknown) => e,
      ),
    );
    const other = storeImage(small, "someone-else").then(() => (done.push("other"), "stored"));
    const results = await Promise.all(flood);
    expect(await other).toBe("stored");
    const refused = results.filter((r): r is AppError => r instanceof AppError);
    expect(results.filter((r) => r === "stored")).toHaveLength(IMAGE_QUEUE.PER_ACCOUNT);
    expect(refused).toHaveLength(10 - IMAGE_QUEUE.PER_ACCOUNT);
    for (const e of refused) {
      expect(e.status).toBe(429);
      expect(e.retryAfterSec).toBe(IMAGE_QUEUE.RETRY_AFTER_SEC);
      expect(e.message).toMatch(/earlier photos/);
    }
    // The other account did not wait behind the flood: it finished before the flood's first photo did.
    expect(done[0]).toBe("other");
  });
});
