// Seeds the e2e database: the demo studio plus a second, invented studio whose staff must never see
// the demo studio's data. Writes the ids the specs need to tests/.tmp/e2e-fixture.json.
import fs from "node:fs";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { memberships, pieces, studios, users } from "@/db/schema";
import { DEMO_PASSWORD, DEMO_STUDIO_SLUG, seedDemo } from "@/db/seed/demo";
import { hashPassword } from "@/lib/auth/password";
import { newRegistrationCode } from "@/lib/pieces/registration";
import { indexPiece } from "@/lib/pieces/search-index";

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
fs.mkdirSync("tests/.tmp", { recursive: true });
fs.writeFileSync("tests/.tmp/e2e-fixture.json", JSON.stringify({ demoPieceId: demoPiece.id, otherPieceId: otherPiece.id, unregistered: demoSeed.codes, jobs: demoSeed.jobs }, null, 2));
console.log("Seeded the e2e database (invented data).");
