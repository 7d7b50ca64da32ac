// The owner's side against a real SQLite file and the real SMTP sink: pieces and schedules, the care
// log moving due dates as careSchedule says, release and re-registration, preferences, the certificate.
import { eq } from "drizzle-orm";
import sharp from "sharp";
import { describe, expect, it } from "vitest";
import { ZodError } from "zod";
import { getDb } from "@/db/client";
import { careLogEntries, files, finishLayers, finishProducts, ownerships, pieces, warrantyPolicies } from "@/db/schema";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { careSchedule } from "@/lib/care/schedule";
import { productNeeded } from "@/lib/care/quantity";
import { topArea } from "@/lib/care/area";
import { AppError } from "@/lib/errors";
import { addCareLogEntry, deleteCareLogEntry, updateCareLogEntry } from "@/lib/owner/care-log";
import { certificatePdf } from "@/lib/owner/certificate";
import { getMyPiece, listMyPieces } from "@/lib/owner/pieces";
import { updatePreferences } from "@/lib/owner/preferences";
import { careLogPatchSchema, careLogSchema, preferencesPatchSchema, releaseSchema } from "@/lib/validation/owner";
import { registerPiece } from "@/lib/owner/registration";
import { releasePiece } from "@/lib/owner/transfer";
import { toCareLayers, toCarePiece } from "@/lib/pieces/care-inputs";
import { extractLinks, waitForMail } from "../support/mail";
import { createPiece, createStudio, createUser, unique } from "../support/fixtures";

const NOW = new Date("2026-03-15T18:00:00Z");

async function owner(overrides: Parameters<typeof createUser>[0] = {}) {
  return createUser({ emailVerifiedAt: new Date(), timeZone: "America/New_York", unitSystem: "metric", ...overrides });
}

