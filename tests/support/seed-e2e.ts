// Seeds the e2e database: the demo studio plus a second, invented studio whose staff must never see
// the demo studio's data. Writes the ids the specs need to tests/.tmp/e2e-fixture.json.
import fs from "node:fs";
import path from "node:path";
import { and, eq, isNotNull } from "drizzle-orm";
import { getDb } from "@/db/client";
import { careLogEntries, claims, files, finishProducts, memberships, pieces, reminderSends, repairJobs, studios, users, visits } from "@/db/schema";
import { DEMO_PASSWORD, DEMO_STUDIO_SLUG, seedDemo } from "@/db/seed/demo";
import { hashPassword } from "@/lib/auth/password";
import { newRegistrationCode } from "@/lib/pieces/registration";
import { indexPiece } from "@/lib/pieces/search-index";
import { priceJob, pricedPiece, totals } from "@/lib/repairs/pricing";

const db = getDb();
const demoSeed = await seedDemo(db);
const other = db.insert(studios).values({ slug: "other-studio", name: "Other Studio (invented)", timeZone: "Europe/Berlin" }).returning().get();
const staff = db
  .insert(users)
  .values({ email: "staff@other-studio.example", name: "Other Staff", passwordHash: await hashPassword(DEMO_PASSWORD), emailVerifiedAt: new Date() })
  .returning()
  .get();
db.insert(memberships).values({ studioId: other.id, userId: staff.id, role: "staff" }).run();
const code = newRegistrationCode();
const otherPiece = db
  .insert(pieces)
  .values({
    studioId: other.id,
    kind: "desk",
    title: "Other studio's desk",
    shapeKind: "rectangle",
    lengthMm: 1400,
    widthMm: 700,
    primarySpeciesId: "american_beech",
    use: "moderate",
    deliveredOn: "2026-01-15",
    registrationCodeHash: code.hash,
    registrationCodeEnc: code.enc,
  })
  .returning()
  .get();
indexPiece(db, otherPiece.id);
const demo = db.select().from(studios).where(eq(studios.slug, DEMO_STUDIO_SLUG)).get()!;
const demoPiece = db.select().from(pieces).where(eq(pieces.studioId, demo.id)).get()!;

// For the authorization matrix (tests/e2e/authz-matrix.spec.ts): an admin of the other studio, a spare
// unowned piece there that the matrix registers and releases again, and the ids of the demo rows the
// matrix aims at (the owner's claim, photo, care-log entry, visits, a sent reminder, memberships).
const otherAdmin = db
  .insert(users)
  .values({ email: "admin@other-studio.example", name: "Other Admin", passwordHash: await hashPassword(DEMO_PASSWORD), emailVerifiedAt: new Date() })
  .returning()
  .get();
db.insert(memberships).values({ studioId: other.id, userId: otherAdmin.id, role: "admin" }).run();
const spareCode = newRegistrationCode();
const spare = db
  .insert(pieces)
  .values({
    studioId: other.id,
    kind: "shelf",
    title: "Other studio's spare shelf (invented, for the authorization matrix)",
    shapeKind: "rectangle",
    lengthMm: 900,
    widthMm: 250,
    primarySpeciesId: "red_oak",
    use: "light",
    deliveredOn: "2026-01-20",
    registrationCodeHash: spareCode.hash,
    registrationCodeEnc: spareCode.enc,
  })
  .returning()
  .get();
indexPiece(db, spare.id);
const userId = (email: string) => db.select({ id: users.id }).from(users).where(eq(users.email, email)).get()!.id;
const holloway = userId("holloway@owners.example");
const ownerPiece = db.select().from(pieces).where(and(eq(pieces.studioId, demo.id), eq(pieces.ownerId, holloway), eq(pieces.title, "Walnut river dining table"))).get()!;
const demoClaims = db.select({ id: claims.id, state: claims.state, ownerId: claims.ownerId }).from(claims).where(eq(claims.studioId, demo.id)).all();
const ownerClaim = demoClaims.find((c) => c.ownerId === holloway && c.state === "declined")!;
const ownerClaimPhoto = db.select({ id: files.id }).from(files).where(and(eq(files.claimId, ownerClaim.id), eq(files.purpose, "claim_photo"))).get()!;
const ownerCareLogEntry = db
  .select({ id: careLogEntries.id })
  .from(careLogEntries)
  .where(and(eq(careLogEntries.pieceId, ownerPiece.id), eq(careLogEntries.userId, holloway), eq(careLogEntries.source, "owner")))
  .get()!;
const demoVisits = db
  .select({ id: visits.id, state: visits.state, technicianId: visits.technicianId, ownerId: repairJobs.ownerId })
  .from(visits)
  .innerJoin(repairJobs, eq(repairJobs.id, visits.jobId))
  .where(eq(visits.studioId, demo.id))
  .all();
