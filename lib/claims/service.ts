import "server-only";
import { and, asc, count, desc, eq, gte, inArray, isNull, lt, sql, type SQL } from "drizzle-orm";
import type { User } from "lucia";
import { getDb } from "@/db/client";
import { appendMessage, ownerMayWrite, subjectMessages, threadFor } from "@/lib/messages/store";
import {
  careLogEntries,
  claims,
  clients,
  files,
  finishLayers,
  finishProducts,
  ownerships,
  pieces,
  repairJobs,
  studios,
  users,
  visits,
  warrantyPolicies,
  type Claim,
  type Studio,
} from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioContext } from "@/lib/auth/guards";
import { localDate } from "@/lib/care/dates";
import { conflict, forbidden, notFound, unprocessable } from "@/lib/errors";
import { containsText } from "@/lib/text-match";
import { formatDate } from "@/lib/owner/format";
import { createJob } from "@/lib/repairs/jobs";
import { JOB_STATE_LABELS } from "@/lib/repairs/states";
import { removeStoredFiles, storeImage } from "@/lib/storage";
import { formatVisitWhen, ownerTimeZone } from "@/lib/visits/format";
import {
  claimDecisionSchema,
  claimListQuerySchema,
  claimMessageSchema,
  createClaimSchema,
  type ClaimListQuery,
} from "@/lib/validation/claims";
import { claimCoverage, readAnswers, suggestionRecord, type ClaimCoverage } from "./coverage";
import { mailClaimDecision, mailClaimMessage, mailClaimReceived } from "./mail";
import { ownerAnswered } from "./owner-answer";
import { canTransition, MAX_CLAIM_PHOTOS, OPEN_STATES, stateForDecision, type ClaimState } from "./states";
import type { ClaimViewer } from "./viewer";

// Claims: filing, photos, the triage queue, messages, state changes and decisions. Every function
// authorizes next to its query: the claim's owner, or staff of the claim's studio; anyone else gets
// a 404 so a claim's existence is not revealed.

const DAY = 86_400_000;

export function fileUrl(fileId: string, thumb = false): string {
  return `/api/files/${fileId}${thumb ? "?thumb=1" : ""}`;
}

function photoView(f: { id: string; width: number; height: number; createdAt: Date }) {
  return { id: f.id, url: fileUrl(f.id), thumbUrl: fileUrl(f.id, true), width: f.width, height: f.height, createdAt: f.createdAt.toISOString() };
}
export type ClaimPhoto = ReturnType<typeof photoView>;

/** The claim row, if the viewer may see it (owner, or staff of its studio); otherwise 404. */
function loadVisibleClaim(viewer: ClaimViewer, claimId: string): { claim: Claim; asStaff: boolean } {
  const claim = getDb().select().from(claims).where(eq(claims.id, claimId)).get();
  if (!claim) throw notFound("No claim with that id.");
  if (viewer.staff && viewer.staff.studio.id === claim.studioId) return { claim, asStaff: true };
  if (claim.ownerId === viewer.user.id) return { claim, asStaff: false };
  throw notFound("No claim with that id.");
}

function studioOf(studioId: string): Studio {
  return getDb().select().from(studios).where(eq(studios.id, studioId)).get()!;
}

// ---------------------------------------------------------------- filing

export async function createClaim(viewer: ClaimViewer, raw: unknown) {
  const input = createClaimSchema.parse(raw);
  const db = getDb();
  const piece = db
    .select()
    .from(pieces)
    .where(and(eq(pieces.id, input.pieceId), eq(pieces.ownerId, viewer.user.id), isNull(pieces.archivedAt)))
    .get();
  if (!piece) throw notFound("No piece of yours with that id.");
  const studio = studioOf(piece.studioId);
  const today = localDate(Date.now(), studio.timeZone);
  if (input.noticedOn > today) throw unprocessable("invalid_date", "That date is in the future.", { noticedOn: ["That date is in the future."] });
  if (input.noticedOn < piece.deliveredOn) {
    const msg = `The piece was delivered on ${piece.deliveredOn}; pick a date after that.`;
    throw unprocessable("invalid_date", msg, { noticedOn: [msg] });
  }
  const claim = db.transaction((tx) => {
    const row = tx
      .insert(claims)
      .values({
        studioId: piece.studioId,
        pieceId: piece.id,
        ownerId: viewer.user.id,
        category: input.category,
        noticedOn: input.noticedOn,
        description: input.description,
        answers: input.answers as Record<string, unknown>,
        state: "submitted",
      })
      .returning()
      .get();
    recordAudit(tx, { studioId: piece.studioId, actorId: viewer.user.id, action: "claim.submitted", subjectType: "claim", subjectId: row.id, data: { pieceId: piece.id, category: input.category } });
    return row;
  });
  await mailClaimReceived({ claim, piece, studio, owner: viewer.user });
  return { id: claim.id, state: claim.state, version: claim.version, category: claim.category, pieceId: claim.pieceId, createdAt: claim.createdAt.toISOString() };
}

