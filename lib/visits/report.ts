import "server-only";
import { and, eq, sql } from "drizzle-orm";
import { getDb } from "@/db/client";
import { careLogEntries, finishLayers, pieces, repairJobs, users, visitPhotos, visits } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioContext } from "@/lib/auth/guards";
import { cautionLine, cautionsFor } from "@/lib/care/cautions";
import { curingLayers } from "@/lib/care/cure";
import { localDate } from "@/lib/care/dates";
import { FINISH_CLASS_LABELS, TASK_KIND_BY_FINISH_CLASS } from "@/lib/care/vocabulary";
import { followJob } from "@/lib/claims/follow-job";
import { randomToken, sha256Hex } from "@/lib/crypto";
import { badRequest, conflict, unprocessable } from "@/lib/errors";
import { mailAfterCommit } from "@/lib/mail/after-commit";
import { cureAdvice } from "@/lib/owner/care-guide";
import { formatDate } from "@/lib/format";
import { scheduleFromRows } from "@/lib/pieces/care-inputs";
import { insertLayers } from "@/lib/pieces/layers";
import { checkLayerRefs, studioProducts } from "@/lib/pieces/registry";
import { indexPiece } from "@/lib/pieces/search-index";
import { moveJob } from "@/lib/repairs/jobs";
import type { VisitReportValues } from "@/lib/validation/visits";
import { formatVisitWhen } from "@/lib/format";
import { jobUrl, sendVisitSummary } from "./mail";
import { SIGN_OFF_TTL_MS, signOffUrl } from "./sign-off";
import { visitForActor, visitJson } from "./visit-row";

/**
 * POST /api/visits/[id]/report: what was done, the new finish layers (appended to the piece's stack,
 * which restarts their classes' care clocks through careSchedule), the care done (care log, source
 * "visit"), the owner's sign-off; the job becomes done and the owner gets a summary.
 */
