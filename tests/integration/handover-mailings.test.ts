// The scheduler's pass over stalled hand-over mailings (jobs/handover-mailings.ts), against a real
// SQLite file and the real SMTP sink: a bulk mailing left half-sent when the server stopped is
// finished by the pass, every remaining buyer gets exactly one hand-over mail and those already
// mailed none; two passes at once send nothing twice; a mailing someone is still working, or one
// just queued, is left alone; a stop ends a pass after the mail in hand. All data is invented.
import { and, eq, inArray } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { handoverBatches, handoverBatchItems, warrantyPolicies } from "@/db/schema";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { sendHandover } from "@/lib/pieces/handover";
import { createHandoverBatch, handoverBatchProgress, runHandoverBatch } from "@/lib/pieces/handover-batch";
import { deliverPiece } from "@/lib/pieces/handover-delivery";
import { deliverPieceSchema } from "@/lib/validation/clients";
import { describeHandoverMailings, handoverMailingsJob, STALLED_MAILING_MS } from "../../jobs/handover-mailings";
import { createStudio, memberContext, unique } from "../support/fixtures";
import { listMail } from "../support/mail";

const DELIVERED = new Date("2026-11-20T18:00:00Z");

async function world() {
  const studio = createStudio({ name: "Stalled Mail Joinery (invented)", timeZone: "UTC", email: `${unique("stall")}@test.example` });
  getDb().insert(warrantyPolicies).values({ studioId: studio.id, version: 1, effectiveFrom: "2024-01-01", policy: DEFAULT_WARRANTY_POLICY }).run();
  return { studio, staff: await memberContext(studio, "staff") };
}

type Staff = Awaited<ReturnType<typeof world>>["staff"];

