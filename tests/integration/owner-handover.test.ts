// A piece handed on: its former owner keeps the repair jobs they paid for as history and loses the
// rest — open jobs, every visit, visit mail and the piece's (new owner's) address. One rule for jobs
// and visits (lib/repairs/owner-reach.ts), used by every owner query of both.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { payments, pieces } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { registerPiece } from "@/lib/owner/registration";
import { releasePiece } from "@/lib/owner/transfer";
import { getOwnerJob, listOwnerJobs } from "@/lib/repairs/jobs";
import { loadVisitMailView } from "@/lib/visits/mail";
import { bookingContext, visitOfJob } from "@/lib/visits/job-visit";
import { bookVisit } from "@/lib/visits/book";
import { cancelVisit } from "@/lib/visits/cancel";
import { listJobSlots } from "@/lib/visits/slots";
import { listVisits } from "@/lib/visits/list";
import { moveVisit } from "@/lib/visits/reschedule";
import { createUser } from "../support/fixtures";
import { addJob, luciaUser, ownerActor, staffActor, visitWorld } from "./visits-helpers";

const NEW_ADDRESS = "99 New Road, Elsewhere (invented)";

function expect404(fn: () => unknown) {
  let caught: unknown;
  try {
    fn();
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(AppError);
  expect((caught as AppError).status).toBe(404);
}

async function expect404Async(p: Promise<unknown>) {
  await expect(p).rejects.toMatchObject({ status: 404 });
}

describe("handing a piece on", () => {
  it("the former owner keeps paid history without the new address, and loses open jobs and every visit", async () => {
    const w = await visitWorld();
    // The paid job has a visit booked at the owner's address; a second, covered job is still open.
    getDb().insert(payments).values({ studioId: w.studio.id, jobId: w.job.id, quoteVersion: 1, checkoutSessionId: `cs_test_handover_${w.job.id}`, amountMinor: 12_500, currency: "USD", status: "paid", paidAt: new Date() }).run();
    const open = addJob(w.studio, w.piece.id, w.owner.id, w.product.id, "covered");
    const slot = listJobSlots(staffActor(w.staff), w.job.id, {}).slots[0]!;
    const visit = await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start, location: "owner" });
    const slot2 = listJobSlots(staffActor(w.staff), open.id, {}).slots.find((s) => s.start !== slot.start)!;
    const range = { from: new Date(Date.parse(slot.start) - 86_400_000).toISOString(), to: new Date(Date.parse(slot.start) + 86_400_000).toISOString() };

    // While they hold the piece the owner reaches all of it.
    const me = ownerActor(w.owner);
    expect(listOwnerJobs(w.owner).map((j) => j.id).sort()).toEqual([w.job.id, open.id].sort());
    expect(listVisits(me, range).visits.map((v) => v.id)).toEqual([visit.id]);
    expect(visitOfJob(me, w.job.id).visit?.id).toBe(visit.id);
    expect(loadVisitMailView(visit.id)!.owner?.email).toBe(w.owner.email);

    // They release it; a new owner registers it and the studio records the new address.
    const { code } = await releasePiece({ ...w.owner, name: w.owner.name, email: w.owner.email }, w.piece.id, { confirm: true });
    const next = luciaUser(await createUser({ emailVerifiedAt: new Date(), name: "New Owner (invented)" }));
    await registerPiece(next, { code }, "203.0.113.20");
    getDb().update(pieces).set({ deliveryAddress: NEW_ADDRESS }).where(eq(pieces.id, w.piece.id)).run();

    // History: the paid job and its payment, read-only.
    expect(listOwnerJobs(w.owner).map((j) => j.id)).toEqual([w.job.id]);
    const history = getOwnerJob(w.owner, w.job.id);
    expect(history.payments.map((p) => p.status)).toEqual(["paid"]);
    expect404(() => getOwnerJob(w.owner, w.job.id, "act"));
    // The open job is gone for them.
    expect404(() => getOwnerJob(w.owner, open.id));
    expect404(() => bookingContext(me, open.id));
    expect404(() => listJobSlots(me, open.id, {}));
    await expect404Async(bookVisit(me, { jobId: open.id, technicianId: slot2.technicianId, start: slot2.start, location: "owner" }));
    // No visit of the piece any more: not listed, not on the job page, not movable or cancellable.
    expect(listVisits(me, range).visits).toEqual([]);
    expect(visitOfJob(me, w.job.id).visit).toBeNull();
    expect404(() => bookingContext(me, w.job.id));
    await expect404Async(moveVisit(me, visit.id, { start: slot2.start }));
    await expect404Async(cancelVisit(me, visit.id));
    // Visit mail (changes, reminders) no longer goes to them.
    expect(loadVisitMailView(visit.id)!.owner).toBeNull();
    // Nothing they can still read carries the new address.
    const readable = JSON.stringify([listOwnerJobs(w.owner), getOwnerJob(w.owner, w.job.id), listVisits(me, range), visitOfJob(me, w.job.id)]);
    expect(readable).not.toContain(NEW_ADDRESS);
  });
});