export async function submitReport(ctx: StudioContext, visitId: string, input: VisitReportValues, now = new Date()) {
  const { visit, studio } = visitForActor(ctx, visitId);
  if (visit.state === "done") throw conflict("This visit's report is already filed.");
  if (visit.state === "cancelled") throw conflict("This visit was cancelled.");
  const early = now.getTime() < visit.startAt.getTime();
  if (early) {
    const starts = formatVisitWhen(visit.startAt.getTime(), visit.endAt.getTime(), studio.timeZone);
    if (ctx.role === "technician") throw conflict(`This visit starts ${starts}. File the report once it has started; the studio office can file it early with a reason.`);
    if (!input.earlyReason) {
      const msg = "The visit hasn't started yet. Say why the report is filed early; the reason goes in the audit log.";
      throw unprocessable("report_before_visit", msg, { earlyReason: [msg] });
    }
  }
  const today = localDate(now.getTime(), studio.timeZone);
  const db = getDb();
  const piece = db.select().from(pieces).where(eq(pieces.id, visit.pieceId)).get()!;
  const fieldErrors: Record<string, string[]> = {};
  input.layers.forEach((l, i) => {
    if (l.appliedOn > today) fieldErrors[`layers.${i}.appliedOn`] = ["A layer can't be dated after today."];
    else if (l.appliedOn < piece.deliveredOn) fieldErrors[`layers.${i}.appliedOn`] = ["That is before the piece was delivered."];
  });
  if (Object.keys(fieldErrors).length) throw badRequest("Check the layer dates.", fieldErrors);

  const signOffToken = randomToken();
  const result = db.transaction(
    (tx) => {
      const fresh = tx.select().from(visits).where(eq(visits.id, visit.id)).get()!;
      if (fresh.state !== "booked" || fresh.version !== visit.version) throw conflict("The visit changed while you were working on it. Reload and try again.");
      input.layers.forEach((l, i) => checkLayerRefs(ctx, tx, l, `layers.${i}.`));
      const added = insertLayers(
        ctx,
        tx,
        piece.id,
        input.layers.map((l) => ({ ...l, productId: l.productId || null, appliedById: ctx.user.id, notes: `Visit ${localDate(visit.startAt.getTime(), studio.timeZone)}` })),
      );
      // The care done: one entry per task a new layer restarts, plus the job's other tasks (inspections, checks).
      const job = tx.select().from(repairJobs).where(eq(repairJobs.id, visit.jobId)).get()!;
      const logged = new Set<string>();
      for (const l of added) {
        const kind = TASK_KIND_BY_FINISH_CLASS[l.finishClass];
        const key = `${kind}:${l.surface}`;
        if (logged.has(key)) continue;
        logged.add(key);
        tx.insert(careLogEntries).values({ studioId: studio.id, pieceId: piece.id, userId: ctx.user.id, source: "visit", taskKind: kind, surface: l.surface, doneOn: l.appliedOn, productUsed: l.productLabel, notes: input.work.slice(0, 1000) }).run();
      }
      const jobTasks = (job.quoteInput.tasks ?? []).filter((k) => ![...logged].some((x) => x.startsWith(`${k}:`)));
      for (const kind of new Set(jobTasks)) {
        tx.insert(careLogEntries).values({ studioId: studio.id, pieceId: piece.id, userId: ctx.user.id, source: "visit", taskKind: kind, surface: null, doneOn: today, notes: input.work.slice(0, 1000) }).run();
      }
      const done = tx
        .update(visits)
        .set({
          state: "done",
          reportWork: input.work,
          reportLayerIds: added.map((l) => l.id),
          reportedAt: now,
          reportedById: ctx.user.id,
          reportEarlyReason: early ? input.earlyReason : null,
          ...(job.ownerId ? { signOffTokenHash: sha256Hex(signOffToken), signOffExpiresAt: new Date(now.getTime() + SIGN_OFF_TTL_MS) } : {}),
          version: sql`${visits.version} + 1`,
          updatedAt: now,
        })
        .where(and(eq(visits.id, visit.id), eq(visits.version, visit.version)))
        .returning()
        .get();
      if (!done) throw conflict("The visit changed while you were working on it. Reload and try again.");
      if (job.state === "scheduled") moveJob(tx, job, "done", { doneAt: now });
      followJob(tx, job.id, "job_done", ctx.user.id);
      tx.update(pieces).set({ updatedAt: now }).where(eq(pieces.id, piece.id)).run();
      indexPiece(tx, piece.id);
      recordAudit(tx, {
        studioId: studio.id,
        actorId: ctx.user.id,
        action: "visit.reported",
        subjectType: "visit",
        subjectId: visit.id,
        data: { layerIds: added.map((l) => l.id), ...(early ? { beforeStart: true, start: visit.startAt.toISOString(), reason: input.earlyReason } : {}) },
      });
      return { visit: done, added, job };
    },
    { behavior: "immediate" },
  );

  const layers = db.select().from(finishLayers).where(eq(finishLayers.pieceId, piece.id)).all();
  const careLog = db.select().from(careLogEntries).where(eq(careLogEntries.pieceId, piece.id)).all();
  const schedule = scheduleFromRows({ piece, layers, careLog, products: studioProducts(studio.id), timeZone: studio.timeZone, now });
  const owner = result.job.ownerId ? db.select().from(users).where(eq(users.id, result.job.ownerId)).get() : undefined;
  const technician = db.select({ name: users.name }).from(users).where(eq(users.id, visit.technicianId)).get();
  const photoCount = db.select({ n: sql<number>`count(*)` }).from(visitPhotos).where(eq(visitPhotos.visitId, visit.id)).get()?.n ?? 0;
  if (owner) {
    const hasResin = piece.resinKind !== "none" || layers.some((l) => l.finishClass === "epoxy_surface");
    const products = studioProducts(studio.id);
    const SURFACE_WORDS = { top: "top", base: "base", edges: "edges", whole_piece: "whole piece" } as const;
    await mailAfterCommit("visit summary", () =>
      sendVisitSummary({ studioId: studio.id, visitId: visit.id }, owner.email, {
        ownerName: owner.name,
        studioName: studio.name,
        pieceTitle: piece.title,
        jobTitle: result.job.title,
        when: formatVisitWhen(visit.startAt.getTime(), visit.endAt.getTime(), studio.timeZone),
        technicianName: technician?.name ?? "Your technician",
        work: input.work,
        layers: result.added.map((l) => `${l.surface[0]!.toUpperCase()}${l.surface.slice(1)}: ${FINISH_CLASS_LABELS[l.finishClass]}${l.productLabel ? ` — ${l.productLabel}` : ""}, ${l.coats} coat${l.coats === 1 ? "" : "s"}, ${formatDate(l.appliedOn)}`),
        signOffUrl: signOffUrl(signOffToken),
        photoCount,
        nextCare: schedule.tasks.slice(0, 3).map((t) => ({ label: `${t.label} (${SURFACE_WORDS[t.surface]})`, dueOn: formatDate(t.dueOn) })),
        curing: cureAdvice(curingLayers(result.added, products, schedule.today), schedule.today),
        cautions: cautionsFor({ hasResin, audience: "owner" }).map(cautionLine),
        url: new URL(`/pieces/${piece.id}`, jobUrl(result.job.id)).href,
      }),
    );
  }
  return { visit: visitJson(result.visit), layers: result.added, schedule };
}

