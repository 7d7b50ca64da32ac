// Rows that already hold dates far outside any sensible range (written before the input ranges
// existed, or by hand) don't break the pages that list them: the owner's pieces, the reminders view,
// the claims CSV, audit, today and the calendar. Written straight into the e2e database, in a studio
// of their own (invented) so no other spec sees them.
import { randomUUID } from "node:crypto";
import Database from "better-sqlite3";
import { expect, test, type Page } from "@playwright/test";
import { ACCOUNTS, DATABASE_FILE, signIn } from "./helpers";

const FAR = "9999-12-31";
const suffix = randomUUID().slice(0, 8);
const OWNER = `far-owner-${suffix}@owners.example`;
const ADMIN = `far-admin-${suffix}@far-studio.example`;

function seedFarRows() {
  const db = new Database(DATABASE_FILE, { fileMustExist: true, timeout: 10_000 });
  try {
    const now = Date.now();
    const hash = (db.prepare("SELECT password_hash AS h FROM users WHERE email = ?").get(ACCOUNTS.admin) as { h: string }).h;
    const studioId = randomUUID();
    db.prepare("INSERT INTO studios (id, slug, name, time_zone, created_at) VALUES (?, ?, ?, 'America/New_York', ?)").run(studioId, `far-${suffix}`, "Far Dates Studio (invented)", now);
    const user = (email: string, name: string) => {
      const id = randomUUID();
      db.prepare("INSERT INTO users (id, email, name, password_hash, email_verified_at, created_at) VALUES (?, ?, ?, ?, ?, ?)").run(id, email, name, hash, now, now);
      return id;
    };
    const ownerId = user(OWNER, "Far Owner (invented)");
    const adminId = user(ADMIN, "Far Admin (invented)");
    db.prepare("INSERT INTO memberships (id, studio_id, user_id, role, created_at) VALUES (?, ?, ?, 'admin', ?)").run(randomUUID(), studioId, adminId, now);
    const piece = (title: string, deliveredOn: string) => {
      const id = randomUUID();
      db.prepare(
        "INSERT INTO pieces (id, studio_id, owner_id, registered_at, kind, title, shape_kind, length_mm, width_mm, primary_species_id, use, delivered_on, registration_code_hash, registration_code_enc, created_at, updated_at) VALUES (?, ?, ?, ?, 'dining_table', ?, 'rectangle', 2000, 900, 'black_walnut', 'heavy', ?, ?, ?, ?, ?)",
      ).run(id, studioId, ownerId, now, title, deliveredOn, `far-hash-${id}`, `far-enc-${id}`, now, now);
      db.prepare("INSERT INTO finish_layers (id, studio_id, piece_id, surface, position, finish_class, coats, applied_on, created_at) VALUES (?, ?, ?, 'top', 0, 'hardwax_oil', 2, ?, ?)").run(randomUUID(), studioId, id, deliveredOn, now);
      return id;
    };
    const far = piece("Far-future table (invented)", FAR);
    piece("Ancient table (invented)", "0001-01-01");
    const normal = piece("Ordinary table (invented)", "2024-05-01");
    db.prepare("INSERT INTO care_log_entries (id, studio_id, piece_id, user_id, source, task_kind, surface, done_on, created_at, updated_at) VALUES (?, ?, ?, ?, 'owner', 'reoil', 'top', ?, ?, ?)").run(randomUUID(), studioId, normal, ownerId, FAR, now, now);
    const claimId = randomUUID();
    db.prepare("INSERT INTO claims (id, studio_id, piece_id, owner_id, category, noticed_on, description, answers, created_at, updated_at) VALUES (?, ?, ?, ?, 'finish_wear', ?, 'Rings from a vase (invented).', '{}', ?, ?)").run(claimId, studioId, normal, ownerId, FAR, now, now);
    db.prepare("INSERT INTO audit_log (id, studio_id, actor_id, action, subject_type, subject_id, data, created_at) VALUES (?, ?, ?, 'piece.updated', 'piece', ?, '{}', ?)").run(randomUUID(), studioId, adminId, far, Date.parse(`${FAR}T12:00:00Z`));
    return { far, normal, claimId };
  } finally {
    db.close();
  }
}

async function open(page: Page, path: string) {
  const res = await page.goto(path);
  expect(res?.status(), path).toBeLessThan(500);
  await expect(page.getByText("Something went wrong")).toHaveCount(0);
}

test("pages that list far-dated rows answer without a server error", async ({ page }) => {
  const rows = seedFarRows();

  await signIn(page, OWNER);
  for (const path of ["/pieces", `/pieces/${rows.far}`, `/pieces/${rows.normal}`, `/pieces/${rows.normal}/log`, "/claims", `/claims/${rows.claimId}`]) await open(page, path);

  await page.context().clearCookies();
  await signIn(page, ADMIN);
  for (const path of ["/studio", "/studio/pieces", `/studio/pieces/${rows.far}`, "/studio/claims", `/studio/claims/${rows.claimId}`, "/studio/reminders", "/studio/reports", "/studio/audit", `/studio/audit?to=${FAR}`, `/studio/today?date=${FAR}`, `/studio/visits?week=${FAR}`]) {
    await open(page, path);
  }
  const api = page.request;
  for (const path of ["/api/reminders?view=upcoming", "/api/reminders?view=ledger", "/api/studio/reports/claims.csv", "/api/pieces/export.csv"]) {
    const res = await api.get(path);
    expect(res.status(), path).toBe(200);
  }
  // A far date typed into a filter is a 400 beside the field, never a 500.
  for (const path of [`/api/studio/reports/claims.csv?to=${FAR}`, `/api/visits?from=${FAR}T00:00:00Z&to=${FAR}T12:00:00Z`]) {
    const res = await api.get(path);
    expect(res.status(), path).toBe(400);
    expect((await res.json()).error.code).toBe("bad_request");
  }
});