// ---------------------------------------------------------------- photos

function photoCount(claimId: string): number {
  return getDb().select({ n: count() }).from(files).where(and(eq(files.claimId, claimId), eq(files.purpose, "claim_photo"))).get()?.n ?? 0;
}

/**
 * Adds one photo to an open claim of the viewer's. `read` is called only after the viewer is
 * authorized, so a stranger's upload is never read; the image is checked and cleaned by lib/storage.
 */
export async function addClaimPhoto(viewer: ClaimViewer, claimId: string, read: () => Promise<Uint8Array>): Promise<ClaimPhoto> {
  const { claim } = loadVisibleClaim(viewer, claimId);
  if (claim.ownerId !== viewer.user.id) throw forbidden("Only the owner who filed the claim adds photos to it.");
  if (!OPEN_STATES.includes(claim.state)) throw conflict("This claim has been decided; photos can no longer be added. Send the studio a message instead.");
  if (photoCount(claim.id) >= MAX_CLAIM_PHOTOS) throw conflict(`A claim holds at most ${MAX_CLAIM_PHOTOS} photos. Remove one to add another.`);
  const stored = await storeImage(await read(), viewer.user.id);
  try {
    return getDb().transaction((tx) => {
      const n = tx.select({ n: count() }).from(files).where(and(eq(files.claimId, claim.id), eq(files.purpose, "claim_photo"))).get()?.n ?? 0;
      if (n >= MAX_CLAIM_PHOTOS) throw conflict(`A claim holds at most ${MAX_CLAIM_PHOTOS} photos. Remove one to add another.`);
      const row = tx
        .insert(files)
        .values({ studioId: claim.studioId, purpose: "claim_photo", pieceId: claim.pieceId, claimId: claim.id, uploadedById: viewer.user.id, ...stored })
        .returning()
        .get();
      recordAudit(tx, { studioId: claim.studioId, actorId: viewer.user.id, action: "claim.photo_added", subjectType: "claim", subjectId: claim.id, data: { fileId: row.id } });
      return photoView(row);
    });
  } catch (e) {
    await removeStoredFiles(stored.storageKey, stored.thumbKey);
    throw e;
  }
}

/** The owner removes a photo while the claim is still new (before the studio started reviewing). */
export async function removeClaimPhoto(viewer: ClaimViewer, claimId: string, fileId: string): Promise<void> {
  const { claim } = loadVisibleClaim(viewer, claimId);
  const file = getDb().select().from(files).where(and(eq(files.id, fileId), eq(files.claimId, claim.id))).get();
  if (!file) throw notFound("No such photo on this claim.");
  if (claim.ownerId !== viewer.user.id) throw forbidden("Only the owner who filed the claim removes its photos.");
  if (claim.state !== "submitted") throw conflict("The studio has started reviewing this claim, so its photos stay. Send a message if one was a mistake.");
  getDb().transaction((tx) => {
    tx.delete(files).where(eq(files.id, file.id)).run();
    recordAudit(tx, { studioId: claim.studioId, actorId: viewer.user.id, action: "claim.photo_removed", subjectType: "claim", subjectId: claim.id, data: { fileId } });
  });
  await removeStoredFiles(file.storageKey, file.thumbKey);
}

// ---------------------------------------------------------------- lists

const photoCountSql = sql<number>`(select count(*) from ${files} where ${files.claimId} = ${claims.id} and ${files.purpose} = 'claim_photo')`;

