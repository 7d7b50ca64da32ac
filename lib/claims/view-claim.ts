import "server-only";
import { and, asc, desc, eq, inArray } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { ownerMayWrite, subjectMessages } from "@/lib/messages/store";
import { clients, files, pieces, repairJobs, users, visits, type Claim } from "@/db/schema";
import { ownerActor, type Actor } from "@/lib/auth/actor";
import type { StudioContext } from "@/lib/auth/guards";
import { localDate } from "@/lib/care/dates";
import { formatDate } from "@/lib/format";
import { jobWhere } from "@/lib/repairs/access";
import type { OwnerReach } from "@/lib/repairs/owner-reach";
import { jobStateLabel } from "@/lib/repairs/states";
import { formatVisitWhen, ownerTimeZone } from "@/lib/format";
import { claimCore, fileUrl, loadStudioClaim, loadVisibleClaim, photoView, studioOf } from "./claim-row";
import { coverageOf } from "./claim-piece";
import { ownerDecisionWords, type RepairStep } from "./labels";

// One claim as its owner sees it (state, photos, messages, the decision, where the repair stands) or as
// staff see it (all of that plus the piece record, its care log and the coverage check).

/** The claim's conversation (lib/messages: one thread per claim, also fed by e-mailed replies). */
function messagesOf(claimId: string) {
  return subjectMessages(getDb(), { kind: "claim", id: claimId }).map((m) => ({ id: m.id, body: m.body, fromStudio: m.author === "staff", createdAt: m.createdAt, authorName: m.authorName }));
}

function photosOf(claimId: string) {
  return getDb().select().from(files).where(and(eq(files.claimId, claimId), eq(files.purpose, "claim_photo"))).orderBy(asc(files.createdAt)).all().map(photoView);
}

/** The repair job made from the claim (at most one) and its latest booked or done visit. */
function jobOfClaim(claimId: string) {
  const db = getDb();
  const job = db
    .select({ id: repairJobs.id, state: repairJobs.state, origin: repairJobs.origin, coveredPct: repairJobs.coveredPct, title: repairJobs.title, quoteVersion: repairJobs.quoteVersion, doneAt: repairJobs.doneAt })
    .from(repairJobs)
    .where(eq(repairJobs.claimId, claimId))
    .orderBy(desc(repairJobs.createdAt))
    .get();
  if (!job) return null;
  const visit = db
    .select({ id: visits.id, state: visits.state, startAt: visits.startAt, endAt: visits.endAt })
    .from(visits)
    .where(and(eq(visits.jobId, job.id), inArray(visits.state, ["booked", "done"])))
    .orderBy(desc(visits.startAt))
    .get();
  return { ...job, visit: visit ?? null };
}

/** Whether the owner reaches the job ("act": they hold the piece; "history": also a former owner's paid job), lib/repairs/owner-reach.ts. */
function ownerReaches(ownerId: string, jobId: string, reach: OwnerReach): boolean {
  return !!getDb().select({ id: repairJobs.id }).from(repairJobs).where(jobWhere({ role: "owner", user: { id: ownerId }, studio: null }, jobId, reach)).get();
}

/**
 * Where the repair stands, in the owner's words; the job's page is theirs to open once a quote was sent.
 * After a hand-over the former owner reads only a job they paid for, as history, and never its visit
 * (the same rule as their job and visit pages, lib/repairs/owner-reach.ts). Also the step the decision's
 * words follow (ownerDecisionWords, lib/claims/labels.ts).
 */
function ownerRepair(claim: Claim, timeZone: string) {
  const found = jobOfClaim(claim.id);
  if (!found) return { repair: null, step: claim.state === "closed" ? ("closed" as const) : ("none" as const) };
  const acts = ownerReaches(claim.ownerId, found.id, "act");
  if (!acts && !ownerReaches(claim.ownerId, found.id, "history")) return { repair: null, step: "unseen" as const };
  const job = acts ? found : { ...found, visit: null };
  const when = job.visit ? formatVisitWhen(job.visit.startAt.getTime(), job.visit.endAt.getTime(), timeZone) : "";
  const STAGE: Record<typeof job.state, string> = {
    draft: job.quoteVersion === 0 ? "The studio is pricing the repair. You get the quote by e-mail." : "The studio is revising the quote.",
    quoted: "Your repair quote is ready: look it over and approve it.",
    approved: "You approved the quote; the repair is waiting for your payment.",
    paid: "Paid. Pick a time for the repair visit.",
    covered: "Covered by your warranty. Pick a time for the repair visit.",
    scheduled: when ? `Repair visit booked: ${when}.` : "Repair visit booked.",
    done: `The repair is done${job.doneAt ? `, ${formatDate(localDate(job.doneAt.getTime(), timeZone))}` : ""}.`,
    cancelled: "The repair job was cancelled. Write to the studio if that is unexpected.",
  };
  const visible = !(job.state === "draft" && job.quoteVersion === 0);
  // A quote revised back to draft was still sent; approved is a sent quote not yet paid.
  const step: RepairStep = job.state === "draft" ? (visible ? "quoted" : "none") : job.state === "approved" ? "quoted" : job.state;
  return { repair: { jobId: visible ? job.id : null, state: job.state, stage: STAGE[job.state] }, step };
}

