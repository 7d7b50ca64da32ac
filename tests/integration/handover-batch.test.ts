// Bulk hand-over mail against a real SQLite file and the real SMTP sink: a mailing sends each buyer
// who can get it their hand-over mail once, skips (and says why) those without an e-mail, without
// consent to service mail, or already registered, records failures with their reason, and never
// mails anyone twice: not on a second mailing, not when two mailings run at once, not when a stopped
// mailing is taken up again. All data is invented.
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { handoverBatches, handoverBatchItems, ownerships, pieceHandovers, pieces, users, warrantyPolicies } from "@/db/schema";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { AppError } from "@/lib/errors";
import { sendHandover } from "@/lib/pieces/handover";
import { createHandoverBatch, handoverBatchProgress, handoverCandidates, runHandoverBatch, STALE_BATCH_MS } from "@/lib/pieces/handover-batch";
import { deliverPiece } from "@/lib/pieces/handover-delivery";
import { deliverPieceSchema } from "@/lib/validation/clients";
import { createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { listMail } from "../support/mail";

const NOW = new Date("2026-11-20T18:00:00Z");

async function world() {
  const studio = createStudio({ name: "Batch Bench Works (invented)", timeZone: "UTC", email: `${unique("batch")}@test.example` });
  getDb().insert(warrantyPolicies).values({ studioId: studio.id, version: 1, effectiveFrom: "2024-01-01", policy: DEFAULT_WARRANTY_POLICY }).run();
  const staff = await memberContext(studio, "staff");
  return { studio, staff };
}

type Staff = Awaited<ReturnType<typeof world>>["staff"];

/** A piece delivered to a new buyer, recorded without sending the hand-over mail (no consent at delivery, then as asked). */
async function delivered(staff: Staff, buyer: { email?: string; consent: boolean }) {
  const title = `Ash bench ${unique("b")} (invented)`;
  const out = await deliverPiece(
    staff,
    deliverPieceSchema.parse({
      kind: "bench",
      title,
      shapeKind: "rectangle",
      lengthMm: 1400,
      widthMm: 400,
      primarySpeciesId: "white_oak",
      use: "moderate",
      deliveredOn: "2026-11-19",
      layers: [{ surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2026-11-17" }],
      buyer: "new",
      buyerName: `Buyer ${unique("n")} (invented)`,
      ...(buyer.email ? { buyerEmail: buyer.email } : {}),
      buyerServiceMail: false,
    }),
    NOW,
  );
  if (buyer.consent) getDb().run(`update clients set consent_service = 1 where id = '${out.piece.clientId}'`);
  return { id: out.piece.id, title };
}

const mailsTo = async (email: string) => (await listMail({ to: email })).filter((m) => /its care and warranty/.test(m.subject)).length;

async function statusOf(p: () => unknown): Promise<number> {
  try {
    await p();
    return 200;
  } catch (e) {
    if (e instanceof AppError) return e.status;
    throw e;
  }
}

describe("bulk hand-over mail", () => {
  it("sends to those who can get it, skips the rest with the reason, and a second mailing sends nobody twice", async () => {
    const { staff } = await world();
    const ann = `${unique("ann")}@test.example`;
    const ben = `${unique("ben")}@test.example`;
    const cal = `${unique("cal")}@test.example`;
    const sent1 = await delivered(staff, { email: ann, consent: true });
    const sent2 = await delivered(staff, { email: ben, consent: true });
    const noConsent = await delivered(staff, { email: cal, consent: false });
    const noEmail = await delivered(staff, { consent: true });
    const registered = await delivered(staff, { email: `${unique("reg")}@test.example`, consent: true });
    const owner = await createUser();
    getDb().update(pieces).set({ ownerId: owner.id, registeredAt: NOW }).where(eq(pieces.id, registered.id)).run();
    getDb().insert(ownerships).values({ studioId: staff.studio.id, pieceId: registered.id, userId: owner.id, via: "registration", startedAt: NOW }).run();
    const dee = `${unique("dee")}@test.example`;
    const alreadySent = await delivered(staff, { email: dee, consent: true });
    await sendHandover(staff, alreadySent.id, NOW);

    // The page's list: never mailed, not registered; each says whether it will be skipped.
    const candidates = handoverCandidates(staff);
    expect(candidates.map((c) => [c.pieceId, c.block]).sort()).toEqual(
      [
        [sent1.id, null],
        [sent2.id, null],
        [noConsent.id, "no_consent"],
        [noEmail.id, "no_email"],
      ].sort(),
    );

    const first = createHandoverBatch(staff, { all: true });
    expect(first.total).toBe(4);
    expect(handoverBatchProgress(staff, first.id)).toMatchObject({ state: "queued", finished: 0, total: 4 });
    await runHandoverBatch(first.id);
    const done = handoverBatchProgress(staff, first.id);
    expect(done).toMatchObject({ state: "done", total: 4, finished: 4, sent: 2, failed: [] });
    expect(done.skipped.map((s) => [s.reason, s.count, s.label]).sort()).toEqual([
      ["no_consent", 1, "No consent to service mail"],
      ["no_email", 1, "No e-mail address"],
    ]);
    expect([await mailsTo(ann), await mailsTo(ben), await mailsTo(cal), await mailsTo(dee)]).toEqual([1, 1, 0, 1]);

    // "All not yet sent" again: only the two that could not get it are left, and still can't.
    const second = createHandoverBatch(staff, { all: true });
    expect(second.total).toBe(2);
    await runHandoverBatch(second.id);
    expect(handoverBatchProgress(staff, second.id)).toMatchObject({ sent: 0, finished: 2 });
    // Picking pieces that already had it (and a registered one) mails nobody: each is skipped with its reason.
    const third = createHandoverBatch(staff, { pieceIds: [sent1.id, sent2.id, alreadySent.id, registered.id] });
    await runHandoverBatch(third.id);
    const summary = handoverBatchProgress(staff, third.id);
    expect(summary.sent).toBe(0);
    expect(summary.skipped.map((s) => [s.reason, s.count]).sort()).toEqual([
      ["already_sent", 3],
      ["registered", 1],
    ]);
    expect([await mailsTo(ann), await mailsTo(ben), await mailsTo(dee)]).toEqual([1, 1, 1]);
    // A resend stays the explicit single action.
    await sendHandover(staff, sent1.id, NOW);
    expect(await mailsTo(ann)).toBe(2);
    expect(getDb().select().from(pieceHandovers).where(eq(pieceHandovers.pieceId, sent1.id)).get()!.sendCount).toBe(2);
  });

  it("two mailings of the same pieces running at once mail each buyer once", async () => {
    const { staff } = await world();
    const emails = [0, 1, 2].map(() => `${unique("twin")}@test.example`);
    const ids = [];
    for (const email of emails) ids.push((await delivered(staff, { email, consent: true })).id);
    const a = createHandoverBatch(staff, { pieceIds: ids });
    const b = createHandoverBatch(staff, { pieceIds: ids });
    await Promise.all([runHandoverBatch(a.id), runHandoverBatch(b.id)]);
    const [pa, pb] = [handoverBatchProgress(staff, a.id), handoverBatchProgress(staff, b.id)];
    expect(pa.sent + pb.sent).toBe(3);
    expect(pa.finished + pb.finished).toBe(6);
    for (const email of emails) expect(await mailsTo(email)).toBe(1);
  });

  it("a mailing started by someone no longer on the team fails each piece with the reason; nothing is sent", async () => {
    const { studio, staff } = await world();
    const eve = `${unique("eve")}@test.example`;
    const piece = await delivered(staff, { email: eve, consent: true });
    const leaver = await memberContext(studio, "staff");
    const batch = createHandoverBatch(leaver, { pieceIds: [piece.id] });
    getDb().delete(users).where(eq(users.id, leaver.user.id)).run();
    await runHandoverBatch(batch.id);
    expect(handoverBatchProgress(staff, batch.id)).toMatchObject({ state: "done", sent: 0, failed: [{ pieceId: piece.id, title: piece.title, reason: expect.stringMatching(/no longer on the studio's team/) }] });
    expect(await mailsTo(eve)).toBe(0);
  });

  it("a mailing that stopped mid-way is taken up again: the piece whose mail went out is not sent again", async () => {
    const { staff } = await world();
    const [fay, gus] = [`${unique("fay")}@test.example`, `${unique("gus")}@test.example`];
    const p1 = await delivered(staff, { email: fay, consent: true });
    const p2 = await delivered(staff, { email: gus, consent: true });
    const batch = createHandoverBatch(staff, { pieceIds: [p1.id, p2.id] });
    // As a runner leaves it when the server stops: p1's mail went out, its item still "sending".
    await sendHandover(staff, p1.id, NOW);
    const old = new Date(Date.now() - STALE_BATCH_MS - 1000);
    getDb().update(handoverBatches).set({ state: "running", startedAt: old, updatedAt: old }).where(eq(handoverBatches.id, batch.id)).run();
    getDb()
      .update(handoverBatchItems)
      .set({ outcome: "sending" })
      .where(and(eq(handoverBatchItems.batchId, batch.id), eq(handoverBatchItems.pieceId, p1.id)))
      .run();
    expect(handoverBatchProgress(staff, batch.id).stalled).toBe(true);
    await runHandoverBatch(batch.id);
    expect(handoverBatchProgress(staff, batch.id)).toMatchObject({ state: "done", sent: 2, finished: 2, stalled: false });
    expect([await mailsTo(fay), await mailsTo(gus)]).toEqual([1, 1]);
    // A running mailing someone is still working on is left to them.
    const fresh = createHandoverBatch(staff, { pieceIds: [p2.id] });
    getDb().update(handoverBatches).set({ state: "running", updatedAt: new Date() }).where(eq(handoverBatches.id, fresh.id)).run();
    await runHandoverBatch(fresh.id);
    expect(handoverBatchProgress(staff, fresh.id)).toMatchObject({ state: "running", finished: 0 });
  });

  it("another studio's pieces and mailings are 404s; nothing to send is a 422", async () => {
    const { staff } = await world();
    const other = await world();
    const theirs = await delivered(other.staff, { email: `${unique("o")}@test.example`, consent: true });
    expect(await statusOf(() => createHandoverBatch(staff, { pieceIds: [theirs.id] }))).toBe(404);
    const batch = createHandoverBatch(other.staff, { all: true });
    expect(await statusOf(() => handoverBatchProgress(staff, batch.id))).toBe(404);
    expect(await statusOf(() => createHandoverBatch(staff, { all: true }))).toBe(422);
  });
});
