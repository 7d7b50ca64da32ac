// The claim → repair thread against a real SQLite file: staff open the repair job of an accepted
// claim (the function behind POST /api/claims/[id]/job), the claim and the job name each other, and
// the claim moves on with the work — repair booked when the visit is booked, accepted again when it is
// cancelled, closed when the report is filed — each step in the audit log. The quote, approval and
// payment are stood in for by setting the job covered (their own tests are the repair job tests).
import { and, asc, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { auditLog, claims, repairJobs, users } from "@/db/schema";
import { createJobFromClaim } from "@/lib/claims/open-job";
import { getClaim } from "@/lib/claims/view-claim";
import { ownerActor } from "@/lib/auth/actor";
import { bookVisit } from "@/lib/visits/book";
import { cancelVisit } from "@/lib/visits/cancel";
import { listJobSlots } from "@/lib/visits/slots";
import { submitReport } from "@/lib/visits/report";
import { createAcceptedClaim, createStudio, memberContext } from "../support/fixtures";
import { reportInput, staffActor, statusOf, visitWorld } from "./visits-helpers";

const HOUR = 3_600_000;
const NOW = Date.parse("2027-05-03T12:00:00Z"); // Monday 3 May 2027, 08:00 in New York

/** A visit world whose piece has an accepted (covered) claim. */
async function claimThreadWorld() {
  const w = await visitWorld();
  const claim = createAcceptedClaim(w.studio, w.piece.id, w.owner.id, "covered");
  return { ...w, claim };
}

const claimState = (id: string) => getDb().select({ state: claims.state }).from(claims).where(eq(claims.id, id)).get()!.state;
const claimAudit = (id: string) =>
  getDb()
    .select({ action: auditLog.action, data: auditLog.data })
    .from(auditLog)
    .where(and(eq(auditLog.subjectType, "claim"), eq(auditLog.subjectId, id)))
    .orderBy(asc(auditLog.createdAt))
    .all();

describe("POST /api/claims/[id]/job: the repair job of an accepted claim", () => {
  it("opens one job that names the claim; the claim answers with its jobId; a second job, a claim not accepted and another studio are refused", async () => {
    const w = await claimThreadWorld();
    const job = createJobFromClaim(w.staff, w.claim.id);
    expect(job).toMatchObject({ claimId: w.claim.id, state: "draft" });
    expect(getDb().select().from(repairJobs).where(eq(repairJobs.id, job.id)).get()).toMatchObject({ claimId: w.claim.id, pieceId: w.piece.id, ownerId: w.owner.id, origin: "claim" });

    const asStaff = getClaim(w.staff, w.claim.id);
    expect(asStaff.claim.jobId).toBe(job.id);
    expect(asStaff.view === "staff" && asStaff.repair).toMatchObject({ jobId: job.id, stateLabel: "Being priced", visit: null });
    // The owner hears about the job once the studio has priced it; until then the claim says so.
    const asOwner = getClaim(ownerActor(w.owner), w.claim.id);
    expect(asOwner.claim.jobId).toBeNull();
    expect(asOwner.view === "owner" && asOwner.repair?.stage).toMatch(/pricing the repair/);

    expect(await statusOf(() => createJobFromClaim(w.staff, w.claim.id))).toBe(409);
    const open = createAcceptedClaim(w.studio, w.piece.id, w.owner.id, "chargeable");
    getDb().update(claims).set({ state: "in_review" }).where(eq(claims.id, open.id)).run();
    expect(await statusOf(() => createJobFromClaim(w.staff, open.id))).toBe(409);
    const stranger = await memberContext(createStudio({ name: "Another studio (invented)" }), "admin");
    expect(await statusOf(() => createJobFromClaim(stranger, w.claim.id))).toBe(404);
    expect(await statusOf(() => createJobFromClaim(w.staff, "no-such-claim"))).toBe(404);
    expect(getDb().select().from(repairJobs).where(eq(repairJobs.claimId, open.id)).all()).toHaveLength(0);
  });
});

describe("the claim follows the work", () => {
  it("repair booked when its job's visit is booked, accepted again when the visit is cancelled, closed when the report is filed; each step audited; the owner's page says where the repair stands", async () => {
    const w = await claimThreadWorld();
    getDb().update(users).set({ timeZone: "Europe/Berlin" }).where(eq(users.id, w.owner.id)).run();
    const { id: jobId } = createJobFromClaim(w.staff, w.claim.id);
    // Quote, approval and payment stood in for: the job is covered by the warranty.
    getDb().update(repairJobs).set({ state: "covered" }).where(eq(repairJobs.id, jobId)).run();
    expect(claimState(w.claim.id)).toBe("accepted");
    expect((getClaim(ownerActor(w.owner), w.claim.id) as { repair: { stage: string; jobId: string | null } }).repair).toMatchObject({ jobId, stage: expect.stringMatching(/Pick a time/) });

    const slots = listJobSlots(staffActor(w.staff), jobId, { from: "2027-05-04T12:00:00Z", to: "2027-05-07T00:00:00Z" }, NOW).slots;
    const first = await bookVisit(staffActor(w.staff), { jobId, technicianId: slots[0]!.technicianId, start: slots[0]!.start }, NOW);
    expect(claimState(w.claim.id)).toBe("repair_booked");
    const owned = getClaim(ownerActor(w.owner), w.claim.id) as { repair: { stage: string } };
    // 09:00 in New York, read on the owner's own clock and named: Europe/Berlin.
    expect(owned.repair.stage).toBe("Repair visit booked: Tuesday, 4 May 2027, 15:00–16:30 CEST.");
    const staffView = getClaim(w.staff, w.claim.id);
    expect(staffView.view === "staff" && staffView.repair?.visit).toMatchObject({ id: first.id, state: "booked" });

    await cancelVisit(staffActor(w.staff), first.id, { reason: "Owner away (invented)" }, NOW + HOUR);
    expect(claimState(w.claim.id)).toBe("accepted");

    const second = await bookVisit(staffActor(w.staff), { jobId, technicianId: slots[1]!.technicianId, start: slots[1]!.start }, NOW + 2 * HOUR);
    expect(claimState(w.claim.id)).toBe("repair_booked");
    await submitReport(w.tech, second.id, reportInput({ work: "Cleaned and re-oiled the ring marks (invented).", layers: [] }), new Date(Date.parse(second.start) + HOUR));
    expect(claimState(w.claim.id)).toBe("closed");
    expect((getClaim(ownerActor(w.owner), w.claim.id) as { repair: { stage: string } }).repair.stage).toMatch(/^The repair is done, \d+ May 2027\.$/);

    expect(claimAudit(w.claim.id).map((a) => [a.action, a.data.from, a.data.to, a.data.jobId])).toEqual([
      ["claim.repair_booked", "accepted", "repair_booked", jobId],
      ["claim.accepted", "repair_booked", "accepted", jobId],
      ["claim.repair_booked", "accepted", "repair_booked", jobId],
      ["claim.closed", "repair_booked", "closed", jobId],
    ]);
  });

  it("the decision's words on the owner's claim page follow the claim and its job: a quote is promised only until it is sent, and a done repair is told in the past tense", async () => {
    const w = await visitWorld();
    const claim = createAcceptedClaim(w.studio, w.piece.id, w.owner.id, "chargeable");
    const words = () => {
      const v = getClaim(ownerActor(w.owner), claim.id);
      return v.view === "owner" ? v.claim.decisionWords : null;
    };
    expect(words()).toBe("The repair isn't covered by your warranty, but the studio can do it as a paid repair. The studio will send you a quote.");
    const { id: jobId } = createJobFromClaim(w.staff, claim.id);
    expect(words()).toMatch(/will send you a quote\.$/); // still being priced
    // Quote, approval and payment stood in for, as above: each state set on the job.
    const jobState = (state: "quoted" | "approved" | "paid", quoteVersion = 1) => getDb().update(repairJobs).set({ state, quoteVersion }).where(eq(repairJobs.id, jobId)).run();
    jobState("quoted");
    expect(words()).toBe("The repair isn't covered by your warranty, but the studio can do it as a paid repair. The studio sent you a quote.");
    jobState("approved");
    expect(words()).toMatch(/The studio sent you a quote\.$/);
    jobState("paid");
    expect(words()).toMatch(/ You paid for the repair\.$/);
    const slot = listJobSlots(staffActor(w.staff), jobId, { from: "2027-05-04T12:00:00Z", to: "2027-05-07T00:00:00Z" }, NOW).slots[0]!;
    const visit = await bookVisit(staffActor(w.staff), { jobId, technicianId: slot.technicianId, start: slot.start }, NOW);
    expect(words()).toMatch(/ The repair visit is booked\.$/);
    await submitReport(w.tech, visit.id, reportInput({ work: "Filled and refinished the split (invented).", layers: [] }), new Date(Date.parse(visit.start) + HOUR));
    expect(claimState(claim.id)).toBe("closed");
    expect(words()).toBe("The repair wasn't covered by your warranty; the studio did it as a paid repair.");

    // Partly covered, its job cancelled; and a claim closed with no job promises nothing.
    const partly = createAcceptedClaim(w.studio, w.piece.id, w.owner.id, "partly_covered", 40);
    const partlyWords = () => (getClaim(ownerActor(w.owner), partly.id) as { claim: { decisionWords: string } }).claim.decisionWords;
    expect(partlyWords()).toBe("The warranty covers part of the repair. The studio will quote you the rest.");
    const { id: partlyJob } = createJobFromClaim(w.staff, partly.id);
    getDb().update(repairJobs).set({ state: "cancelled", quoteVersion: 1 }).where(eq(repairJobs.id, partlyJob)).run();
    expect(partlyWords()).toBe("The warranty covers part of the repair. The repair job was cancelled.");
    const closed = createAcceptedClaim(w.studio, w.piece.id, w.owner.id, "chargeable");
    getDb().update(claims).set({ state: "closed" }).where(eq(claims.id, closed.id)).run();
    expect((getClaim(ownerActor(w.owner), closed.id) as { claim: { decisionWords: string } }).claim.decisionWords).toBe(
      "The repair isn't covered by your warranty, but the studio can do it as a paid repair.",
    );
  });

  it("a job that did not come from a claim moves no claim", async () => {
    const w = await claimThreadWorld();
    const slot = listJobSlots(staffActor(w.staff), w.job.id, { from: "2027-05-04T12:00:00Z", to: "2027-05-07T00:00:00Z" }, NOW).slots[0]!;
    const v = await bookVisit(staffActor(w.staff), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW);
    await submitReport(w.tech, v.id, reportInput({ work: "Re-oiled (invented).", layers: [] }), new Date(Date.parse(v.start) + HOUR));
    expect(claimState(w.claim.id)).toBe("accepted");
    expect(claimAudit(w.claim.id)).toHaveLength(0);
  });
});