async function expectAppError(p: Promise<unknown> | (() => unknown), status: number) {
  let caught: unknown;
  try {
    await (typeof p === "function" ? p() : p);
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(AppError);
  expect((caught as AppError).status).toBe(status);
  return caught as AppError;
}

async function ownedPiece(overrides: Parameters<typeof createPiece>[1] = {}) {
  const studio = createStudio({ email: `${unique("studio")}@studio.example` });
  const me = await owner();
  const made = createPiece(studio, { ownerId: me.id, registeredAt: new Date("2025-06-10T12:00:00Z"), ...overrides });
  return { studio, me, ...made };
}

describe("owner pieces", () => {
  it("lists the owner's pieces from several studios with the next care task; someone else's piece is a 404", async () => {
    const me = await owner();
    const other = await owner();
    const a = createPiece(createStudio({ name: "Studio North (invented)" }), { ownerId: me.id, title: "North table" }).piece;
    const b = createPiece(createStudio({ name: "Studio South (invented)" }), { ownerId: me.id, title: "South bench", kind: "bench", deliveredOn: "2025-12-01" }).piece;
    const theirs = createPiece(createStudio(), { ownerId: other.id }).piece;
    const list = listMyPieces(me, NOW);
    expect(list.map((p) => p.id).sort()).toEqual([a.id, b.id].sort());
    const north = list.find((p) => p.id === a.id)!;
    expect(north.studioName).toBe("Studio North (invented)");
    // Hardwax oil, heavy use, delivered 2025-06-01: the re-oil and the annual check both fall due on 2026-06-01
    // (careSchedule sorts a tie by kind), 78 days after 2026-03-15.
    expect(north.nextTask).toMatchObject({ kind: "annual_check", dueOn: "2026-06-01", status: "upcoming", daysUntilDue: 78 });
    expect(north.nextTask!.logUrl).toBe(`/pieces/${a.id}/log?task=${encodeURIComponent(`${a.id}:annual_check:whole_piece`)}`);

    await expectAppError(() => getMyPiece(me, theirs.id, NOW), 404);
    await expectAppError(() => getMyPiece(me, "not-a-real-id", NOW), 404);
  });

  it("the piece page carries the finish stack, the schedule with reasons, the guide with quantity and cautions, and warranty time left", async () => {
    const studio = createStudio();
    const me = await owner({ unitSystem: "imperial" });
    const product = getDb()
      .insert(finishProducts)
      .values({ studioId: studio.id, name: "Test hardwax oil (invented)", finishClass: "hardwax_oil", coverageM2PerL: 24, containers: [{ ml: 125, priceMinor: 1000 }, { ml: 750, priceMinor: 4000 }] })
      .returning()
      .get();
    const policy = getDb().insert(warrantyPolicies).values({ studioId: studio.id, version: 3, effectiveFrom: "2024-01-01", policy: DEFAULT_WARRANTY_POLICY }).returning().get();
    const { piece } = createPiece(studio, { ownerId: me.id, resinKind: "deep_pour", warrantyPolicyId: policy.id, thicknessMm: 51 });
    getDb().update(finishLayers).set({ productId: product.id, productLabel: product.name }).where(eq(finishLayers.pieceId, piece.id)).run();

    const view = getMyPiece(me, piece.id, NOW);
    expect(view.layers).toHaveLength(1);
    expect(view.layers[0]).toMatchObject({ classLabel: "Hardwax oil", appliedOn: "2025-06-01", productLabel: "Test hardwax oil (invented)" });
    expect(view.size).toBe("78 3/4 × 35 7/16 in"); // 2000 mm = 78.74 in, 900 mm = 35.43 in, to the nearest 1/16 in
    // The thickness in inches, without the lumber trade's quarters ("(8/4)"), which staff read.
    expect(view.thickness).toBe("2 in");
    const reoil = view.schedule.tasks.find((t) => t.kind === "reoil")!;
    expect(reoil.reasons[0]).toBe("The last oil coat on the top went on 1 June 2025.");

    const oil = view.guide.sections.find((s) => s.finishClass === "hardwax_oil")!;
    const need = productNeeded({ areaM2: topArea({ kind: "rectangle", lengthMm: 2000, widthMm: 900 }).m2, coats: 1, coverageM2PerL: 24, containerSizesMl: [125, 750] });
    expect(oil.quantity.text).toContain(`${need.ml} mL`);
    expect(oil.quantity.text).toContain("US fl oz");
    // Re-oil and the yearly check on a resin piece (lib/care/cautions): no dust or epoxy cautions for these tasks.
    expect(view.guide.cautions.map((c) => c.key)).toEqual(["oily_rags", "heat_on_resin", "ventilation", "product_label", "heavy_top"]);
    expect(view.guide.cautions[0]!.text).toMatch(/metal can, cover them with water and a squirt of washing-up detergent/);

    expect(view.warranty.termsName).toBe("Warranty terms for deliveries from 1 January 2024"); // in words, never the stored version label
    const structural = view.warranty.lines.find((l) => l.category === "structural")!;
    // 60 months from 2025-06-01 is 2030-06-01; today in New York on NOW is 2026-03-15.
    expect(structural).toMatchObject({ endsOn: "2030-06-01", status: "active", daysLeft: 1539 });
    expect(view).not.toHaveProperty("internalNotes");
    expect(JSON.stringify(view)).not.toContain(piece.registrationCodeHash);
  });
});

describe("care log", () => {
  it("logging a task moves its next due date as careSchedule says, with the reason", async () => {
    const { me, piece } = await ownedPiece();
    const before = getMyPiece(me, piece.id, NOW).schedule.tasks.find((t) => t.kind === "reoil")!;
    expect(before.dueOn).toBe("2026-06-01");

    const r = await addCareLogEntry(me, piece.id, careLogSchema.parse({ taskKind: "reoil", surface: "top", doneOn: "2026-03-10", productUsed: "Hardwax oil", notes: "Two thin coats" }), null, NOW);
    const layers = getDb().select().from(finishLayers).where(eq(finishLayers.pieceId, piece.id)).all();
    const expected = careSchedule({
      piece: toCarePiece(getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!),
      finishLayers: toCareLayers(layers),
      careLog: [{ taskKind: "reoil", doneOn: "2026-03-10", surface: "top" }],
      catalog: [],
      now: NOW,
      timeZone: "America/New_York",
    }).tasks.find((t) => t.kind === "reoil")!;
    expect(r.task).toMatchObject({ dueOn: expected.dueOn, status: expected.status, clockSource: "care_log" });
    expect(r.task!.dueOn).toBe("2027-03-10");
    expect(r.task!.status).toBe("done");
    expect(r.task!.reasons[0]).toBe("This was last done on the top on 10 March 2026, as the care log shows.");
    expect(getMyPiece(me, piece.id, NOW).careLog[0]).toMatchObject({ label: "Re-oil", doneOn: "2026-03-10", mine: true, notes: "Two thin coats" });
  });

  it("an annual check entry restarts the yearly clock from its date", async () => {
    const { me, piece } = await ownedPiece({ deliveredOn: "2025-02-01" });
    const check = () => getMyPiece(me, piece.id, NOW).schedule.tasks.find((t) => t.kind === "annual_check")!;
    expect(check()).toMatchObject({ dueOn: "2026-02-01", status: "overdue" });
    const r = await addCareLogEntry(me, piece.id, careLogSchema.parse({ taskKind: "annual_check", surface: "whole_piece", doneOn: "2026-03-01" }), null, NOW);
    expect(r.task).toMatchObject({ dueOn: "2027-03-01", status: "done" });
    expect(getDb().select().from(careLogEntries).where(eq(careLogEntries.id, r.entry.id)).get()!.surface).toBeNull();
  });

  it("refuses a date in the owner's future, a date before delivery, and a task the piece doesn't have, with field errors", async () => {
    const { me, piece } = await ownedPiece();
    // 2026-03-16 is already tomorrow's date in UTC at 2026-03-16T02:00Z but still the 15th in New York.
    const lateNight = new Date("2026-03-16T02:00:00Z");
    const future = await expectAppError(addCareLogEntry(me, piece.id, careLogSchema.parse({ taskKind: "reoil", surface: "top", doneOn: "2026-03-16" }), null, lateNight), 400);
    expect(future.fieldErrors?.doneOn?.[0]).toMatch(/today/);
    const early = await expectAppError(addCareLogEntry(me, piece.id, careLogSchema.parse({ taskKind: "reoil", surface: "top", doneOn: "2025-05-01" }), null, NOW), 400);
    expect(early.fieldErrors?.doneOn?.[0]).toMatch(/delivered/);
    const wrong = await expectAppError(addCareLogEntry(me, piece.id, careLogSchema.parse({ taskKind: "rewax", surface: "top", doneOn: "2026-03-01" }), null, NOW), 400);
    expect(wrong.fieldErrors?.taskKind?.[0]).toMatch(/re-oil/);
    expect(() => careLogSchema.parse({ taskKind: "reoil", surface: "top", doneOn: "2026-02-30" })).toThrow(ZodError); // the route parses it before addCareLogEntry
  });

  it("owners correct and delete their own entries; the due date follows; others get 404", async () => {
    const { me, piece } = await ownedPiece();
    const stranger = await owner();
    const r = await addCareLogEntry(me, piece.id, careLogSchema.parse({ taskKind: "reoil", surface: "top", doneOn: "2026-03-10" }), null, NOW);
    const fixed = await updateCareLogEntry(me, piece.id, r.entry.id, careLogPatchSchema.parse({ doneOn: "2026-02-20", productUsed: "Oil from the studio" }), NOW);
    expect(fixed.entry).toMatchObject({ doneOn: "2026-02-20", productUsed: "Oil from the studio" });
    expect(fixed.task!.dueOn).toBe("2027-02-20");
    await expectAppError(updateCareLogEntry(stranger, piece.id, r.entry.id, careLogPatchSchema.parse({ notes: "x" }), NOW), 404);
    await expectAppError(deleteCareLogEntry(stranger, piece.id, r.entry.id, NOW), 404);
    const gone = await deleteCareLogEntry(me, piece.id, r.entry.id, NOW);
    expect(gone.task!.dueOn).toBe("2026-06-01");
    expect(getDb().select().from(careLogEntries).where(eq(careLogEntries.pieceId, piece.id)).all()).toHaveLength(0);
  });

  it("a correction changes only the fields it sends: the notes and product stay when only the date is sent", async () => {
    const { me, piece } = await ownedPiece();
    const r = await addCareLogEntry(me, piece.id, careLogSchema.parse({ taskKind: "reoil", surface: "top", doneOn: "2026-03-10", productUsed: "Hardwax oil", notes: "Two thin coats" }), null, NOW);
    const fixed = await updateCareLogEntry(me, piece.id, r.entry.id, careLogPatchSchema.parse({ doneOn: "2026-03-08" }), NOW);
    expect(fixed.entry).toMatchObject({ doneOn: "2026-03-08", productUsed: "Hardwax oil", notes: "Two thin coats" });
    const stored = getDb().select().from(careLogEntries).where(eq(careLogEntries.id, r.entry.id)).get()!;
    expect(stored).toMatchObject({ doneOn: "2026-03-08", productUsed: "Hardwax oil", notes: "Two thin coats" });
    // Sending a field empty on purpose still clears it.
    expect((await updateCareLogEntry(me, piece.id, r.entry.id, careLogPatchSchema.parse({ notes: "" }), NOW)).entry).toMatchObject({ notes: "", productUsed: "Hardwax oil" });
  });

  it("stores an optional photo as a care_log_photo file, linked to the file route, and removes it with the entry", async () => {
    const { me, piece } = await ownedPiece();
    const png = await sharp({ create: { width: 64, height: 48, channels: 3, background: "#8a6a4a" } }).png().toBuffer();
    const r = await addCareLogEntry(me, piece.id, careLogSchema.parse({ taskKind: "reoil", surface: "top", doneOn: "2026-03-01" }), new Uint8Array(png), NOW);
    const file = getDb().select().from(files).where(eq(files.id, r.entry.photoFileId!)).get()!;
    expect(file).toMatchObject({ purpose: "care_log_photo", pieceId: piece.id, contentType: "image/jpeg", width: 64, height: 48 });
    expect(getMyPiece(me, piece.id, NOW).careLog[0]!.photoUrl).toBe(`/api/files/${file.id}`);
    await expectAppError(addCareLogEntry(me, piece.id, careLogSchema.parse({ taskKind: "reoil", surface: "top", doneOn: "2026-03-01" }), new TextEncoder().encode("not an image"), NOW), 415);
    await deleteCareLogEntry(me, piece.id, r.entry.id, NOW);
    expect(getDb().select().from(files).where(eq(files.id, file.id)).get()).toBeUndefined();
  });
});

describe("release and re-registration", () => {
  it("release issues a fresh code by e-mail, tells the studio, and a second owner registers with it; the warranty follows each line", async () => {
    const studio = createStudio({ name: "Handover Studio (invented)", email: `${unique("desk")}@handover.example` });
    const policy = getDb().insert(warrantyPolicies).values({ studioId: studio.id, version: 1, effectiveFrom: "2024-01-01", policy: DEFAULT_WARRANTY_POLICY }).returning().get();
    const first = await owner({ name: "First Owner (invented)" });
    const second = await owner({ name: "Second Owner (invented)" });
    const { piece, code: oldCode } = createPiece(studio, { title: `Handover table ${unique("t")}`, warrantyPolicyId: policy.id });
    expect(await registerPiece(first, { code: oldCode }, "203.0.113.10")).toEqual({ pieceId: piece.id });
    await addCareLogEntry(first, piece.id, careLogSchema.parse({ taskKind: "reoil", surface: "top", doneOn: "2026-03-01", notes: "private note" }), null, NOW);

    await expectAppError(releasePiece(second, piece.id, { confirm: true }, NOW), 404);
    expect(() => releaseSchema.parse({})).toThrow(ZodError); // the route and the action parse the confirmation
    const since = new Date();
    const released = await releasePiece(first, piece.id, { confirm: true }, NOW);
    expect(released.code).toMatch(/^[0-9A-Z]{4}-[0-9A-Z]{4}-[0-9A-Z]{4}-.$/);
    expect(released.code).not.toBe(oldCode);
    expect(released.staying).toEqual(["Finish wear or rings"]);

    const mail = await waitForMail({ to: first.email, subject: /new registration code/i, since });
    expect(mail.text).toContain(released.code);
    expect(extractLinks(mail.text)).toContain(`http://localhost:3999/r/${released.code}`);
    const studioMail = await waitForMail({ to: studio.email, subject: /changed hands/i, since });
    expect(studioMail.text).toContain("First Owner (invented)");
    expect(studioMail.text).not.toContain(released.code);

    await expectAppError(() => getMyPiece(first, piece.id, NOW), 404);
    const row = getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!;
    expect(row.ownerId).toBeNull();
    expect(JSON.stringify(row)).not.toContain(released.code);

    await expectAppError(registerPiece(second, { code: oldCode }, "203.0.113.11"), 404);
    expect(await registerPiece(second, { code: released.code.toLowerCase() }, "203.0.113.11")).toEqual({ pieceId: piece.id });
    const hist = getDb().select().from(ownerships).where(eq(ownerships.pieceId, piece.id)).all();
    expect(hist.map((h) => [h.userId, h.via, h.endedAt === null])).toEqual([
      [first.id, "registration", false],
      [second.id, "transfer", true],
    ]);

    const view = getMyPiece(second, piece.id, NOW);
    expect(view.warranty.isOriginalOwner).toBe(false);
    expect(view.warranty.lines.find((l) => l.category === "finish_wear")!.status).toBe("not_transferred");
    expect(view.warranty.lines.find((l) => l.category === "structural")!.status).toBe("active");
    // The first owner's care still counts for the piece; their notes stay theirs.
    expect(view.careLog[0]).toMatchObject({ doneOn: "2026-03-01", mine: false, notes: "", byLabel: "A previous owner" });
    expect(view.schedule.tasks.find((t) => t.kind === "reoil")!.dueOn).toBe("2027-03-01");
    await expectAppError(updateCareLogEntry(second, piece.id, view.careLog[0]!.id, careLogPatchSchema.parse({ notes: "mine now" }), NOW), 404);
  });
});

describe("preferences", () => {
  it("updates reminders, time zone and units; refuses an unknown time zone with a field error", async () => {
    const me = await owner();
    expect(updatePreferences(me, { remindersEnabled: false, timeZone: "Europe/Lisbon", unitSystem: "imperial" })).toEqual({ remindersEnabled: false, timeZone: "Europe/Lisbon", unitSystem: "imperial" });
    expect(updatePreferences(me, { unitSystem: "metric" })).toMatchObject({ unitSystem: "metric", timeZone: "Europe/Lisbon" });
    let caught: unknown;
    try {
      updatePreferences(me, preferencesPatchSchema.parse({ timeZone: "Mars/Olympus_Mons" }));
    } catch (e) {
      caught = e;
    }
    expect((caught as { issues?: { path: string[] }[] }).issues?.[0]?.path).toEqual(["timeZone"]);
  });
});

describe("warranty certificate", () => {
  it("is a PDF whose text names the piece, the studio, the owner and each line with its end date", async () => {
    const studio = createStudio({ name: "Certificate Studio (invented)" });
    const policy = getDb().insert(warrantyPolicies).values({ studioId: studio.id, version: 2, effectiveFrom: "2024-01-01", policy: DEFAULT_WARRANTY_POLICY }).returning().get();
    const me = await owner({ name: "Certificate Owner (invented)" });
    const { piece } = createPiece(studio, { ownerId: me.id, title: "Certified walnut table", warrantyPolicyId: policy.id, registeredAt: NOW });
    const { buffer, filename } = await certificatePdf(me, piece.id, NOW);
    expect(filename).toBe("warranty-certificate-certified-walnut-table.pdf");
    expect(Buffer.from(buffer).subarray(0, 5).toString()).toBe("%PDF-");
    const pdfjs = await import("pdfjs-dist/legacy/build/pdf.mjs");
    const doc = await pdfjs.getDocument({ data: new Uint8Array(buffer), standardFontDataUrl: `${process.cwd()}/node_modules/pdfjs-dist/standard_fonts/` }).promise;
    let text = "";
    for (let i = 1; i <= doc.numPages; i++) {
      const content = await (await doc.getPage(i)).getTextContent();
      text += content.items.map((it) => ("str" in it ? it.str : "")).join(" ") + "\n";
    }
    const flat = text.replace(/\s+/g, " ");
    expect(flat).toContain("Warranty certificate");
    expect(flat).toContain("Certified walnut table");
    expect(flat).toContain("Certificate Studio (invented)");
    expect(flat).toContain("Certificate Owner (invented)");
    expect(flat).toContain("Structure and joinery");
    expect(flat).toContain("1 June 2030");
    expect(flat).toContain("Terms Warranty terms for deliveries from 1 January 2024");
    expect(flat).not.toMatch(/Version \d/);
    await expectAppError(certificatePdf(await owner(), piece.id, NOW), 404);
  });
});
