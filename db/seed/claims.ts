// Invented demo claims (the demo studio of db/seed/demo.ts) in different states, with generated photos stored through the
// shared storage module (so they are re-encoded, stripped and served like real uploads). Everything
// here is invented: the damage, the words, the pictures (drawn by sharp, not photographed).
import { and, eq } from "drizzle-orm";
import sharp from "sharp";
import { claimCoverage, suggestionRecord } from "@/lib/claims/coverage";
import { appendMessage, threadFor } from "@/lib/messages/store";
import { storeImage } from "@/lib/storage";
import type { Db } from "../client";
import {
  auditLog,
  careLogEntries,
  claims,
  files,
  finishLayers,
  finishProducts,
  memberships,
  ownerships,
  pieces,
  users,
  warrantyPolicies,
  type Claim,
} from "../schema";

const HOUR = 3_600_000;

/** A drawn stand-in for a photo: wood-toned grain stripes with a dark mark across them. */
async function drawnPhoto(hue: { r: number; g: number; b: number }, mark: "crack" | "ring" | "haze", seed: number): Promise<Uint8Array> {
  const w = 1200;
  const h = 900;
  const stripes = Array.from({ length: 40 }, (_, i) => {
    const y = (i * 23 + seed * 7) % h;
    return `<rect x="0" y="${y}" width="${w}" height="${6 + ((i * seed) % 9)}" fill="rgb(${hue.r - 25},${hue.g - 20},${hue.b - 15})" opacity="0.35"/>`;
  }).join("");
  const marks = {
    crack: `<path d="M ${200 + seed * 10} 120 L 520 330 L 610 300 L 900 ${700 - seed * 5}" stroke="#2a1a10" stroke-width="7" fill="none"/>`,
    ring: `<circle cx="${600 + seed * 12}" cy="450" r="150" stroke="#f4efe4" stroke-width="18" fill="none" opacity="0.7"/>`,
    haze: `<ellipse cx="600" cy="${420 + seed * 8}" rx="360" ry="200" fill="#e8eef0" opacity="0.55"/>`,
  }[mark];
  const svg = `<svg xmlns="http://www.w3.org/2000/svg" width="${w}" height="${h}"><rect width="${w}" height="${h}" fill="rgb(${hue.r},${hue.g},${hue.b})"/>${stripes}${marks}</svg>`;
  return new Uint8Array(await sharp(Buffer.from(svg)).jpeg({ quality: 88 }).toBuffer());
}

type Spec = {
  piece: string;
  owner: string;
  category: Claim["category"];
  hoursAgo: number;
  noticedDaysAgo: number;
  description: string;
  answers: Record<string, unknown>;
  photos: { mark: "crack" | "ring" | "haze"; hue: { r: number; g: number; b: number } }[];
  thread: { fromStudio: boolean; body: string; hoursAgo: number }[];
  state: Claim["state"];
  decision?: { decision: NonNullable<Claim["decision"]>; coveredPct: number; reason: string; hoursAgo: number };
};

const NO = { heat: "no", chemicals: "no", impact: "no", usedOutdoors: "no", directSun: "no" };
const WALNUT = { r: 120, g: 82, b: 56 };
const CHERRY = { r: 150, g: 86, b: 60 };
const MAPLE = { r: 196, g: 170, b: 130 };
const OAK = { r: 190, g: 160, b: 118 };

const SPECS: Spec[] = [
  {
    piece: "Cherry writing desk",
    owner: "jonah@owners.example",
    category: "crack_gap",
    hoursAgo: 20,
    noticedDaysAgo: 3,
    description: "A hairline crack has opened at the back left corner of the top, about 8 cm long. It wasn't there in the autumn. (Invented demo claim.)",
    answers: { ...NO, room: { unit: "F", driestTemp: 68, driestRh: 28, dampestTemp: 74, dampestRh: 55 } },
    photos: [
      { mark: "crack", hue: CHERRY },
      { mark: "crack", hue: CHERRY },
    ],
    thread: [],
    state: "submitted",
  },
  {
    piece: "White oak kitchen island top",
    owner: "holloway@owners.example",
    category: "finish_wear",
    hoursAgo: 4 * 24,
    noticedDaysAgo: 10,
    description: "Pale rings by the sink where the drying rack sits, and the sheen is duller there. (Invented demo claim.)",
    answers: { ...NO, chemicals: "unsure" },
    photos: [{ mark: "ring", hue: OAK }],
    thread: [
      { fromStudio: true, body: "Thanks for the photos. Do you use any spray cleaner on the top, and if so which kind? (Invented.)", hoursAgo: 3 * 24 },
    ],
    state: "awaiting_owner",
  },
  {
    piece: "Spalted maple coffee table, blue resin",
    owner: "jonah@owners.example",
    category: "resin_clouding",
    hoursAgo: 12 * 24,
    noticedDaysAgo: 20,
    description: "The blue resin river has a milky patch near the middle, roughly the size of a hand. (Invented demo claim.)",
    answers: { ...NO, directSun: "no" },
    photos: [
      { mark: "haze", hue: MAPLE },
      { mark: "haze", hue: MAPLE },
    ],
    thread: [
      { fromStudio: true, body: "We've had a look: this is within the resin warranty. We'll be in touch about polishing it out. (Invented.)", hoursAgo: 10 * 24 },
    ],
    state: "accepted",
    decision: { decision: "covered", coveredPct: 100, reason: "Clouding in the pour itself; covered by the resin line. (Invented.)", hoursAgo: 10 * 24 },
  },
  {
    piece: "Walnut river dining table",
    owner: "holloway@owners.example",
    category: "crack_gap",
    hoursAgo: 30 * 24,
    noticedDaysAgo: 35,
    description: "A gap has opened between the resin and the wood along one edge of the river. (Invented demo claim.)",
    answers: { ...NO, room: { unit: "F", driestTemp: 70, driestRh: 42, dampestTemp: 73, dampestRh: 58 } },
    photos: [{ mark: "crack", hue: WALNUT }],
    thread: [{ fromStudio: false, body: "We keep the room humidifier on all winter. (Invented.)", hoursAgo: 29 * 24 }],
    state: "declined",
    decision: {
      decision: "declined",
      coveredPct: 0,
      reason: "The crack and gap line ended at 24 months from delivery; we'd be glad to quote a repair. (Invented.)",
      hoursAgo: 27 * 24,
    },
  },
];