/** The repair job of the claim as staff see it: its state in the studio's words and its visit. */
function staffRepair(claimId: string, timeZone: string) {
  const job = jobOfClaim(claimId);
  if (!job) return null;
  return {
    jobId: job.id,
    title: job.title,
    state: job.state,
    stateLabel: jobStateLabel(job),
    visit: job.visit ? { id: job.visit.id, state: job.visit.state, when: formatVisitWhen(job.visit.startAt.getTime(), job.visit.endAt.getTime(), timeZone) } : null,
  };
}

/** The claim as its owner sees it: state, photos, messages, decision and the reason, and where the repair stands. */
function ownerView(claim: Claim) {
  const piece = getDb().select({ id: pieces.id, title: pieces.title }).from(pieces).where(eq(pieces.id, claim.pieceId)).get()!;
  const studio = studioOf(claim.studioId);
  const owner = getDb()
    .select({ timeZone: users.timeZone, clientZone: clients.timeZone })
    .from(users)
    .leftJoin(clients, and(eq(clients.userId, users.id), eq(clients.studioId, claim.studioId)))
    .where(eq(users.id, claim.ownerId))
    .get();
  const { repair, step } = ownerRepair(claim, ownerTimeZone(owner?.timeZone ?? "UTC", owner?.clientZone, studio.timeZone));
  const decisionWords = claim.decision ? ownerDecisionWords(claim.decision, step) : null;
  // Whether the owner still holds the piece: after a hand-over the claim is their history, read only (the writes' rule, lib/claims/claim-row.ts).
  const mayWrite = ownerMayWrite(getDb(), claim.ownerId, { kind: "claim", id: claim.id });
  return { view: "owner" as const, claim: { ...claimCore(claim), jobId: repair?.jobId ?? null, decisionWords }, repair, piece, studio: { name: studio.name, email: studio.email }, photos: photosOf(claim.id), messages: messagesOf(claim.id), mayWrite };
}

/** The claim as staff see it: all of the owner's view plus the piece record, care log and coverage check. */
function staffView(claim: Claim) {
  const studio = studioOf(claim.studioId);
  const { coverage, piece, layers, careLog } = coverageOf(claim, studio);
  const owner = getDb().select({ id: users.id, name: users.name, email: users.email }).from(users).where(eq(users.id, claim.ownerId)).get()!;
  const { registrationCodeHash: _h, registrationCodeEnc: _e, ...pieceRecord } = piece;
  void _h;
  void _e;
  const repair = staffRepair(claim.id, studio.timeZone);
  return {
    view: "staff" as const,
    claim: { ...claimCore(claim), jobId: repair?.jobId ?? null, suggestion: claim.suggestion, waitMs: (claim.firstAnsweredAt?.getTime() ?? Date.now()) - claim.createdAt.getTime() },
    repair,
    owner,
    studio: { id: studio.id, name: studio.name, timeZone: studio.timeZone, unitSystem: studio.unitSystem },
    piece: pieceRecord,
    layers,
    careLog: careLog.map((e) => ({ id: e.id, taskKind: e.taskKind, surface: e.surface, doneOn: e.doneOn, source: e.source, productUsed: e.productUsed, notes: e.notes, photoUrl: e.photoFileId ? fileUrl(e.photoFileId, true) : null })),
    coverage,
    photos: photosOf(claim.id),
    messages: messagesOf(claim.id),
    // Whether the claim's owner can still answer on it (they hold the piece; lib/claims/reply.ts refuses
    // asking a former owner for more).
    ownerMayAnswer: ownerMayWrite(getDb(), claim.ownerId, { kind: "claim", id: claim.id }),
  };
}

export type OwnerClaimView = ReturnType<typeof ownerView>;
export type StaffClaimView = ReturnType<typeof staffView>;

export function getClaim(actor: Actor, claimId: string): OwnerClaimView | StaffClaimView {
  const { claim, asStaff } = loadVisibleClaim(actor, claimId);
  return asStaff ? staffView(claim) : ownerView(claim);
}

/** For the owner pages: the claim only if it is the user's own (staff of the studio use getStaffClaim). */
export function getOwnerClaim(user: User, claimId: string): OwnerClaimView {
  const { claim } = loadVisibleClaim(ownerActor(user), claimId);
  return ownerView(claim);
}

export function getStaffClaim(ctx: StudioContext, claimId: string): StaffClaimView {
  return staffView(loadStudioClaim(ctx.studio.id, claimId));
}