/** A piece delivered to a new buyer who agreed to service mail, recorded without mailing them yet. */
async function delivered(staff: Staff, email: string): Promise<string> {
  const out = await deliverPiece(
    staff,
    deliverPieceSchema.parse({
      kind: "bench",
      title: `Elm settle ${unique("s")} (invented)`,
      shapeKind: "rectangle",
      lengthMm: 1500,
      widthMm: 420,
      primarySpeciesId: "white_oak",
      use: "moderate",
      deliveredOn: "2026-11-19",
      layers: [{ surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2026-11-17" }],
      buyer: "new",
      buyerName: `Buyer ${unique("n")} (invented)`,
      buyerEmail: email,
      buyerServiceMail: false,
    }),
    DELIVERED,
  );
  getDb().run(`update clients set consent_service = 1 where id = '${out.piece.clientId}'`);
  return out.piece.id;
}

const mailsTo = async (email: string) => (await listMail({ to: email })).filter((m) => /its care and warranty/.test(m.subject)).length;
const ago = (ms: number) => new Date(Date.now() - ms);

describe("the stalled hand-over mailing pass", () => {
  it("finishes a mailing stopped midway: each remaining buyer mailed once, those already mailed not again; two passes at once send nothing twice", async () => {
    const { staff } = await world();
    const emails = [0, 1, 2, 3, 4].map((i) => `${unique(`buyer${i}`)}@test.example`);
    const ids: string[] = [];
    for (const email of emails) ids.push(await delivered(staff, email));
    const batch = createHandoverBatch(staff, { pieceIds: ids });
    // As a runner leaves it when the server stops: the first piece sent and settled, the second sent
    // but its item still "sending", the rest pending; untouched for longer than the pass waits.
    await sendHandover(staff, ids[0]!, DELIVERED);
    await sendHandover(staff, ids[1]!, DELIVERED);
    const item = (pieceId: string) => and(eq(handoverBatchItems.batchId, batch.id), eq(handoverBatchItems.pieceId, pieceId));
    getDb().update(handoverBatchItems).set({ outcome: "sent" }).where(item(ids[0]!)).run();
    getDb().update(handoverBatchItems).set({ outcome: "sending" }).where(item(ids[1]!)).run();
    const stoppedAt = ago(STALLED_MAILING_MS + 60_000);
    getDb().update(handoverBatches).set({ state: "running", startedAt: stoppedAt, updatedAt: stoppedAt }).where(eq(handoverBatches.id, batch.id)).run();
    expect(handoverBatchProgress(staff, batch.id)).toMatchObject({ state: "running", sent: 1, stalled: true });

    const [a, b] = await Promise.all([handoverMailingsJob(), handoverMailingsJob()]);

    // One of the two passes took the mailing; the other found it taken.
    expect([...a.resumed, ...b.resumed].filter((id) => id === batch.id)).toHaveLength(1);
    expect(handoverBatchProgress(staff, batch.id)).toMatchObject({ state: "done", total: 5, finished: 5, sent: 5, failed: [], skipped: [], stalled: false });
    for (const email of emails) expect(await mailsTo(email), email).toBe(1);
    // A later pass finds nothing left to do.
    expect((await handoverMailingsJob()).resumed).not.toContain(batch.id);
    for (const email of emails) expect(await mailsTo(email), email).toBe(1);
  });

  it("takes up a mailing queued but never started; leaves one still being worked and one just queued", async () => {
    const { staff } = await world();
    const [early, busy, fresh] = [`${unique("early")}@test.example`, `${unique("busy")}@test.example`, `${unique("fresh")}@test.example`];
    const neverStarted = createHandoverBatch(staff, { pieceIds: [await delivered(staff, early)] });
    getDb().update(handoverBatches).set({ createdAt: ago(STALLED_MAILING_MS + 60_000), updatedAt: ago(STALLED_MAILING_MS + 60_000) }).where(eq(handoverBatches.id, neverStarted.id)).run();
    // A runner touched this one two minutes ago (it renews its hold after every piece): not stalled yet.
    const working = createHandoverBatch(staff, { pieceIds: [await delivered(staff, busy)] });
    getDb().update(handoverBatches).set({ state: "running", createdAt: ago(STALLED_MAILING_MS * 3), startedAt: ago(STALLED_MAILING_MS * 3), updatedAt: ago(120_000) }).where(eq(handoverBatches.id, working.id)).run();
    // Queued a moment ago: the request that wrote it sends it once it has answered.
    const justQueued = createHandoverBatch(staff, { pieceIds: [await delivered(staff, fresh)] });

    const { resumed } = await handoverMailingsJob();

    expect(resumed).toContain(neverStarted.id);
    expect(resumed).not.toContain(working.id);
    expect(resumed).not.toContain(justQueued.id);
    expect(handoverBatchProgress(staff, neverStarted.id)).toMatchObject({ state: "done", sent: 1 });
    const states = getDb().select({ id: handoverBatches.id, state: handoverBatches.state }).from(handoverBatches).where(inArray(handoverBatches.id, [working.id, justQueued.id])).all();
    expect(Object.fromEntries(states.map((s) => [s.id, s.state]))).toEqual({ [working.id]: "running", [justQueued.id]: "queued" });
    expect([await mailsTo(early), await mailsTo(busy), await mailsTo(fresh)]).toEqual([1, 0, 0]);
  });

  it("a stop (the scheduler's SIGTERM) ends the pass after the mail in hand; the next pass sends the rest, each buyer once", async () => {
    const { staff } = await world();
    const emails = [0, 1, 2, 3].map((i) => `${unique(`stop${i}`)}@test.example`);
    const ids: string[] = [];
    for (const email of emails) ids.push(await delivered(staff, email));
    const batch = createHandoverBatch(staff, { pieceIds: ids });
    const stalledSince = ago(STALLED_MAILING_MS + 60_000);
    getDb().update(handoverBatches).set({ createdAt: stalledSince, updatedAt: stalledSince }).where(eq(handoverBatches.id, batch.id)).run();
    const sentItems = () => getDb().select().from(handoverBatchItems).where(and(eq(handoverBatchItems.batchId, batch.id), eq(handoverBatchItems.outcome, "sent"))).all().length;

    // The signal comes while the first buyer's mail is going out.
    const shutdown = new AbortController();
    const first = await runHandoverBatch(batch.id, { signal: shutdown.signal, now: () => (sentItems() === 1 && shutdown.abort(), new Date()) });

    expect(first).toBe("stopped");
    expect(handoverBatchProgress(staff, batch.id)).toMatchObject({ state: "running", total: 4, sent: 1, finished: 1 });
    expect((await Promise.all(emails.map(mailsTo))).reduce((a, b) => a + b)).toBe(1);
    expect(describeHandoverMailings({ resumed: [], stopped: [batch.id] })).toEqual([`hand-over mailing ${batch.id}: stopped after the mail in hand; the next pass goes on with it`]);

    // Once its hold has run out, the next pass finishes it.
    getDb().update(handoverBatches).set({ updatedAt: stalledSince }).where(eq(handoverBatches.id, batch.id)).run();
    expect((await handoverMailingsJob()).resumed).toContain(batch.id);
    expect(handoverBatchProgress(staff, batch.id)).toMatchObject({ state: "done", total: 4, sent: 4, failed: [], skipped: [] });
    for (const email of emails) expect(await mailsTo(email), email).toBe(1);
  });
});
