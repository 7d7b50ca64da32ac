// Shared by the reminders integration tests (not a test file itself). Each reminders test file works on
// its own freshly migrated SQLite file, so its passes (which cover every studio in the database) never
// mail the owners of other test files. Everything here is invented test data.
import { spawn } from "node:child_process";
import fs from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import { openDatabase } from "@/db/client";
import { applyMigrations } from "@/db/migrate";
import { finishLayers, finishProducts, pieces, reminderSends, studios, users, type Studio } from "@/db/schema";
import { getDb } from "@/db/client";
import type { FinishClass, Surface, Use, SunExposure } from "@/lib/care/vocabulary";
import { newRegistrationCode } from "@/lib/pieces/registration";

let n = 0;
export const uniq = (p: string) => `${p}-${process.pid}-${Date.now().toString(36)}-${++n}`;

/** A fresh migrated database file for this test file; getDb() (and child processes given `env`) use it. */
export function ownDatabaseFile(name: string): string {
  const dir = path.resolve("tests/.tmp", `reminders-${name}-${process.pid}-${Date.now()}`);
  fs.mkdirSync(dir, { recursive: true });
  const file = path.join(dir, "reminders.db");
  const db = openDatabase(file);
  applyMigrations(db);
  db.$client.close();
  process.env.DATABASE_URL = file;
  return file;
}

export type Products = Record<"oil" | "ceramic" | "wax" | "varnish" | "epoxy" | "charred", string>;

export function seedStudio(overrides: Partial<typeof studios.$inferInsert> = {}): { studio: Studio; products: Products } {
  const db = getDb();
  const studio = db
    .insert(studios)
    .values({
      slug: uniq("studio"),
      name: "Test Slab Studio (invented)",
      timeZone: "America/Los_Angeles",
      currency: "USD",
      taxRateBp: 825,
      labourRateMinor: 8000,
      travelFeeMinor: 4000,
      ...overrides,
    })
    .returning()
    .get();
  const add = (name: string, finishClass: FinishClass, coverageM2PerL: number, containers: { ml: number; priceMinor: number }[]) =>
    db.insert(finishProducts).values({ studioId: studio.id, name, finishClass, coverageM2PerL, containers }).returning().get().id;
  const products: Products = {
    oil: add("Test hardwax oil (invented)", "hardwax_oil", 24, [{ ml: 125, priceMinor: 1900 }, { ml: 750, priceMinor: 5600 }]),
    ceramic: add("Test ceramic topcoat (invented)", "ceramic_topcoat", 186, [{ ml: 50, priceMinor: 3400 }]),
    wax: add("Test paste wax (invented)", "paste_wax", 20, [{ ml: 200, priceMinor: 1600 }]),
    varnish: add("Test conversion varnish (invented)", "film_finish", 10, [{ ml: 1000, priceMinor: 6400 }]),
    epoxy: add("Test resin polish (invented)", "epoxy_surface", 30, [{ ml: 250, priceMinor: 2400 }]),
    charred: add("Test exterior oil (invented)", "charred_oiled", 12, [{ ml: 1000, priceMinor: 4200 }]),
  };
  return { studio, products };
}

/** An owner with a confirmed address (password hash is a placeholder: these owners never sign in). */
export function seedOwner(overrides: Partial<typeof users.$inferInsert> = {}) {
  return getDb()
    .insert(users)
    .values({ email: `${uniq("owner")}@owners.test`, name: "Test Owner", passwordHash: "not-a-real-hash", emailVerifiedAt: new Date("2025-01-01T00:00:00Z"), timeZone: "America/Los_Angeles", ...overrides })
    .returning()
    .get();
}

export type LayerSpec = { surface: Surface; finishClass: FinishClass; productId?: string; appliedOn: string; coats?: number };

export function seedPiece(
  studio: Studio,
  ownerId: string | null,
  spec: { deliveredOn: string; layers: LayerSpec[]; use?: Use; sun?: SunExposure; title?: string; resin?: "none" | "deep_pour" | "tabletop_coat"; paused?: boolean },
) {
  const db = getDb();
  const { hash, enc } = newRegistrationCode();
  const piece = db
    .insert(pieces)
    .values({
      studioId: studio.id,
      kind: "dining_table",
      title: spec.title ?? "Test walnut table (invented)",
      shapeKind: "rectangle",
      lengthMm: 2000,
      widthMm: 1000,
      primarySpeciesId: "black_walnut",
      use: spec.use ?? "heavy",
      sun: spec.sun ?? "none",
      resinKind: spec.resin ?? "none",
      deliveredOn: spec.deliveredOn,
      ownerId,
      registeredAt: ownerId ? new Date(`${spec.deliveredOn}T18:00:00Z`) : null,
      remindersPaused: spec.paused ?? false,
      registrationCodeHash: hash,
      registrationCodeEnc: enc,
    })
    .returning()
    .get();
  spec.layers.forEach((l, i) =>
    db
      .insert(finishLayers)
      .values({ studioId: studio.id, pieceId: piece.id, surface: l.surface, position: i, finishClass: l.finishClass, productId: l.productId ?? null, coats: l.coats ?? 1, appliedOn: l.appliedOn })
      .run(),
  );
  return piece;
}

export function ledgerOf(pieceId: string) {
  return getDb().select().from(reminderSends).where(eq(reminderSends.pieceId, pieceId)).all();
}

/** `npm run jobs:run-once -- --now <iso>` as a real child process against this file's database. */
export function runOnce(nowIso: string, env: Record<string, string> = {}): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve, reject) => {
    const child = spawn(path.resolve("node_modules/.bin/tsx"), ["jobs/run-once.ts", "--now", nowIso], {
      cwd: path.resolve("."),
      env: { ...process.env, ...env },
      stdio: ["ignore", "pipe", "pipe"],
    });
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (c) => (stdout += c));
    child.stderr.on("data", (c) => (stderr += c));
    child.on("error", reject);
    child.on("exit", (code) => resolve({ code, stdout, stderr }));
  });
}
