// Clients: the studio's record of its people. Create, search, update, phones stored in E.164 and
// shown in the studio's national format, consent with its history, another studio's 404 on every
// function, one timeline of everything that happened (each kind, newest first), the links made at
// registration and e-mail confirmation, and the migration that back-filled clients from owners.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { describe, expect, it } from "vitest";
import { getDb, openDatabase } from "@/db/client";
import { MIGRATIONS_FOLDER } from "@/db/migrate";
import { indexPiece } from "@/lib/pieces/search-index";
import {
  auditLog,
  careLogEntries,
  claims,
  clients,
  ownerships,
  payments,
  pieceHandovers,
  pieces,
  reminderSends,
  repairJobs,
  threadMessages,
  threads,
  users,
  visitMailSends,
  visits,
  type Studio,
} from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { createClient } from "@/lib/clients/create";
import { getClient } from "@/lib/clients/get";
import { linkAccountToClients } from "@/lib/clients/link";
import { listClients } from "@/lib/clients/list";
import { clientTimeline, TIMELINE_KINDS } from "@/lib/clients/timeline";
import { jobAmountText, jobStateLabel } from "@/lib/repairs/states";
import { listOwnerJobs, listStudioJobs } from "@/lib/repairs/jobs";
import { updateClient } from "@/lib/clients/update";
import { AppError } from "@/lib/errors";
import { registerPiece } from "@/lib/owner/registration";
import { releasePiece } from "@/lib/owner/transfer";
import { clientListQuerySchema, clientPatchSchema, createClientSchema } from "@/lib/validation/clients";
import { createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";

const NOW = new Date("2026-11-20T18:00:00Z");
const create = (ctx: StudioContext, raw: unknown) => createClient(ctx, createClientSchema.parse(raw), NOW);
const list = (ctx: StudioContext, raw: Record<string, string> = {}) => listClients(ctx, clientListQuerySchema.parse(raw));

function expectStatus(fn: () => unknown, status: number): AppError {
  let caught: unknown;
  try {
    fn();
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(AppError);
  expect((caught as AppError).status).toBe(status);
  return caught as AppError;
}

async function studioWithStaff(overrides: Partial<Studio> = {}) {
  const studio = createStudio({ timeZone: "America/Los_Angeles", country: "US", currency: "USD", ...overrides });
  return { studio, staff: await memberContext(studio, "staff") };
}

describe("creating, searching and changing clients", () => {
  it("stores e-mail lower-cased and the phone in E.164, shows it nationally, and finds a client by name, e-mail, phone digits or piece title", async () => {
    const { studio, staff } = await studioWithStaff();
    const mail = `${unique("fenna")}@Test.Example`;
    const c = create(staff, { name: "Fenna Oakridge (invented)", email: mail, phone: "(415) 555-0132", address: "12 Quay Lane, Port Alder (invented)", preferredContact: "phone" });
    expect(c.email).toBe(mail.toLowerCase());
    expect(c.phone).toBe("+14155550132");
    expect(getClient(staff, c.id).client.phoneDisplay).toBe("(415) 555-0132");
    // A number from another country is kept as typed (with its +code) and shown internationally.
    const abroad = create(staff, { name: "Abroad Person (invented)", phone: "+44 20 7946 0018" });
    expect(abroad.phone).toBe("+442079460018");
    expect(getClient(staff, abroad.id).client.phoneDisplay).toBe("+44 20 7946 0018");

    const { piece: sideboard } = createPiece(studio, { title: "Ripple ash sideboard (invented)", clientId: c.id });
    indexPiece(getDb(), sideboard.id); // as every piece write does (a title is found through the registry's index)
    for (const q of ["oakridge", "FENNA", mail.slice(0, 10), "555-0132", "4155550132", "(415) 555 0132", "ripple sideboard"]) {
      const page = list(staff, { q });
      expect(page.rows.map((r) => r.id), q).toEqual([c.id]);
    }
    expect(list(staff, { q: "nobody-by-that-name" }).total).toBe(0);
    expect(list(staff).total).toBe(2);

    // The same e-mail twice in one studio is a 409 on the e-mail field; in another studio it is fine.
    const dup = expectStatus(() => create(staff, { name: "Someone Else", email: mail }), 409);
    expect(dup.fieldErrors?.email?.[0]).toMatch(/another client/i);
    const other = await studioWithStaff();
    expect(create(other.staff, { name: "Fenna elsewhere", email: mail }).studioId).toBe(other.studio.id);

    // An unreadable number is a 400 on the phone field; nothing is saved.
    const bad = expectStatus(() => create(staff, { name: "Bad Phone", phone: "12" }), 400);
    expect(bad.fieldErrors?.phone?.[0]).toMatch(/phone number/i);
    expect(list(staff, { q: "Bad Phone" }).total).toBe(0);
  });

  it("reads a national number with the studio's country (a UK studio), and PATCH changes only what is sent", async () => {
    const { staff } = await studioWithStaff({ timeZone: "Europe/London", country: "GB", currency: "GBP" });
    const c = create(staff, { name: "Mira Holt (invented)", phone: "020 7946 0018", notes: "Prefers mornings." });
    expect(c.phone).toBe("+442079460018");
    expect(getClient(staff, c.id).client.phoneDisplay).toBe("020 7946 0018");
    const later = new Date(NOW.getTime() + 60_000);
    const updated = updateClient(staff, c.id, clientPatchSchema.parse({ phone: "07700 900123" }), later);
    expect(updated.phone).toBe("+447700900123");
    expect(updated.notes).toBe("Prefers mornings.");
    expect(updated.name).toBe("Mira Holt (invented)");
    expect(updated.updatedAt.getTime()).toBe(later.getTime());
    // The phone is found by the digits as the studio writes them, trunk 0 and all.
    expect(list(staff, { q: "07700 900123" }).rows.map((r) => r.id)).toEqual([c.id]);
    // The audit keeps which fields changed, not their values.
    const audit = getDb().select().from(auditLog).where(eq(auditLog.subjectId, c.id)).all();
    const change = audit.find((a) => a.action === "client.updated")!;
    expect(change.data).toEqual({ fields: ["phone"], consent: [] });
    expect(JSON.stringify(audit)).not.toContain("7700");
  });

  it("keeps consent with its history: given, withdrawn, when and how; the same value again records nothing", async () => {
    const { staff } = await studioWithStaff();
    const c = create(staff, {
      name: "Consent Person (invented)",
      consent: { service: { granted: true, givenOn: "2026-10-20", source: "paper", note: "Signed at delivery." } },
    });
    expect(c.consentService).toBe(true);
    expect(c.consentOffers).toBe(false);
    updateClient(staff, c.id, clientPatchSchema.parse({ consent: { offers: { granted: true, source: "phone" }, service: { granted: true, source: "email" } } }), new Date(NOW.getTime() + 1000));
    updateClient(staff, c.id, clientPatchSchema.parse({ consent: { offers: { granted: false, source: "email", note: "Asked for no offers." } } }), new Date(NOW.getTime() + 2000));
    const d = getClient(staff, c.id);
    expect(d.client.consentService).toBe(true);
    expect(d.client.consentOffers).toBe(false);
    expect(d.consentHistory.map((h) => [h.kind, h.granted, h.source])).toEqual([
      ["offers", false, "email"],
      ["offers", true, "phone"],
      ["service", true, "paper"],
    ]);
    // Given on 20 October: noon that day in the studio's zone, Los Angeles on daylight time (UTC-7)
    // until the first Sunday of November (15 U.S.C. §260a, as amended by the Energy Policy Act of 2005).
    expect(d.consentHistory[2]!.givenAt).toBe("2026-10-20T19:00:00.000Z");
    expect(d.consentHistory[0]!.givenAt).toBe(new Date(NOW.getTime() + 2000).toISOString());
    expect(d.consentHistory[0]!.recordedBy).toBe(staff.user.name);
  });

  it("filters: has an account, has unregistered pieces, has open claims; sorts and pages by 50 with the total", async () => {
    const { studio, staff } = await studioWithStaff();
    const owner = await createUser({ emailVerifiedAt: NOW });
    const withAccount = create(staff, { name: "Aaron Account (invented)", email: owner.email });
    expect(withAccount.userId).toBe(owner.id);
    const unreg = create(staff, { name: "Una Registered-Not (invented)" });
    createPiece(studio, { clientId: unreg.id });
    const { piece } = createPiece(studio, { clientId: withAccount.id, ownerId: owner.id, registeredAt: NOW });
    getDb().insert(claims).values({ studioId: studio.id, pieceId: piece.id, ownerId: owner.id, category: "finish_wear", noticedOn: "2026-11-01", description: "Invented.", answers: {}, state: "submitted" }).run();
    for (let i = 0; i < 55; i++) create(staff, { name: `Zed Filler ${String(i).padStart(2, "0")} (invented)` });

    expect(list(staff, { filter: "account" }).rows.map((r) => r.id)).toEqual([withAccount.id]);
    expect(list(staff, { filter: "unregistered" }).rows.map((r) => r.id)).toEqual([unreg.id]);
    const open = list(staff, { filter: "open_claims" });
    expect(open.rows.map((r) => [r.id, r.openClaims])).toEqual([[withAccount.id, 1]]);

    const first = list(staff);
    expect(first.total).toBe(57);
    expect(first.rows).toHaveLength(50);
    expect(first.rows[0]!.name).toBe("Aaron Account (invented)");
    expect(list(staff, { page: "2" }).rows).toHaveLength(7);
    expect(list(staff, { sort: "name", dir: "desc" }).rows[0]!.name).toBe("Zed Filler 54 (invented)");
    expect(() => clientListQuerySchema.parse({ filter: "everyone" })).toThrow();
  });
});

describe("another studio's clients", () => {
  it("are a 404 for every function, and never appear in its list", async () => {
    const a = await studioWithStaff();
    const b = await studioWithStaff();
    const c = create(a.staff, { name: "Private Person (invented)", email: `${unique("p")}@test.example` });
    expectStatus(() => getClient(b.staff, c.id), 404);
    expectStatus(() => updateClient(b.staff, c.id, clientPatchSchema.parse({ name: "Taken over" })), 404);
    expectStatus(() => clientTimeline(b.staff, c.id, 50), 404);
    expect(list(b.staff, { q: "Private" }).total).toBe(0);
    expect(getDb().select().from(clients).where(eq(clients.id, c.id)).get()!.name).toBe("Private Person (invented)");
  });
});

describe("accounts and pieces meet their clients", () => {
  it("registering a piece makes its client the owner's (linked by e-mail, or new); a release clears it; the new owner's client follows", async () => {
    const { studio, staff } = await studioWithStaff();
    const owner = await createUser({ emailVerifiedAt: NOW });
    const known = create(staff, { name: "Known Buyer (invented)", email: owner.email.toUpperCase() });
    expect(known.userId).toBe(owner.id); // the account exists and is confirmed: linked at once
    getDb().update(clients).set({ userId: null }).where(eq(clients.id, known.id)).run();

    const { piece, code } = createPiece(studio);
    await registerPiece(owner, { code }, "203.0.113.71");
    const after = getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!;
    expect(after.clientId).toBe(known.id);
    expect(getDb().select().from(clients).where(eq(clients.id, known.id)).get()!.userId).toBe(owner.id);

    const { code: fresh } = await releasePiece(owner, piece.id, { confirm: true });
    expect(getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!.clientId).toBeNull();

    const next = await createUser({ emailVerifiedAt: NOW, name: "Next Owner (invented)" });
    await registerPiece(next, { code: fresh }, "203.0.113.72");
    const nextClient = getDb().select().from(clients).where(eq(clients.userId, next.id)).get()!;
    expect(nextClient).toMatchObject({ studioId: studio.id, name: "Next Owner (invented)", email: next.email, consentService: true });
    expect(getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!.clientId).toBe(nextClient.id);
    expect(getClient(staff, nextClient.id).consentHistory.map((h) => h.source)).toEqual(["account"]);
  });

  it("confirming an e-mail links the unlinked clients with that address in each studio, and their owned pieces", async () => {
    const a = await studioWithStaff();
    const b = await studioWithStaff();
    const user = await createUser();
    const ca = create(a.staff, { name: "Later Signer (invented)", email: user.email });
    const cb = create(b.staff, { name: "Later Signer (invented)", email: user.email });
    expect(ca.userId).toBeNull(); // not confirmed yet: not linked
    expect(linkAccountToClients(user.id)).toBe(0);
    const { piece } = createPiece(a.studio, { ownerId: user.id, registeredAt: NOW });
    getDb().update(users).set({ emailVerifiedAt: NOW }).where(eq(users.id, user.id)).run();
    expect(linkAccountToClients(user.id)).toBe(2);
    expect(getDb().select().from(clients).where(eq(clients.id, ca.id)).get()!.userId).toBe(user.id);
    expect(getDb().select().from(clients).where(eq(clients.id, cb.id)).get()!.userId).toBe(user.id);
    expect(getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!.clientId).toBe(ca.id);
    expect(list(a.staff, { filter: "account" }).rows.map((r) => r.id)).toEqual([ca.id]);
  });
});

describe("the timeline", () => {
  it("has an entry of each kind from the tables that record it, newest first, paged with hasMore", async () => {
    const { studio, staff } = await studioWithStaff();
    const owner = await createUser({ emailVerifiedAt: NOW, name: "Timeline Owner (invented)" });
    const c = create(staff, { name: "Timeline Owner (invented)", email: owner.email });
    const t = (day: number, hour = 12) => new Date(Date.UTC(2026, 0, day, hour));
    const db = getDb();
    const { piece } = createPiece(studio, { title: "Timeline table (invented)", deliveredOn: "2025-12-20", clientId: c.id, ownerId: owner.id, registeredAt: t(2) });
    const { piece: former } = createPiece(studio, { title: "Handed-on bench (invented)", deliveredOn: "2025-12-01" });
    db.insert(ownerships).values({ studioId: studio.id, pieceId: piece.id, userId: owner.id, via: "registration", startedAt: t(2) }).run();
    db.insert(ownerships).values({ studioId: studio.id, pieceId: former.id, userId: owner.id, via: "transfer", startedAt: t(1, 9), endedAt: t(3) }).run();
    db.insert(pieceHandovers).values({ studioId: studio.id, pieceId: piece.id, clientId: c.id, email: owner.email, firstSentAt: t(1, 11), lastSentAt: t(1, 12), sendCount: 2 }).run();
    db.insert(careLogEntries).values({ studioId: studio.id, pieceId: piece.id, userId: owner.id, source: "owner", taskKind: "reoil", doneOn: "2026-01-03", createdAt: t(4) }).run();
    db.insert(reminderSends).values({ studioId: studio.id, pieceId: piece.id, userId: owner.id, reminderKey: unique("rk"), taskKey: "k", taskKind: "reoil", step: "due_day", dueOn: "2026-01-05", status: "sent", sentAt: t(5) }).run();
    const claim = db.insert(claims).values({ studioId: studio.id, pieceId: piece.id, ownerId: owner.id, category: "finish_wear", noticedOn: "2026-01-05", description: "Invented.", answers: {}, state: "accepted", decision: "partly_covered", coveredPct: 50, createdAt: t(6), decidedAt: t(7) }).returning().get();
    const thread = db.insert(threads).values({ studioId: studio.id, subject: "claim", claimId: claim.id, pieceId: piece.id, ownerId: owner.id, lastMessageAt: t(7, 15) }).returning().get();
    db.insert(threadMessages).values({ studioId: studio.id, threadId: thread.id, author: "owner", authorId: owner.id, body: "Invented.", createdAt: t(7, 15) }).run();
    const job = db
      .insert(repairJobs)
      .values({ studioId: studio.id, pieceId: piece.id, ownerId: owner.id, origin: "claim", claimId: claim.id, state: "done", title: "Re-oil the top (invented)", quoteInput: {}, lines: [], currency: "USD", totalMinor: 12_500, quotedAt: t(8), paidAt: t(9), doneAt: t(13) })
      .returning()
      .get();
    const cancelled = db
      .insert(repairJobs)
      .values({ studioId: studio.id, pieceId: piece.id, ownerId: owner.id, origin: "studio", state: "cancelled", title: "Second look (invented)", quoteInput: {}, lines: [], currency: "USD", cancelledAt: t(15) })
      .returning()
      .get();
    db.insert(payments).values({ studioId: studio.id, jobId: cancelled.id, quoteVersion: 1, checkoutSessionId: unique("cs"), amountMinor: 4_000, currency: "USD", status: "refunded", refundedMinor: 4_000, refundReason: "job_cancelled", refundRequestedAt: t(16), paidAt: t(14) }).run();
    const visit = db
      .insert(visits)
      .values({ studioId: studio.id, jobId: job.id, pieceId: piece.id, technicianId: staff.user.id, startAt: t(12, 17), endAt: t(12, 19), locationKind: "owner", location: "Invented", icsUid: unique("uid"), state: "done", jobStateBefore: "paid", createdAt: t(10), reportedAt: t(12, 19) })
      .returning()
      .get();
    db.insert(visitMailSends).values({ studioId: studio.id, visitId: visit.id, kind: "reminder_24h", sequence: 0, status: "sent", claimedAt: t(11), sentAt: t(11) }).run();
    const moved = db
      .insert(visits)
      .values({ studioId: studio.id, jobId: cancelled.id, pieceId: piece.id, technicianId: staff.user.id, startAt: t(20, 17), endAt: t(20, 18), locationKind: "owner", location: "Invented", icsUid: unique("uid"), state: "cancelled", jobStateBefore: "paid", createdAt: t(14, 13), cancelledAt: t(15, 9) })
      .returning()
      .get();
    expect(moved.id).toBeTruthy();
    updateClient(staff, c.id, clientPatchSchema.parse({ phone: "415 555 0199" }), t(17));

    const all = clientTimeline(staff, c.id, 100);
    const kinds = all.entries.map((e) => e.kind);
    for (const kind of TIMELINE_KINDS) expect(kinds, kind).toContain(kind);
    const ats = all.entries.map((e) => Date.parse(e.at));
    expect([...ats].sort((x, y) => y - x)).toEqual(ats);
    expect(all.entries[0]).toMatchObject({ kind: "note", href: null });
    expect(all.entries[0]!.title).toBe(`Client record changed by ${staff.user.name} — phone`);
    expect(all.hasMore).toBe(false);
    // The order across sources, newest first (the client's creation at NOW is newest of all but the change above: NOW is Nov 2026).
    expect(kinds.slice(1)).toEqual([
      "note", // created, 2026-11-20
      "refund",
      "job_cancelled",
      "visit_cancelled",
      "visit_booked", // the second visit, booked on the 14th at 13:00
      "job_done",
      "visit_done",
      "visit_reminder",
      "visit_booked",
      "job_paid",
      "job_quoted",
      "message",
      "claim_decided",
      "claim_filed",
      "reminder",
      "care",
      "released",
      "registered",
      "handover", // sent twice, last on the 1st at 12:00
      "took_over",
      "delivered", // only the client's own piece: the bench they handed on is not theirs now
    ]);
    const byKind = (k: string) => all.entries.find((e) => e.kind === k)!;
    expect(byKind("refund").title).toBe("Refund of $40.00 for “Second look (invented)”");
    expect(byKind("handover")).toMatchObject({ title: "Hand-over mail sent for “Timeline table (invented)” (2 times)", href: `/studio/pieces/${piece.id}` });
    expect(byKind("job_quoted")).toMatchObject({ title: "Quote sent for “Re-oil the top (invented)”: $125.00", href: `/studio/jobs/${job.id}` });
    expect(byKind("claim_decided")).toMatchObject({ title: "Claim on “Timeline table (invented)” decided: partly covered (50 %)", href: `/studio/claims/${claim.id}` });
    expect(byKind("visit_done").title).toBe("Visit of 12 January 2026 at 09:00 PST done (Re-oil the top (invented))");
    expect(byKind("released")).toMatchObject({ title: "Handed “Handed-on bench (invented)” on to a new owner", href: `/studio/pieces/${former.id}` });
    expect(byKind("delivered")).toMatchObject({ allDay: true, at: "2025-12-20T12:00:00.000Z" });

    // Bounded: the newest N and whether there are more.
    const page = clientTimeline(staff, c.id, 5);
    expect(page.entries.map((e) => e.key)).toEqual(all.entries.slice(0, 5).map((e) => e.key));
    expect(page.hasMore).toBe(true);
  });
});

describe("a covered repair job's amount", () => {
  it("reads 'Covered by the warranty' in the timeline and the job lists, never $0.00; a partly covered job shows what the owner pays", async () => {
    const { studio, staff } = await studioWithStaff();
    const owner = await createUser({ emailVerifiedAt: NOW, name: "Covered Owner (invented)" });
    const c = create(staff, { name: "Covered Owner (invented)", email: owner.email });
    const { piece } = createPiece(studio, { title: "Covered table (invented)", deliveredOn: "2025-12-20", clientId: c.id, ownerId: owner.id, registeredAt: NOW });
    const db = getDb();
    db.insert(ownerships).values({ studioId: studio.id, pieceId: piece.id, userId: owner.id, via: "registration", startedAt: NOW }).run();
    const job = (title: string, coveredPct: number, coveredMinor: number, totalMinor: number) =>
      db
        .insert(repairJobs)
        .values({ studioId: studio.id, pieceId: piece.id, ownerId: owner.id, origin: "studio", state: coveredPct === 100 ? "covered" : "quoted", title, quoteInput: {}, lines: [], currency: "USD", coveredPct, subtotalMinor: 9_000, coveredMinor, netMinor: totalMinor, totalMinor, quotedAt: NOW })
        .returning()
        .get();
    const covered = job("Fill the crack (invented)", 100, 9_000, 0);
    const partly = job("Mend the edge (invented)", 40, 3_600, 5_400);

    const quoted = clientTimeline(staff, c.id, 100).entries.filter((e) => e.kind === "job_quoted").map((e) => e.title);
    expect(quoted).toContain("Quote sent for “Fill the crack (invented)”: Covered by the warranty");
    expect(quoted).toContain("Quote sent for “Mend the edge (invented)”: $54.00");
    for (const rows of [listStudioJobs(staff, {}), listOwnerJobs(owner)]) {
      const amount = (id: string) => jobAmountText(rows.find((r) => r.id === id)!, studio.country);
      // The covered job's badge names the warranty; its amount says there is nothing to pay, never $0.00.
      expect(jobStateLabel(rows.find((r) => r.id === covered.id)!)).toBe("Covered by the warranty");
      expect(amount(covered.id)).toBe("Nothing to pay");
      expect(amount(partly.id)).toBe("$54.00");
    }
  });
});

describe("the migration that introduced clients", () => {
  it("back-fills a client per owner and former owner per studio, linked to the account, and points pieces at their owner's client", async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "gw-clients-mig-"));
    // The migrations before 0010, as a database had them.
    const before = path.join(dir, "before");
    fs.cpSync(MIGRATIONS_FOLDER, before, { recursive: true });
    const journalFile = path.join(before, "meta", "_journal.json");
    const journal = JSON.parse(fs.readFileSync(journalFile, "utf8")) as { entries: { idx: number; tag: string }[] };
    const at = journal.entries.findIndex((e) => e.tag === "0010_clients");
    expect(at).toBeGreaterThan(0);
    journal.entries = journal.entries.slice(0, at);
    fs.writeFileSync(journalFile, JSON.stringify(journal));
    const db = openDatabase(path.join(dir, "old.sqlite"));
    migrate(db, { migrationsFolder: before });
    const raw = db.$client;
    const now = NOW.getTime();
    raw.prepare("INSERT INTO studios (id, slug, name, created_at) VALUES ('s1','s1','One',?), ('s2','s2','Two',?)").run(now, now);
    raw.prepare("INSERT INTO users (id, email, name, password_hash, created_at, reminders_enabled) VALUES ('u1','ann@test.example','Ann (invented)','x',?,1), ('u2','bo@test.example','Bo (invented)','x',?,0)").run(now, now);
    const piece = raw.prepare(
      "INSERT INTO pieces (id, studio_id, kind, title, shape_kind, primary_species_id, use, delivered_on, owner_id, registered_at, registration_code_hash, registration_code_enc, created_at, updated_at) VALUES (?,?,'dining_table','T','rectangle','black_walnut','heavy','2025-01-01',?,?,?,'e',?,?)",
    );
    piece.run("p1", "s1", "u1", now, "h1", now, now);
    piece.run("p2", "s1", "u1", now, "h2", now, now);
    piece.run("p3", "s2", "u1", now, "h3", now, now);
    piece.run("p4", "s1", null, null, "h4", now, now);
    raw.prepare("INSERT INTO ownerships (id, studio_id, piece_id, user_id, via, started_at) VALUES ('o1','s1','p1','u1','registration',?)").run(now - 5000);
    // Bo owned p4 and handed it on: a former owner, still the studio's client, no piece now.
    raw.prepare("INSERT INTO ownerships (id, studio_id, piece_id, user_id, via, started_at, ended_at) VALUES ('o2','s1','p4','u2','registration',?,?)").run(now - 9000, now - 1000);

    migrate(db, { migrationsFolder: MIGRATIONS_FOLDER });
    const rows = raw.prepare("SELECT studio_id AS studio, name, email, user_id AS userId, consent_service AS consent, id FROM clients ORDER BY studio_id, name").all() as { studio: string; name: string; email: string; userId: string; consent: number; id: string }[];
    expect(rows.map((r) => ({ studio: r.studio, name: r.name, email: r.email, userId: r.userId, consent: r.consent }))).toEqual([
      { studio: "s1", name: "Ann (invented)", email: "ann@test.example", userId: "u1", consent: 1 },
      { studio: "s1", name: "Bo (invented)", email: "bo@test.example", userId: "u2", consent: 0 },
      { studio: "s2", name: "Ann (invented)", email: "ann@test.example", userId: "u1", consent: 1 },
    ]);
    const clientOf = (studio: string, user: string) => rows.find((r) => r.studio === studio && r.userId === user)!.id;
    expect(raw.prepare("SELECT id, client_id AS clientId FROM pieces ORDER BY id").all()).toEqual([
      { id: "p1", clientId: clientOf("s1", "u1") },
      { id: "p2", clientId: clientOf("s1", "u1") },
      { id: "p3", clientId: clientOf("s2", "u1") },
      { id: "p4", clientId: null },
    ]);
    // Ann's consent to service mail is recorded, dated when she first registered in studio One.
    const consents = raw.prepare("SELECT client_id AS clientId, kind, granted, source, given_at AS givenAt FROM client_consents ORDER BY given_at").all() as { clientId: string; givenAt: number }[];
    expect(consents).toHaveLength(2);
    expect(consents.find((x) => x.clientId === clientOf("s1", "u1"))).toMatchObject({ kind: "service", granted: 1, source: "account", givenAt: now - 5000 });
    expect(raw.prepare("PRAGMA foreign_key_check").all()).toEqual([]);
    raw.close();
    fs.rmSync(dir, { recursive: true, force: true });
  });
});