export function listOwnerClaims(user: Pick<User, "id">) {
  return getDb()
    .select({
      id: claims.id,
      state: claims.state,
      category: claims.category,
      decision: claims.decision,
      coveredPct: claims.coveredPct,
      createdAt: claims.createdAt,
      updatedAt: claims.updatedAt,
      pieceId: claims.pieceId,
      pieceTitle: pieces.title,
      studioName: studios.name,
      photos: photoCountSql,
    })
    .from(claims)
    .innerJoin(pieces, eq(pieces.id, claims.pieceId))
    .innerJoin(studios, eq(studios.id, claims.studioId))
    .where(eq(claims.ownerId, user.id))
    .orderBy(desc(claims.createdAt))
    .all()
    .map((r) => ({ ...r, createdAt: r.createdAt.toISOString(), updatedAt: r.updatedAt.toISOString() }));
}

export const CLAIM_PAGE_SIZE = 50;

/** The studio's triage queue, filtered, searched and sorted by age, a page at a time; `now` is the server's clock for wait times. */
export function listStudioClaims(ctx: StudioContext, rawQuery: unknown, now = Date.now()) {
  const q: ClaimListQuery = claimListQuerySchema.parse(rawQuery ?? {});
  const where: SQL[] = [eq(claims.studioId, ctx.studio.id)];
  if (q.state === "open") where.push(inArray(claims.state, [...OPEN_STATES]));
  else if (q.state !== "all") where.push(eq(claims.state, q.state));
  if (q.category !== "all") where.push(eq(claims.category, q.category));
  if (q.pieceId) where.push(eq(claims.pieceId, q.pieceId));
  const at = (days: number) => new Date(now - days * DAY);
  if (q.age === "under_2d") where.push(gte(claims.createdAt, at(2)));
  if (q.age === "2_to_7d") where.push(and(lt(claims.createdAt, at(2)), gte(claims.createdAt, at(7)))!);
  if (q.age === "over_7d") where.push(lt(claims.createdAt, at(7)));
  if (q.q) where.push(containsText(q.q, pieces.title, users.name, users.email));
  const total =
    getDb()
      .select({ n: count() })
      .from(claims)
      .innerJoin(pieces, eq(pieces.id, claims.pieceId))
      .innerJoin(users, eq(users.id, claims.ownerId))
      .where(and(...where))
      .get()?.n ?? 0;
  const rows = getDb()
    .select({
      id: claims.id,
      state: claims.state,
      category: claims.category,
      decision: claims.decision,
      coveredPct: claims.coveredPct,
      createdAt: claims.createdAt,
      firstAnsweredAt: claims.firstAnsweredAt,
      pieceId: claims.pieceId,
      pieceTitle: pieces.title,
      ownerName: users.name,
      photos: photoCountSql,
    })
    .from(claims)
    .innerJoin(pieces, eq(pieces.id, claims.pieceId))
    .innerJoin(users, eq(users.id, claims.ownerId))
    .where(and(...where))
    .orderBy(q.sort === "oldest" ? asc(claims.createdAt) : desc(claims.createdAt), asc(claims.id))
    .limit(CLAIM_PAGE_SIZE)
    .offset((q.page - 1) * CLAIM_PAGE_SIZE)
    .all()
    .map((r) => ({
      ...r,
      createdAt: r.createdAt.toISOString(),
      firstAnsweredAt: r.firstAnsweredAt?.toISOString() ?? null,
      /** Time to the studio's first answer, or the wait so far when there is none yet. */
      waitMs: (r.firstAnsweredAt?.getTime() ?? now) - r.createdAt.getTime(),
      answered: r.firstAnsweredAt !== null,
    }));
  const piecesWithClaims = getDb()
    .selectDistinct({ id: pieces.id, title: pieces.title })
    .from(claims)
    .innerJoin(pieces, eq(pieces.id, claims.pieceId))
    .where(eq(claims.studioId, ctx.studio.id))
    .orderBy(asc(pieces.title))
    .all();
  return { claims: rows, total, page: q.page, pageSize: CLAIM_PAGE_SIZE, pieces: piecesWithClaims, query: q, now: new Date(now).toISOString() };
}

// ---------------------------------------------------------------- one claim

/** The claim's conversation (lib/messages: one thread per claim, also fed by e-mailed replies). */
function messagesOf(claimId: string) {
  return subjectMessages(getDb(), { kind: "claim", id: claimId }).map((m) => ({ id: m.id, body: m.body, fromStudio: m.author === "staff", createdAt: m.createdAt, authorName: m.authorName }));
}