const ines = userId("ines@larchmere.example");
const sol = userId("sol@larchmere.example");
const membershipOf = (uid: string) => db.select({ id: memberships.id }).from(memberships).where(and(eq(memberships.studioId, demo.id), eq(memberships.userId, uid))).get()!.id;
const sentReminder = db.select({ id: reminderSends.id }).from(reminderSends).where(and(eq(reminderSends.studioId, demo.id), eq(reminderSends.status, "sent"), isNotNull(reminderSends.sentAt))).get()!;
const matrix = {
  demoStudioId: demo.id,
  otherStudioId: other.id,
  ownerPieceId: ownerPiece.id,
  ownerPieceDeliveredOn: ownerPiece.deliveredOn,
  ownerPiecePaused: ownerPiece.remindersPaused,
  ownerClaimId: ownerClaim.id,
  ownerClaimPhotoId: ownerClaimPhoto.id,
  ownerCareLogEntryId: ownerCareLogEntry.id,
  doneVisitId: demoVisits.find((v) => v.state === "done" && v.technicianId === ines && v.ownerId === holloway)!.id,
  solBookedVisitId: demoVisits.find((v) => v.state === "booked" && v.technicianId === sol && v.ownerId === holloway)!.id,
  inesId: ines,
  solId: sol,
  adminMembershipId: membershipOf(userId("maren@larchmere.example")),
  technicianMembershipId: membershipOf(ines),
  sentReminderId: sentReminder.id,
  spare: { pieceId: spare.id, code: spareCode.code },
};
// For the quote builder's unsized-work notice (tests/e2e/quote-unsized.spec.ts): a draft job re-oiling the
// oiled base of Jonah's resin coffee table, whose top is polished resin, so the work is on the base and
// the piece's record has no size for it: nothing is proposed until staff type the base's area.
const coffeeTable = db.select().from(pieces).where(and(eq(pieces.studioId, demo.id), eq(pieces.title, "Walnut and maple resin coffee table"))).get()!;
const demoProducts = db.select().from(finishProducts).where(eq(finishProducts.studioId, demo.id)).all();
const baseInput = {
  title: "Re-oil the waterfall legs (invented)",
  tasks: ["reoil" as const],
  productIds: demoProducts.filter((p) => p.finishClass === "hardwax_oil").map((p) => p.id).slice(0, 1),
  coats: 1,
  travel: false,
  coveredPct: 0,
  notes: "",
};
const unsizedBase = db
  .insert(repairJobs)
  .values({ studioId: demo.id, pieceId: coffeeTable.id, ownerId: coffeeTable.ownerId, origin: "studio", title: baseInput.title, quoteInput: baseInput, currency: demo.currency, state: "draft", notes: "Invented e2e job.", ...totals(priceJob(demo, pricedPiece(db, coffeeTable), baseInput, demoProducts)) })
  .returning({ id: repairJobs.id })
  .get();
// For the quote builder's "Also price the base" choice (tests/e2e/quotes.spec.ts): a draft re-wax of Jonah's
// cherry writing desk, whose top and base both end in paste wax, priced on the top alone until staff tick the base.
const desk = db.select().from(pieces).where(and(eq(pieces.studioId, demo.id), eq(pieces.title, "Cherry writing desk"))).get()!;
const deskInput = { ...baseInput, title: "Re-wax the desk, top and legs (invented)", tasks: ["rewax" as const], productIds: demoProducts.filter((p) => p.finishClass === "paste_wax").map((p) => p.id).slice(0, 1) };
const waxTopAndBase = db
  .insert(repairJobs)
  .values({ studioId: demo.id, pieceId: desk.id, ownerId: desk.ownerId, origin: "studio", title: deskInput.title, quoteInput: deskInput, currency: demo.currency, state: "draft", notes: "Invented e2e job.", ...totals(priceJob(demo, pricedPiece(db, desk), deskInput, demoProducts)) })
  .returning({ id: repairJobs.id })
  .get();
// E2E_FIXTURE_FILE: another place for the ids, for a second e2e server on other ports and its own database.
const fixtureFile = process.env.E2E_FIXTURE_FILE ?? "tests/.tmp/e2e-fixture.json";
fs.mkdirSync(path.dirname(fixtureFile), { recursive: true });
fs.writeFileSync(fixtureFile, JSON.stringify({ demoPieceId: demoPiece.id, otherPieceId: otherPiece.id, unregistered: demoSeed.codes, jobs: { ...demoSeed.jobs, unsizedBase: unsizedBase.id, waxTopAndBase: waxTopAndBase.id }, matrix }, null, 2));
console.log("Seeded the e2e database (invented data).");
