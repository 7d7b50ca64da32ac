// A client's personal data (export as a zip, erasure on request), the clients CSV export (scoped to
// the studio, the list's filters, formula-safe cells), the list's invited / reminders-paused filters,
// the piece CSV import's buyer columns (matched by e-mail, then phone; nothing duplicated), and the
// client made or linked when a released piece is registered by its next owner.
import fs from "node:fs";
import path from "node:path";
import { and, eq, sql } from "drizzle-orm";
import { unzipSync, strFromU8 } from "fflate";
import Papa from "papaparse";
import sharp from "sharp";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import {
  careLogEntries,
  claims,
  clientConsents,
  clients,
  files,
  finishLayers,
  ownerships,
  payments,
  pieceHandovers,
  pieces,
  reminderSends,
  repairJobs,
  threadMessages,
  threads,
  users,
  visits,
  warrantyPolicies,
} from "@/db/schema";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { createClient } from "@/lib/clients/create";
import { exportClientsCsv, listClients } from "@/lib/clients/list";
import { clientDataSections, ERASED_NAME, eraseClient, exportClientData } from "@/lib/clients/personal-data";
import { env } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { registerPiece } from "@/lib/owner/registration";
import { releasePiece } from "@/lib/owner/transfer";
import { importPiecesCsv } from "@/lib/pieces/csv";
import { sendHandover } from "@/lib/pieces/handover";
import { createHandoverBatch, handoverBatchProgress, runHandoverBatch } from "@/lib/pieces/handover-batch";
import { storeImage } from "@/lib/storage";
import { clientListQuerySchema, createClientSchema } from "@/lib/validation/clients";
import { auditsOf, createAcceptedClaim, createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { listMail, waitForMail } from "../support/mail";

const NOW = new Date("2026-11-20T18:00:00Z");
let ipSeq = 0;
const freshIp = () => `10.29.${(++ipSeq >> 8) & 255}.${ipSeq & 255}`;
const query = (raw: Record<string, string> = {}) => clientListQuerySchema.parse(raw);

async function studioWith() {
  const studio = createStudio({ timeZone: "America/Los_Angeles", country: "US" });
  const policy = getDb().insert(warrantyPolicies).values({ studioId: studio.id, version: 1, effectiveFrom: "2024-01-01", policy: DEFAULT_WARRANTY_POLICY }).returning().get();
  return { studio, policy, staff: await memberContext(studio, "staff"), admin: await memberContext(studio, "admin") };
}

async function tinyPng(): Promise<Uint8Array> {
  return new Uint8Array(await sharp({ create: { width: 32, height: 24, channels: 3, background: { r: 120, g: 80, b: 40 } } }).png().toBuffer());
}

/** A client with an account, a registered piece, care with a photo, a claim with a photo and a message, a job, a payment, a visit, a reminder. */
async function personWithHistory() {
  const w = await studioWith();
  const db = getDb();
  const email = `${unique("wren")}@test.example`;
  const name = `Wren Halloway ${unique("n")} (invented)`;
  const address = `${unique("addr")} Kiln Street, Port Alder (invented)`;
  const mark = unique("said"); // in everything the person wrote, so a scan finds this person's words only
  const owner = await createUser({ email, name, emailVerifiedAt: NOW });
  const client = createClient(w.staff, createClientSchema.parse({ name, email, phone: "(415) 555-0177", address, notes: `Prefers mornings ${mark} (invented).`, consent: { service: { granted: true, source: "paper" } } }), NOW);
  const { piece, code } = createPiece(w.studio, { clientId: client.id, deliveryAddress: address, warrantyPolicyId: w.policy.id, title: `Ash bench ${unique("b")} (invented)` });
  await registerPiece(owner, { code }, freshIp(), NOW);
  const care = await storeImage(await tinyPng(), owner.id);
  const careFile = db.insert(files).values({ studioId: w.studio.id, purpose: "care_log_photo", pieceId: piece.id, storageKey: care.storageKey, thumbKey: care.thumbKey, contentType: care.contentType, width: care.width, height: care.height, bytes: care.bytes, uploadedById: owner.id }).returning().get();
  db.insert(careLogEntries).values({ studioId: w.studio.id, pieceId: piece.id, userId: owner.id, source: "owner", taskKind: "reoil", doneOn: "2026-10-01", notes: `Oiled on the porch ${mark} (invented).`, photoFileId: careFile.id }).run();
  const claim = createAcceptedClaim(w.studio, piece.id, owner.id, "covered");
  db.update(claims).set({ description: `A ring from a hot mug ${mark} (invented).` }).where(eq(claims.id, claim.id)).run();
  const shot = await storeImage(await tinyPng(), owner.id);
  const claimFile = db.insert(files).values({ studioId: w.studio.id, purpose: "claim_photo", claimId: claim.id, pieceId: piece.id, storageKey: shot.storageKey, thumbKey: shot.thumbKey, contentType: shot.contentType, width: shot.width, height: shot.height, bytes: shot.bytes, uploadedById: owner.id }).returning().get();
  const thread = db.insert(threads).values({ studioId: w.studio.id, subject: "claim", claimId: claim.id, pieceId: piece.id, ownerId: owner.id, lastMessageAt: NOW }).returning().get();
  db.insert(threadMessages).values({ studioId: w.studio.id, threadId: thread.id, author: "owner", authorId: owner.id, source: "email", fromEmail: email, body: `Still tacky near the edge ${mark} (invented).` }).run();
  db.insert(threadMessages).values({ studioId: w.studio.id, threadId: thread.id, author: "staff", authorId: w.staff.user.id, body: "We'll look at it (invented)." }).run();
  const job = db.insert(repairJobs).values({ studioId: w.studio.id, pieceId: piece.id, ownerId: owner.id, origin: "claim", claimId: claim.id, state: "done", title: "Re-oil the top (invented)", quoteInput: {}, lines: [], currency: "USD", totalMinor: 9_000 }).returning().get();
  db.insert(payments).values({ studioId: w.studio.id, jobId: job.id, quoteVersion: 1, checkoutSessionId: unique("cs"), amountMinor: 9_000, currency: "USD", status: "paid" }).run();
  db.insert(visits).values({ studioId: w.studio.id, jobId: job.id, pieceId: piece.id, technicianId: w.staff.user.id, startAt: NOW, endAt: NOW, locationKind: "owner", location: address, icsUid: unique("uid"), state: "done", jobStateBefore: "paid" }).run();
  db.insert(reminderSends).values({ studioId: w.studio.id, pieceId: piece.id, userId: owner.id, reminderKey: unique("rk"), taskKey: "t", taskKind: "reoil", step: "due_day", dueOn: "2026-10-01", status: "sent", sentAt: NOW }).run();
  return { ...w, owner, client, piece, claim, thread, files: [careFile, claimFile], email, name, address, mark };
}

describe("a client's personal data", () => {
  it("exports every row about the person, and their photos, as a zip (404 for another studio's client)", async () => {
    const p = await personWithHistory();
    const { zip } = await exportClientData(p.admin, p.client.id, NOW);
    const entries = unzipSync(zip);
    const data = JSON.parse(strFromU8(entries["data.json"]!)) as Record<string, Record<string, unknown>[]>;
    const ids = (section: string) => data[section]!.map((r) => r.id).sort();
    const db = getDb();
    const byIds = (rows: { id: string }[]) => rows.map((r) => r.id).sort();
    // Every row about the person, section by section, compared with the tables.
    expect(ids("client")).toEqual([p.client.id]);
    expect(ids("consent_history")).toEqual(byIds(db.select({ id: clientConsents.id }).from(clientConsents).where(eq(clientConsents.clientId, p.client.id)).all()));
    expect(ids("consent_history")).toHaveLength(1);
    expect(ids("account")).toEqual([p.owner.id]);
    expect(data.account![0]).not.toHaveProperty("password_hash");
    expect(ids("pieces")).toEqual([p.piece.id]);
    expect(data.pieces![0]).not.toHaveProperty("registration_code_enc");
    expect(ids("ownerships")).toEqual(byIds(db.select({ id: ownerships.id }).from(ownerships).where(eq(ownerships.userId, p.owner.id)).all()));
    expect(ids("care_log")).toEqual(byIds(db.select({ id: careLogEntries.id }).from(careLogEntries).where(eq(careLogEntries.userId, p.owner.id)).all()));
    expect(ids("claims")).toEqual([p.claim.id]);
    expect(ids("conversations")).toEqual([p.thread.id]);
    expect(ids("conversation_messages")).toEqual(byIds(db.select({ id: threadMessages.id }).from(threadMessages).where(eq(threadMessages.threadId, p.thread.id)).all()));
    expect(ids("conversation_messages")).toHaveLength(2);
    expect(ids("repair_jobs")).toEqual(byIds(db.select({ id: repairJobs.id }).from(repairJobs).where(eq(repairJobs.ownerId, p.owner.id)).all()));
    expect(ids("payments")).toHaveLength(1);
    expect(ids("visits")).toHaveLength(1);
    expect(ids("care_reminders_sent")).toEqual(byIds(db.select({ id: reminderSends.id }).from(reminderSends).where(eq(reminderSends.userId, p.owner.id)).all()));
    expect(ids("photos")).toEqual(p.files.map((f) => f.id).sort());
    expect(ids("record_changes").length).toBeGreaterThanOrEqual(1);
    // The photos themselves, byte for byte.
    for (const f of p.files) {
      const stored = fs.readFileSync(path.join(env.DATA_DIR, f.storageKey));
      expect(Buffer.from(entries[`photos/${f.id}.jpg`]!).equals(stored)).toBe(true);
    }
    expect(JSON.stringify(data)).toContain(p.address);
    // Another studio's admin gets a 404; the export was recorded without its contents.
    const other = await memberContext(createStudio(), "admin");
    await expect(exportClientData(other, p.client.id, NOW)).rejects.toMatchObject({ status: 404 });
    const audit = auditsOf(p.client.id, "client.exported");
    expect(audit).toHaveLength(1);
    expect(JSON.stringify(audit[0]!.data)).not.toContain(p.email);
  });

  it("erases: no personal field left anywhere in the studio's data, photos gone, the warranty record intact", async () => {
    const p = await personWithHistory();
    const db = getDb();
    await sendHandover(p.staff, createPiece(p.studio, { clientId: p.client.id, title: "Unregistered stool (invented)" }).piece.id, NOW);
    const layersBefore = db.select().from(finishLayers).where(eq(finishLayers.pieceId, p.piece.id)).all();
    const report = await eraseClient(p.admin, p.client.id, NOW);
    expect(report).toMatchObject({ pieces: 2, photos: 2, claims: 1, messages: 1 });

    const c = db.select().from(clients).where(eq(clients.id, p.client.id)).get()!;
    expect(c).toMatchObject({ name: ERASED_NAME, email: null, phone: null, address: "", notes: "", timeZone: null, userId: null, consentService: false, consentOffers: false });
    expect(db.select().from(clientConsents).where(eq(clientConsents.clientId, p.client.id)).all()).toHaveLength(0);
    expect(db.select().from(pieceHandovers).where(eq(pieceHandovers.clientId, p.client.id)).all().map((h) => [h.email, h.tokenHash])).toEqual([[null, null]]);
    // Photos: rows and files gone.
    for (const f of p.files) {
      expect(db.select().from(files).where(eq(files.id, f.id)).get()).toBeUndefined();
      expect(fs.existsSync(path.join(env.DATA_DIR, f.storageKey))).toBe(false);
    }
    // The warranty record: the piece, its layers, policy, care done, the claim's decision, the job and payment.
    const piece = db.select().from(pieces).where(eq(pieces.id, p.piece.id)).get()!;
    expect(piece).toMatchObject({ title: p.piece.title, deliveredOn: p.piece.deliveredOn, clientId: p.client.id, ownerId: null, deliveryAddress: "" });
    expect(piece.warrantyPolicyId).toBe(p.policy.id);
    expect(db.select().from(finishLayers).where(eq(finishLayers.pieceId, p.piece.id)).all()).toEqual(layersBefore);
    expect(db.select({ doneOn: careLogEntries.doneOn, userId: careLogEntries.userId }).from(careLogEntries).where(eq(careLogEntries.pieceId, p.piece.id)).all()).toEqual([{ doneOn: "2026-10-01", userId: null }]);
    expect(db.select({ decision: claims.decision, category: claims.category }).from(claims).where(eq(claims.id, p.claim.id)).get()).toEqual({ decision: "covered", category: "finish_wear" });
    expect(db.select({ n: sql<number>`count(*)` }).from(payments).innerJoin(repairJobs, eq(repairJobs.id, payments.jobId)).where(eq(repairJobs.pieceId, p.piece.id)).get()!.n).toBe(1);
    expect(db.select().from(ownerships).where(eq(ownerships.pieceId, p.piece.id)).all().every((o) => o.endedAt?.getTime() === NOW.getTime())).toBe(true);

    // No trace of the person in any of the studio's tables (their own account is theirs, not the studio's).
    const traces: string[] = [];
    for (const { name } of db.all<{ name: string }>(sql`SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%' AND name NOT LIKE '%fts%' AND name NOT IN ('users', 'sessions', 'mail_queue', '__drizzle_migrations')`)) {
      for (const row of db.all<Record<string, unknown>>(sql.raw(`SELECT * FROM "${name}"`))) {
        const text = JSON.stringify(row);
        for (const needle of [p.email, p.name, p.address, p.mark]) if (text.includes(needle)) traces.push(`${name}: ${needle}`);
      }
    }
    expect(traces).toEqual([]);
    // The audit log keeps that it happened, not the data.
    const erased = auditsOf(p.client.id, "client.erased")[0]!;
    expect(erased.data).toEqual({ pieces: 2, photos: 2, claims: 1, messages: 1 });
    expect(erased.actorId).toBe(p.admin.user.id);
    // After erasure, the export holds nothing personal.
    const after = clientDataSections(p.admin, p.client.id);
    expect(after.account).toEqual([]);
    expect(after.photos).toEqual([]);
  });

  it("refuses another studio's client (404) and leaves it untouched", async () => {
    const p = await studioWith();
    const c = createClient(p.staff, createClientSchema.parse({ name: "Kept Person (invented)", email: `${unique("kept")}@test.example` }), NOW);
    const other = await memberContext(createStudio(), "admin");
    await expect(eraseClient(other, c.id, NOW)).rejects.toBeInstanceOf(AppError);
    expect(getDb().select({ name: clients.name }).from(clients).where(eq(clients.id, c.id)).get()!.name).toBe("Kept Person (invented)");
  });
});

describe("the clients CSV export and the list's filters", () => {
  it("exports the filtered list of the caller's studio only, every page, with formula-safe cells", async () => {
    const { studio, staff } = await studioWith();
    const other = await studioWith();
    createClient(other.staff, createClientSchema.parse({ name: "Other Studio Person (invented)" }), NOW);
    const risky = createClient(staff, createClientSchema.parse({ name: "=HYPERLINK(\"http://evil.example\")", email: `${unique("risky")}@test.example`, address: "+1 Plus Road", notes: "x" }), NOW);
    createClient(staff, createClientSchema.parse({ name: "@SUM(A1)", phone: "+44 20 7946 0018" }), NOW);
    createClient(staff, createClientSchema.parse({ name: "-2+3 Minus (invented)" }), NOW);
    for (let i = 0; i < 55; i++) createClient(staff, createClientSchema.parse({ name: `Plain Person ${i} (invented)` }), NOW);
    const rows = Papa.parse<Record<string, string>>(exportClientsCsv(staff, query()), { header: true }).data;
    expect(rows).toHaveLength(58); // more than one page of the list
    expect(rows.some((r) => r.name!.includes("Other Studio"))).toBe(false);
    const names = rows.map((r) => r.name);
    expect(names).toContain("'=HYPERLINK(\"http://evil.example\")");
    expect(names).toContain("'@SUM(A1)");
    expect(names).toContain("'-2+3 Minus (invented)");
    expect(rows.find((r) => r.name === "'@SUM(A1)")!.phone).toBe("'+44 20 7946 0018");
    expect(rows.find((r) => r.email === risky.email)!.address).toBe("'+1 Plus Road");
    for (const r of rows) for (const v of Object.values(r)) expect(v).not.toMatch(/^[=+\-@]/);
    // The search narrows the export like the list.
    createClient(staff, createClientSchema.parse({ name: "Zebulon Quist (invented)" }), NOW);
    expect(Papa.parse<Record<string, string>>(exportClientsCsv(staff, query({ q: "quist" })), { header: true }).data.map((r) => r.name)).toEqual(["Zebulon Quist (invented)"]);
    expect(studio.id).not.toBe(other.studio.id);
  });

  it("filters invited (hand-over sent, not registered) and reminders paused", async () => {
    const { studio, staff } = await studioWith();
    const consent = { service: { granted: true, source: "paper" as const } };
    const invited = createClient(staff, createClientSchema.parse({ name: "Invited Person (invented)", email: `${unique("inv")}@test.example`, consent }), NOW);
    const registeredBuyer = createClient(staff, createClientSchema.parse({ name: "Registered Buyer (invented)", email: `${unique("reg")}@test.example`, consent }), NOW);
    const paused = createClient(staff, createClientSchema.parse({ name: "Paused Person (invented)" }), NOW);
    createClient(staff, createClientSchema.parse({ name: "Nothing Special (invented)" }), NOW);
    await sendHandover(staff, createPiece(studio, { clientId: invited.id }).piece.id, NOW);
    const reg = createPiece(studio, { clientId: registeredBuyer.id });
    await sendHandover(staff, reg.piece.id, NOW);
    const regUser = await createUser({ email: registeredBuyer.email!, emailVerifiedAt: NOW });
    await registerPiece(regUser, { code: reg.code }, freshIp(), NOW);
    createPiece(studio, { clientId: paused.id, remindersPaused: true });
    expect(listClients(staff, query({ filter: "invited" })).rows.map((r) => r.id)).toEqual([invited.id]);
    expect(listClients(staff, query({ filter: "paused" })).rows.map((r) => r.id)).toEqual([paused.id]);
    // An account with care reminders switched off counts as paused too.
    getDb().update(users).set({ remindersEnabled: false }).where(eq(users.id, regUser.id)).run();
    expect(listClients(staff, query({ filter: "paused" })).rows.map((r) => r.id).sort()).toEqual([paused.id, registeredBuyer.id].sort());
    expect(Papa.parse<Record<string, string>>(exportClientsCsv(staff, query({ filter: "invited" })), { header: true }).data.map((r) => r.name)).toEqual(["Invited Person (invented)"]);
  });
});

describe("the piece CSV import's buyer columns", () => {
  const header = "title,kind,shape,length_mm,width_mm,primary_species,use,delivered_on,finish_stack,buyer_name,buyer_email,buyer_phone";
  const row = (title: string, buyer: string) => `${title},dining_table,rectangle,2000,900,black_walnut,heavy,2025-03-01,top:hardwax_oil:2:2025-03-01,${buyer}`;

  it("matches existing clients by e-mail, then phone, makes each new buyer once, and duplicates nothing on a second import", async () => {
    const { staff } = await studioWith();
    const byEmail = createClient(staff, createClientSchema.parse({ name: "Ada Fenwick (invented)", email: `${unique("ada")}@test.example` }), NOW);
    const byPhone = createClient(staff, createClientSchema.parse({ name: "Bo Marsh (invented)", phone: "(415) 555-0190" }), NOW);
    const newEmail = `${unique("cy")}@test.example`;
    const csv = [
      header,
      row("Import table A (invented)", `Ada F,${byEmail.email!.toUpperCase()},`),
      row("Import table B (invented)", "Bo M,,415-555-0190"),
      row("Import table C (invented)", `Cy Newman (invented),${newEmail},`),
      row("Import table D (invented)", `Cy Newman (invented),${newEmail},`),
      row("Import table E (invented)", ",,"),
    ].join("\n");
    const countClients = () => getDb().select({ n: sql<number>`count(*)` }).from(clients).where(eq(clients.studioId, staff.studio.id)).get()!.n;
    const before = countClients();
    const preview = importPiecesCsv(staff, { csv, commit: false });
    expect(preview.ok).toBe(true);
    expect(countClients()).toBe(before); // a preview writes nothing
    const out = importPiecesCsv(staff, { csv, commit: true });
    expect(out).toMatchObject({ committed: true, created: 5, buyers: { matched: 2, created: 1 } });
    expect(countClients()).toBe(before + 1);
    const clientOf = (title: string) => getDb().select({ clientId: pieces.clientId }).from(pieces).where(and(eq(pieces.studioId, staff.studio.id), eq(pieces.title, title))).all().map((r) => r.clientId);
    expect(clientOf("Import table A (invented)")).toEqual([byEmail.id]);
    expect(clientOf("Import table B (invented)")).toEqual([byPhone.id]);
    const cy = getDb().select().from(clients).where(and(eq(clients.studioId, staff.studio.id), eq(clients.email, newEmail))).get()!;
    expect(cy.name).toBe("Cy Newman (invented)");
    expect(clientOf("Import table C (invented)")).toEqual([cy.id]);
    expect(clientOf("Import table D (invented)")).toEqual([cy.id]);
    expect(clientOf("Import table E (invented)")).toEqual([null]);
    // The matched client's record is not overwritten by the file.
    expect(getDb().select({ name: clients.name }).from(clients).where(eq(clients.id, byEmail.id)).get()!.name).toBe("Ada Fenwick (invented)");
    // Importing the same buyers again makes no new client.
    const again = importPiecesCsv(staff, { csv, commit: true });
    // (each client counted once per file: Ada, Bo, Cy)
    expect(again.buyers).toMatchObject({ matched: 3, created: 0 });
    expect(again.buyers!.pieceIds).toHaveLength(4); // every row with a buyer
    expect(countClients()).toBe(before + 1);
  });

  it("records a new buyer's service-mail consent from its column, and mails the hand-over to those who can get it when asked", async () => {
    const { staff } = await studioWith();
    const yes = `${unique("yes")}@test.example`;
    const no = `${unique("no")}@test.example`;
    const csv = [
      "title,kind,shape,length_mm,width_mm,primary_species,use,delivered_on,finish_stack,buyer_name,buyer_email,buyer_phone,buyer_service_mail_on",
      `Consented table (invented),dining_table,rectangle,2000,900,black_walnut,heavy,2025-03-01,top:hardwax_oil:2:2025-03-01,Gil Yes (invented),${yes},,2025-03-01`,
      `Quiet table (invented),dining_table,rectangle,2000,900,black_walnut,heavy,2025-03-01,top:hardwax_oil:2:2025-03-01,Hal No (invented),${no},,`,
    ].join("\n");
    const out = importPiecesCsv(staff, { csv, commit: true });
    expect(out.buyers).toMatchObject({ matched: 0, created: 2 });
    const gil = getDb().select().from(clients).where(and(eq(clients.studioId, staff.studio.id), eq(clients.email, yes))).get()!;
    expect(gil.consentService).toBe(true);
    // Noon of that day in the studio's zone (America/Los_Angeles, PST in March before the change: UTC−8).
    expect(getDb().select().from(clientConsents).where(eq(clientConsents.clientId, gil.id)).all()).toEqual([
      expect.objectContaining({ kind: "service", granted: true, source: "imported", givenAt: new Date("2025-03-01T20:00:00Z") }),
    ]);
    const before = new Date();
    // "Send now": the same mailing as the hand-over page's (lib/pieces/handover-batch.ts), run after the answer.
    const batch = createHandoverBatch(staff, { pieceIds: out.buyers!.pieceIds }, "import");
    await runHandoverBatch(batch.id);
    expect(handoverBatchProgress(staff, batch.id)).toMatchObject({ state: "done", total: 2, sent: 1, skipped: [{ reason: "no_consent", count: 1 }], failed: [] });
    await waitForMail({ to: yes, subject: /its care and warranty/, since: before });
    expect(await listMail({ to: no })).toHaveLength(0);
  });

  it("refuses a row whose buyer e-mail or phone can't be read, naming the column, and writes nothing", async () => {
    const { staff } = await studioWith();
    const csv = [`${header},buyer_service_mail_on`, `${row("Bad buyer A (invented)", "Dee,not-an-email,")},`, `${row("Bad buyer B (invented)", "Eli,,12")},`, `${row("Bad buyer C (invented)", "Flo,,")},last spring`].join("\n");
    const out = importPiecesCsv(staff, { csv, commit: true });
    expect(out.committed).toBe(false);
    expect(out.errors.map((e) => [e.row, e.field])).toEqual([
      [2, "buyer_email"],
      [3, "buyer_phone"],
      [4, "buyer_service_mail_on"],
    ]);
    expect(getDb().select().from(pieces).where(and(eq(pieces.studioId, staff.studio.id))).all()).toHaveLength(0);
  });
});

describe("a transfer to a new owner", () => {
  it("links the new owner's client (made from their account when the studio has none)", async () => {
    const { studio } = await studioWith();
    const first = await createUser({ emailVerifiedAt: NOW, name: "First Owner (invented)" });
    const second = await createUser({ emailVerifiedAt: NOW, name: "Second Owner (invented)" });
    const { piece, code } = createPiece(studio);
    await registerPiece(first, { code }, freshIp(), NOW);
    const firstClient = getDb().select({ clientId: pieces.clientId }).from(pieces).where(eq(pieces.id, piece.id)).get()!.clientId;
    const { code: newCode } = await releasePiece({ ...first, unitSystem: first.unitSystem }, piece.id, { confirm: true }, NOW);
    await registerPiece(second, { code: newCode }, freshIp(), NOW);
    const after = getDb().select({ clientId: pieces.clientId }).from(pieces).where(eq(pieces.id, piece.id)).get()!.clientId;
    expect(after).not.toBe(firstClient);
    expect(getDb().select().from(clients).where(eq(clients.id, after!)).get()).toMatchObject({ userId: second.id, email: second.email, name: "Second Owner (invented)" });
  });

  it("links an existing unlinked client with the new owner's e-mail instead of making one", async () => {
    const { studio, staff } = await studioWith();
    const second = await createUser({ emailVerifiedAt: NOW });
    const known = createClient(staff, createClientSchema.parse({ name: "Known Before (invented)", email: second.email }), NOW);
    const first = await createUser({ emailVerifiedAt: NOW });
    const { piece, code } = createPiece(studio);
    await registerPiece(first, { code }, freshIp(), NOW);
    const { code: newCode } = await releasePiece({ ...first }, piece.id, { confirm: true }, NOW);
    await registerPiece(second, { code: newCode }, freshIp(), NOW);
    expect(getDb().select({ clientId: pieces.clientId }).from(pieces).where(eq(pieces.id, piece.id)).get()!.clientId).toBe(known.id);
    expect(getDb().select({ userId: clients.userId }).from(clients).where(eq(clients.id, known.id)).get()!.userId).toBe(second.id);
    expect(getDb().select().from(clients).where(eq(clients.studioId, studio.id)).all()).toHaveLength(2);
  });
});