function photosOf(claimId: string) {
  return getDb().select().from(files).where(and(eq(files.claimId, claimId), eq(files.purpose, "claim_photo"))).orderBy(asc(files.createdAt)).all().map(photoView);
}

/** Everything the coverage check needs about the claim's piece, scoped to the claim's studio. */
function coverageOf(claim: Claim, studio: Studio): { coverage: ClaimCoverage; piece: typeof pieces.$inferSelect; layers: (typeof finishLayers.$inferSelect)[]; careLog: (typeof careLogEntries.$inferSelect)[] } {
  const db = getDb();
  const piece = db.select().from(pieces).where(and(eq(pieces.id, claim.pieceId), eq(pieces.studioId, claim.studioId))).get()!;
  const layers = db.select().from(finishLayers).where(eq(finishLayers.pieceId, piece.id)).orderBy(asc(finishLayers.surface), asc(finishLayers.position)).all();
  const careLog = db.select().from(careLogEntries).where(eq(careLogEntries.pieceId, piece.id)).orderBy(desc(careLogEntries.doneOn)).all();
  const products = db.select().from(finishProducts).where(eq(finishProducts.studioId, claim.studioId)).all();
  const policyRow = piece.warrantyPolicyId
    ? (db.select().from(warrantyPolicies).where(and(eq(warrantyPolicies.id, piece.warrantyPolicyId), eq(warrantyPolicies.studioId, claim.studioId))).get() ?? null)
    : null;
  const owns = db.select({ userId: ownerships.userId, startedAt: ownerships.startedAt }).from(ownerships).where(eq(ownerships.pieceId, piece.id)).all();
  const coverage = claimCoverage({ claim, piece, layers, careLog, products, policyRow, ownerships: owns, timeZone: studio.timeZone });
  return { coverage, piece, layers, careLog };
}

function claimCore(claim: Claim) {
  return {
    id: claim.id,
    state: claim.state,
    version: claim.version,
    category: claim.category,
    noticedOn: claim.noticedOn,
    description: claim.description,
    answers: readAnswers(claim.answers),
    decision: claim.decision,
    coveredPct: claim.coveredPct,
    decisionReason: claim.decisionReason,
    decidedAt: claim.decidedAt?.toISOString() ?? null,
    firstAnsweredAt: claim.firstAnsweredAt?.toISOString() ?? null,
    createdAt: claim.createdAt.toISOString(),
    updatedAt: claim.updatedAt.toISOString(),
  };
}

// ---------------------------------------------------------------- where the repair stands