/** Seeds the demo claims; runs after the demo studio's transaction (photos are written to DATA_DIR). */
export async function seedClaims(db: Db, studioId: string, now = new Date()): Promise<number> {
  const staff = db
    .select({ id: users.id, name: users.name })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.studioId, studioId), eq(memberships.role, "staff")))
    .get();
  const studio = db.query.studios.findFirst({ where: (s, { eq: e }) => e(s.id, studioId) }).sync()!;
  let n = 0;
  for (const spec of SPECS) {
    const piece = db.select().from(pieces).where(and(eq(pieces.studioId, studioId), eq(pieces.title, spec.piece))).get();
    const owner = db.select().from(users).where(eq(users.email, spec.owner)).get();
    if (!piece || !owner || piece.ownerId !== owner.id) continue;
    const createdAt = new Date(now.getTime() - spec.hoursAgo * HOUR);
    const noticedOn = new Date(now.getTime() - spec.noticedDaysAgo * 24 * HOUR).toISOString().slice(0, 10);
    const stored = await Promise.all(spec.photos.map(async (p, i) => storeImage(await drawnPhoto(p.hue, p.mark, i + 1), owner.id)));
    const draft = { category: spec.category, answers: spec.answers, createdAt, ownerId: owner.id };
    const suggestion = spec.decision
      ? (() => {
          const c = claimCoverage({
            claim: draft,
            piece,
            layers: db.select().from(finishLayers).where(eq(finishLayers.pieceId, piece.id)).all(),
            careLog: db.select().from(careLogEntries).where(eq(careLogEntries.pieceId, piece.id)).all(),
            products: db.select().from(finishProducts).where(eq(finishProducts.studioId, studioId)).all(),
            policyRow: piece.warrantyPolicyId ? (db.select().from(warrantyPolicies).where(eq(warrantyPolicies.id, piece.warrantyPolicyId)).get() ?? null) : null,
            ownerships: db.select().from(ownerships).where(eq(ownerships.pieceId, piece.id)).all(),
            timeZone: studio.timeZone,
          });
          return suggestionRecord(c);
        })()
      : null;
    const firstStaff = spec.thread.find((m) => m.fromStudio);
    const firstAnsweredHoursAgo = Math.max(firstStaff?.hoursAgo ?? -Infinity, spec.decision?.hoursAgo ?? -Infinity);
    db.transaction((tx) => {
      const claim = tx
        .insert(claims)
        .values({
          studioId,
          pieceId: piece.id,
          ownerId: owner.id,
          category: spec.category,
          noticedOn,
          description: spec.description,
          answers: spec.answers,
          state: spec.state,
          decision: spec.decision?.decision ?? null,
          coveredPct: spec.decision?.coveredPct ?? null,
          decisionReason: spec.decision?.reason ?? null,
          suggestion,
          decidedAt: spec.decision ? new Date(now.getTime() - spec.decision.hoursAgo * HOUR) : null,
          decidedById: spec.decision ? (staff?.id ?? null) : null,
          firstAnsweredAt: Number.isFinite(firstAnsweredHoursAgo) ? new Date(now.getTime() - firstAnsweredHoursAgo * HOUR) : null,
          version: spec.state === "submitted" ? 0 : 2,
          createdAt,
          updatedAt: createdAt,
        })
        .returning()
        .get();
      for (const s of stored) tx.insert(files).values({ studioId, purpose: "claim_photo", pieceId: piece.id, claimId: claim.id, uploadedById: owner.id, createdAt, ...s }).run();
      for (const m of [...spec.thread].sort((a, b) => b.hoursAgo - a.hoursAgo)) {
        const at = new Date(now.getTime() - m.hoursAgo * HOUR);
        appendMessage(tx, threadFor(tx, { kind: "claim", id: claim.id }, at), { author: m.fromStudio ? "staff" : "owner", authorId: m.fromStudio ? (staff?.id ?? null) : owner.id, body: m.body, now: at });
      }
      tx.insert(auditLog).values({ studioId, actorId: owner.id, action: "claim.submitted", subjectType: "claim", subjectId: claim.id, data: { seeded: true }, createdAt }).run();
      if (spec.decision) {
        tx.insert(auditLog)
          .values({
            studioId,
            actorId: staff?.id ?? null,
            action: "claim.decided",
            subjectType: "claim",
            subjectId: claim.id,
            data: { decision: spec.decision.decision, coveredPct: spec.decision.coveredPct, reason: spec.decision.reason, suggestion, seeded: true },
            createdAt: new Date(now.getTime() - spec.decision.hoursAgo * HOUR),
          })
          .run();
      }
    });
    n++;
  }
  return n;
}
