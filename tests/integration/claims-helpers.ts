// Helpers for the claim, upload and file tests: claims filed through lib/claims as an owner would,
// and images made with sharp or by hand. All data is invented.
import zlib from "node:zlib";
import sharp from "sharp";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { claims, memberships, ownerships, refreshOffers, type Piece, type Studio } from "@/db/schema";
import type { Quote } from "@/lib/care/quote";
import { createClaim } from "@/lib/claims/file-claim";
import type { ClaimState } from "@/lib/claims/states";
import { decideClaim } from "@/lib/claims/decide-claim";
import { listStudioClaims } from "@/lib/claims/list";
import { ownerActor, type Actor } from "@/lib/auth/actor";
import type { StudioContext } from "@/lib/auth/guards";
import { claimDecisionSchema, claimListQuerySchema, createClaimSchema, type ClaimDecisionInput, type CreateClaimInput } from "@/lib/validation/claims";
import { createPiece, createStudio, createUser, memberContext } from "../support/fixtures";

export const NO_ANSWERS: CreateClaimInput["answers"] = { heat: "no", chemicals: "no", impact: "no", usedOutdoors: "no", directSun: "no" };

export function todayUtc(): string {
  return new Date().toISOString().slice(0, 10);
}

/** A studio (UTC, with an e-mail address), its staff, an owner and a piece they own since delivery. */
export async function claimWorld(opts: { piece?: Partial<Piece>; studio?: Partial<Studio> } = {}) {
  const studio = createStudio({ timeZone: "UTC", email: `studio-${Math.random().toString(36).slice(2)}@test.example`, ...opts.studio });
  const staffCtx = await memberContext(studio, "staff");
  const owner = await createUser({ name: "Test Owner (invented)" });
  const { piece } = createPiece(studio, { ownerId: owner.id, registeredAt: new Date(), ...opts.piece });
  getDb().insert(ownerships).values({ studioId: studio.id, pieceId: piece.id, userId: owner.id, via: "registration", startedAt: new Date(`${piece.deliveredOn}T12:00:00Z`) }).run();
  return { studio, staffCtx, staff: staffCtx as Actor, owner, ownerV: ownerActor(owner), piece };
}

export async function fileClaim(actor: Actor, pieceId: string, over: Partial<CreateClaimInput> = {}) {
  // As POST /api/claims does: the form's values parsed once by the route's schema (°F readings become °C).
  const input = createClaimSchema.parse({
    pieceId,
    category: "crack_gap",
    noticedOn: todayUtc(),
    description: "A crack opened along the glue line over the winter (invented).",
    answers: { ...NO_ANSWERS, room: { unit: "C", driestTemp: 20, driestRh: 45, dampestTemp: 22, dampestRh: 55 } },
    ...over,
  });
  return createClaim(actor, input);
}

/** As POST /api/claims/[id]/decision does: the body parsed by the route's schema, then the decision. */
export async function decide(ctx: StudioContext, claimId: string, body: ClaimDecisionInput) {
  return decideClaim(ctx, claimId, claimDecisionSchema.parse(body));
}

/** As GET /api/claims does for staff: the query string parsed by the route's schema, then the queue. */
export function listQueue(ctx: StudioContext, query: Record<string, string>, now?: number) {
  return listStudioClaims(ctx, claimListQuerySchema.parse(query), now);
}

/** Puts a claim into a state directly, as if it had got there by the legal path. */
export function forceState(claimId: string, state: ClaimState) {
  getDb().update(claims).set({ state }).where(eq(claims.id, claimId)).run();
}

export async function otherStudioStaff() {
  const other = createStudio({ name: "Another studio (invented)" });
  return memberContext(other, "admin");
}

export async function otherOwner() {
  const u = await createUser({ name: "Another owner (invented)" });
  return ownerActor(u);
}

export function addMember(studioId: string, userId: string, role: "admin" | "staff" | "technician") {
  getDb().insert(memberships).values({ studioId, userId, role }).run();
}

/** A small photo-like JPEG (noise over a gradient), optionally with EXIF including GPS. */
export async function photoJpeg({ width = 1200, height = 900, gps = false, orientation }: { width?: number; height?: number; gps?: boolean; orientation?: number } = {}) {
  const base = sharp({ create: { width, height, channels: 3, background: "#808080", noise: { type: "gaussian", mean: 128, sigma: 30 } } }).blur(1);
  const img = base.jpeg({ quality: 90 });
  if (orientation) img.withMetadata({ orientation });
  if (gps) {
    img.withExif({
      IFD0: { Make: "Invented Camera Co", Model: "Test 1" },
      ...(gps ? { IFD3: { GPSLatitudeRef: "N", GPSLatitude: "48/1 51/1 2400/100", GPSLongitudeRef: "W", GPSLongitude: "123/1 7/1 0/1" } } : {}),
    });
  }
  return new Uint8Array(await img.toBuffer());
}

function pngChunk(type: string, data: Buffer): Buffer {
  const len = Buffer.alloc(4);
  len.writeUInt32BE(data.length);
  const td = Buffer.concat([Buffer.from(type, "ascii"), data]);
  const crc = Buffer.alloc(4);
  crc.writeUInt32BE(zlib.crc32(td) >>> 0);
  return Buffer.concat([len, td, crc]);
}

/**
 * A complete, valid PNG of width × height, 1-bit greyscale, all black: 400 megapixels for
 * 20,000 × 20,000, yet only some tens of kilobytes, because every row is the same.
 */
export function hugeBlankPng(width = 20_000, height = 20_000): Buffer {
  const ihdr = Buffer.alloc(13);
  ihdr.writeUInt32BE(width, 0);
  ihdr.writeUInt32BE(height, 4);
  ihdr[8] = 1; // bit depth
  ihdr[9] = 0; // greyscale
  // Every row is filter byte 0 followed by zero bits, so the whole image data is zeros.
  const rowBytes = 1 + Math.ceil(width / 8);
  const idat = zlib.deflateSync(Buffer.alloc(rowBytes * height), { level: 9 });
  return Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), pngChunk("IHDR", ihdr), pngChunk("IDAT", idat), pngChunk("IEND", Buffer.alloc(0))]);
}

/** An open refresh offer made to `userId` on the piece, as the reminder pass writes one (its quote stood in for). */
export function offerFor(studioId: string, pieceId: string, userId: string) {
  return getDb()
    .insert(refreshOffers)
    .values({ studioId, pieceId, userId, taskKey: `${pieceId}:topcoat_refresh:top`, dueOn: "2027-03-01", priceMinor: 12_000, currency: "USD", quote: { lines: [], subtotalMinor: 12_000, taxMinor: 0, totalMinor: 12_000, currency: "USD" } as unknown as Quote, status: "offered" })
    .returning()
    .get();
}