/** The repair job made from the claim (at most one) and its latest booked or done visit. */
function jobOfClaim(claimId: string) {
  const db = getDb();
  const job = db
    .select({ id: repairJobs.id, state: repairJobs.state, title: repairJobs.title, quoteVersion: repairJobs.quoteVersion, doneAt: repairJobs.doneAt })
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

/** Where the repair stands, in the owner's words; the job's page is theirs to open once a quote was sent. */
function ownerRepair(claimId: string, timeZone: string) {
  const job = jobOfClaim(claimId);
  if (!job) return null;
  const when = job.visit ? `${formatVisitWhen(job.visit.startAt.getTime(), job.visit.endAt.getTime(), timeZone)} (${timeZone})` : "";
  const STAGE: Record<typeof job.state, string> = {
    draft: job.quoteVersion === 0 ? "The studio is pricing the repair. You get the quote by e-mail." : "The studio is revising the quote.",
    quoted: "Your repair quote is ready: look it over and approve it.",
    approved: "You approved the quote; the repair is waiting for your payment.",
    paid: "Paid. Pick a time for the repair visit.",
    covered: "Covered by your warranty. Pick a time for the repair visit.",
    scheduled: `Repair visit booked: ${when}.`,
    done: `The repair is done${job.doneAt ? `, ${formatDate(localDate(job.doneAt.getTime(), timeZone))}` : ""}.`,
    cancelled: "The repair job was cancelled. Write to the studio if that is unexpected.",
  };
  const visible = !(job.state === "draft" && job.quoteVersion === 0);
  return { jobId: visible ? job.id : null, state: job.state, stage: STAGE[job.state] };
}

/** The repair job of the claim as staff see it: its state in the studio's words and its visit. */
function staffRepair(claimId: string, timeZone: string) {
  const job = jobOfClaim(claimId);
  if (!job) return null;
  return {
    jobId: job.id,
    title: job.title,
    state: job.state,
    stateLabel: JOB_STATE_LABELS[job.state],
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
  const repair = ownerRepair(claim.id, ownerTimeZone(owner?.timeZone ?? "UTC", owner?.clientZone, studio.timeZone));
  return { view: "owner" as const, claim: { ...claimCore(claim), jobId: repair?.jobId ?? null }, repair, piece, studio: { name: studio.name }, photos: photosOf(claim.id), messages: messagesOf(claim.id) };
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
  };
}

export type OwnerClaimView = ReturnType<typeof ownerView>;
export type StaffClaimView = ReturnType<typeof staffView>;

export function getClaim(viewer: ClaimViewer, claimId: string): OwnerClaimView | StaffClaimView {
  const { claim, asStaff } = loadVisibleClaim(viewer, claimId);
  return asStaff ? staffView(claim) : ownerView(claim);
}

/** For the owner pages: the claim only if it is the viewer's own (staff of the studio use getStaffClaim). */
export function getOwnerClaim(user: Pick<User, "id" | "name" | "email">, claimId: string): OwnerClaimView {
  const { claim } = loadVisibleClaim({ user, staff: null }, claimId);
  return ownerView(claim);
}

export function getStaffClaim(ctx: StudioContext, claimId: string): StaffClaimView {
  const claim = getDb().select().from(claims).where(and(eq(claims.id, claimId), eq(claims.studioId, ctx.studio.id))).get();
  if (!claim) throw notFound("No claim with that id in this studio.");
  return staffView(claim);
}

// ---------------------------------------------------------------- state changes

type Tx = Parameters<Parameters<ReturnType<typeof getDb>["transaction"]>[0]>[0];

/**
 * Moves a claim from `claim.state` to `to` with a conditional UPDATE on (state, version): if another
 * writer changed the claim first, no row matches and the change is refused with a 409.
 */
function moveState(tx: Tx, claim: Claim, to: ClaimState, expectedVersion: number | undefined, extra: Partial<typeof claims.$inferInsert> = {}): Claim {
  if (!canTransition(claim.state, to)) throw conflict(`A claim that is ${claim.state.replace("_", " ")} cannot move to ${to.replace("_", " ")}.`);
  return writeState(tx, claim, to, expectedVersion, extra);
}

/** The conditional UPDATE of moveState, for a move the caller has already checked. */
function writeState(tx: Tx, claim: Claim, to: ClaimState, expectedVersion: number | undefined, extra: Partial<typeof claims.$inferInsert> = {}): Claim {
  const version = expectedVersion ?? claim.version;
  const updated = tx
    .update(claims)
    .set({ ...extra, state: to, version: sql`${claims.version} + 1`, updatedAt: new Date() })
    .where(and(eq(claims.id, claim.id), eq(claims.studioId, claim.studioId), eq(claims.state, claim.state), eq(claims.version, version)))
    .returning()
    .get();
  if (!updated) throw conflict("Someone else changed this claim a moment ago. Reload it to see what changed.");
  return updated;
}

/**
 * A staff change of state that is not a decision (start review, back to review, and — for the repair
 * and visit work — repair booked and closed). Decisions go through decideClaim, which records the
 * coverage suggestion.
 */
export function transitionClaim(ctx: StudioContext, claimId: string, raw: { to: ClaimState; expectedVersion?: number; data?: Record<string, unknown> }) {
  const claim = getDb().select().from(claims).where(and(eq(claims.id, claimId), eq(claims.studioId, ctx.studio.id))).get();
  if (!claim) throw notFound("No claim with that id in this studio.");
  if (raw.to === "accepted" || raw.to === "declined") {
    if (!canTransition(claim.state, raw.to)) throw conflict(`A claim that is ${claim.state.replace("_", " ")} cannot move to ${raw.to}.`);
    throw conflict("Accepting or declining a claim is a decision: use the decision form, so the coverage suggestion is recorded with it.");
  }
  return getDb().transaction((tx) => {
    const updated = moveState(tx, claim, raw.to, raw.expectedVersion);
    recordAudit(tx, { studioId: claim.studioId, actorId: ctx.user.id, action: `claim.${raw.to}`, subjectType: "claim", subjectId: claim.id, data: { from: claim.state, to: raw.to, ...(raw.data ?? {}) } });
    return claimCore(updated);
  });
}

// ---------------------------------------------------------------- the repair thread

/**
 * POST /api/claims/[id]/job: staff open the repair job of an accepted claim of their studio, through
 * lib/repairs (which refuses a claim that is not accepted or already has its job).
 */
export function createJobFromClaim(ctx: StudioContext, claimId: string) {
  const claim = getDb().select({ id: claims.id }).from(claims).where(and(eq(claims.id, claimId), eq(claims.studioId, ctx.studio.id))).get();
  if (!claim) throw notFound("No claim with that id in this studio.");
  const job = createJob(ctx, "claim", claim.id);
  return { id: job.id, state: job.state, claimId: job.claimId, title: job.title };
}

/**
 * Moves the claim a repair job was made from along with the work, inside the caller's transaction:
 * accepted → repair booked when the job's visit is booked; closed when the job is done (through
 * repair booked if it never got there). A cancelled visit undoes the booking: repair booked → accepted,
 * a step outside the state table, which staff can't take by hand (it would skip the decision form).
 * A job without a claim, or a claim already past the step, is left as it is.
 */
export function followJob(tx: Tx, jobId: string, event: "visit_booked" | "visit_cancelled" | "job_done", actorId: string | null): ClaimState | null {
  const row = tx.select({ claim: claims }).from(repairJobs).innerJoin(claims, eq(claims.id, repairJobs.claimId)).where(eq(repairJobs.id, jobId)).get();
  if (!row) return null;
  let claim = row.claim;
  const step = (to: ClaimState, move: typeof moveState) => {
    const from = claim.state;
    claim = move(tx, claim, to, undefined);
    recordAudit(tx, { studioId: claim.studioId, actorId, action: `claim.${to}`, subjectType: "claim", subjectId: claim.id, data: { from, to, jobId, by: event } });
  };
  if (event === "visit_cancelled") {
    if (claim.state === "repair_booked") step("accepted", writeState);
    return claim.state;
  }
  for (const to of event === "visit_booked" ? (["repair_booked"] as const) : (["repair_booked", "closed"] as const)) {
    if (canTransition(claim.state, to)) step(to, moveState);
  }
  return claim.state;
}

// ---------------------------------------------------------------- messages

export async function postClaimMessage(viewer: ClaimViewer, claimId: string, raw: unknown) {
  const input = claimMessageSchema.parse(raw);
  const { claim, asStaff } = loadVisibleClaim(viewer, claimId);
  if (claim.state === "closed") throw conflict("This claim is closed. Start a new claim if something else needs the studio's attention.");
  if (!asStaff && !ownerMayWrite(getDb(), viewer.user.id, { kind: "claim", id: claim.id })) throw forbidden("The piece has a new owner now, so this claim takes no more messages from you.");
  if (input.requestInfo && !asStaff) throw forbidden("Only the studio asks for more information.");
  const now = new Date();
  const result = getDb().transaction((tx) => {
    let current = claim;
    if (asStaff && input.requestInfo) current = moveState(tx, claim, "awaiting_owner", undefined, { firstAnsweredAt: claim.firstAnsweredAt ?? now });
    else if (!asStaff) current = ownerAnswered(tx, claim);
    else if (asStaff && !claim.firstAnsweredAt) {
      tx.update(claims).set({ firstAnsweredAt: now, updatedAt: now }).where(and(eq(claims.id, claim.id), isNull(claims.firstAnsweredAt))).run();
    }
    const added = appendMessage(tx, threadFor(tx, { kind: "claim", id: claim.id }, now), { author: asStaff ? "staff" : "owner", authorId: viewer.user.id, body: input.body, now })!;
    const message = { ...added, body: input.body, fromStudio: asStaff };
    recordAudit(tx, {
      studioId: claim.studioId,
      actorId: viewer.user.id,
      action: input.requestInfo ? "claim.info_requested" : "claim.message",
      subjectType: "claim",
      subjectId: claim.id,
      data: { messageId: message.id, fromStudio: asStaff, ...(current.state !== claim.state ? { from: claim.state, to: current.state } : {}) },
    });
    return { message, state: current.state, version: current.version };
  });
  const studio = studioOf(claim.studioId);
  const piece = getDb().select().from(pieces).where(eq(pieces.id, claim.pieceId)).get()!;
  const owner = getDb().select({ id: users.id, name: users.name, email: users.email }).from(users).where(eq(users.id, claim.ownerId)).get()!;
  await mailClaimMessage({ claim, piece, studio, owner, fromStudio: asStaff, authorName: viewer.user.name, body: input.body, requestInfo: !!input.requestInfo });
  return {
    message: { id: result.message.id, body: result.message.body, fromStudio: result.message.fromStudio, createdAt: result.message.createdAt.toISOString(), authorName: viewer.user.name },
    state: result.state,
    version: result.version,
  };
}

// ---------------------------------------------------------------- decisions

/**
 * Staff decide an in-review claim: covered, partly covered (a share), chargeable, or declined with a
 * reason the owner sees. The coverage check's suggestion is recorded beside the decision, in the
 * claim and in the audit log. Concurrent decisions: the conditional UPDATE lets exactly one win.
 */
export async function decideClaim(ctx: StudioContext, claimId: string, raw: unknown) {
  const input = claimDecisionSchema.parse(raw);
  const claim = getDb().select().from(claims).where(and(eq(claims.id, claimId), eq(claims.studioId, ctx.studio.id))).get();
  if (!claim) throw notFound("No claim with that id in this studio.");
  const to = stateForDecision(input.decision);
  if (!canTransition(claim.state, to)) {
    throw conflict(claim.state === "submitted" || claim.state === "awaiting_owner" ? "Start (or resume) the review before deciding." : "This claim has already been decided.");
  }
  const studio = studioOf(claim.studioId);
  const { coverage, piece } = coverageOf(claim, studio);
  const suggestion = suggestionRecord(coverage);
  const coveredPct = input.decision === "covered" ? 100 : input.decision === "partly_covered" ? input.coveredPct! : 0;
  const now = new Date();
  const updated = getDb().transaction((tx) => {
    const row = moveState(tx, claim, to, input.expectedVersion, {
      decision: input.decision,
      coveredPct,
      decisionReason: input.reason || null,
      suggestion,
      decidedAt: now,
      decidedById: ctx.user.id,
      firstAnsweredAt: claim.firstAnsweredAt ?? now,
    });
    recordAudit(tx, {
      studioId: claim.studioId,
      actorId: ctx.user.id,
      action: "claim.decided",
      subjectType: "claim",
      subjectId: claim.id,
      data: { from: claim.state, to, decision: input.decision, coveredPct, reason: input.reason, suggestion },
    });
    return row;
  });
  const owner = getDb().select({ id: users.id, name: users.name, email: users.email }).from(users).where(eq(users.id, claim.ownerId)).get()!;
  await mailClaimDecision({ claim: updated, piece, studio, owner });
  return claimCore(updated);
}

// ---------------------------------------------------------------- owner pages

/** The owner's claims, and their pieces to report damage on. */
export function ownerClaimsOverview(user: Pick<User, "id">) {
  const myPieces = getDb()
    .select({ id: pieces.id, title: pieces.title, studioName: studios.name })
    .from(pieces)
    .innerJoin(studios, eq(studios.id, pieces.studioId))
    .where(and(eq(pieces.ownerId, user.id), isNull(pieces.archivedAt)))
    .orderBy(asc(pieces.title))
    .all();
  return { claims: listOwnerClaims(user), pieces: myPieces };
}

/** What the claim form needs about one of the owner's pieces; someone else's piece is a 404. */
export function claimFormContext(user: Pick<User, "id" | "unitSystem">, pieceId: string) {
  const row = getDb()
    .select({ id: pieces.id, title: pieces.title, deliveredOn: pieces.deliveredOn, studioName: studios.name, timeZone: studios.timeZone })
    .from(pieces)
    .innerJoin(studios, eq(studios.id, pieces.studioId))
    .where(and(eq(pieces.id, pieceId), eq(pieces.ownerId, user.id), isNull(pieces.archivedAt)))
    .get();
  if (!row) throw notFound("No piece of yours with that id.");
  return { piece: row, today: localDate(Date.now(), row.timeZone), unit: user.unitSystem === "imperial" ? ("F" as const) : ("C" as const) };
}
