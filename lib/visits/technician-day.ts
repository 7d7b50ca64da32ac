import "server-only";
import { and, asc, eq, gte, inArray, lt } from "drizzle-orm";
import { getDb } from "@/db/client";
import { claims, clients, pieces, repairJobs, users, visits, type FinishLayer, type FinishProduct, type Piece, type RepairJob } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { cautionsFor } from "@/lib/care/cautions";
import { cureWindow } from "@/lib/care/cure";
import { addDays, localDate, zonedTimeToEpochMs } from "@/lib/care/dates";
import { productNeeded } from "@/lib/care/quantity";
import { M2_PER_FT2 } from "@/lib/care/units";
import { CARE_TASK_LABELS, FINISH_CLASS_LABELS, TASK_KIND_BY_FINISH_CLASS, type FinishClass, type Surface } from "@/lib/care/vocabulary";
import { fileUrl } from "@/lib/claims/claim-row";
import { displayPhone } from "@/lib/clients/phone";
import { notFound } from "@/lib/errors";
import { formatVolume, type UnitSystem } from "@/lib/format";
import { refreshedSurface } from "@/lib/pieces/care-inputs";
import { quoteAreaM2, taskSurfaces, taskUsesProduct } from "@/lib/repairs/pricing";
import { studioProducts } from "@/lib/pieces/registry";
import { visitDay } from "@/lib/validation/dates";
import { isStudioTechnician } from "./availability";
import { formatVisitWhen } from "@/lib/format";
import { claimPhotosByClaim, layersByPiece, photosByVisit } from "./visits-sql";
import { iso, visitJson } from "./visit-row";
import { visitVisibleTo } from "./visible";

// The technician's day: each visit of one technician on one local date with what it needs.

export type BringItem = {
  productId: string;
  product: string;
  finishClass: FinishClass;
  classLabel: string;
  coats: number;
  /** The surface the layer goes on: the one it refreshes (refreshedSurface), null where the technician chooses. */
  surface: Surface | null;
  /** The surface the amount is for: the layer's, or the top where the stack does not say which. */
  amountFor: Surface;
  /** The other surfaces the quote priced this finish's task on beside the top (JobQuoteInput.alsoSurfaces): the amount is for them too. */
  alsoFor: Surface[];
  /** Of `amountFor` and `alsoFor`, those with no size on the record or typed on the quote. */
  unsized: Surface[];
  /** One coat on a round area in the studio's units (1 m², or 10 ft²), to work an amount out on site where `amount` is null. */
  perArea: { areaM2: number; exactMl: number };
  /**
   * What to bring for the area of `amountFor` and `alsoFor` as the quote priced them (lib/repairs/pricing
   * quoteAreaM2: the piece's record's, else the size typed on the quote), summed; null where one has no
   * size (the base, the edges, a top without its sizes, none typed): never the top's figure for another surface.
   */
  amount: {
    areaM2: number;
    /** The engine's exact amount (formatVolume rounds it once, for display); `ml` is that rounding in mL. */
    exactMl: number;
    ml: number;
    /** Containers to open, their sizes in the studio's units ("2 × 3.4 US fl oz (100 mL)"). */
    containers: string;
  } | null;
  /** How long what she applies keeps water and objects off, and until full use (lib/care/cure). */
  cure: { lightUseHours: number; fullCureDays: number };
};

function whatToBring(job: RepairJob, piece: Piece, layers: readonly FinishLayer[], products: FinishProduct[], appliedOn: string, units: UnitSystem): BringItem[] {
  const input = job.quoteInput;
  const coats = Math.max(1, Number(input.coats) || 1);
  const tasks = new Set(input.tasks ?? []);
  const chosen = products.filter((p) => (input.productIds ?? []).includes(p.id));
  // None chosen: one of a quoted task's finish class, where the task uses product (an inspection uses none).
  const list = chosen.length ? chosen : products.filter((p) => tasks.has(TASK_KIND_BY_FINISH_CLASS[p.finishClass]) && taskUsesProduct(TASK_KIND_BY_FINISH_CLASS[p.finishClass])).slice(0, 1);
  return list.map((p) => {
    const surface = refreshedSurface(layers, p.finishClass);
    // The layer's surface, or the top where the stack does not say which, and those priced beside it (lib/repairs/pricing taskSurfaces).
    const [amountFor, ...alsoFor] = taskSurfaces(layers, TASK_KIND_BY_FINISH_CLASS[p.finishClass], input) as [Surface, ...Surface[]];
    const areas = [amountFor, ...alsoFor].map((s) => ({ s, m2: quoteAreaM2(piece, input, s) }));
    const unsized = areas.filter((a) => a.m2 === null).map((a) => a.s);
    const areaM2 = unsized.length ? null : areas.reduce((t, a) => t + a.m2!, 0);
    const need = areaM2 ? productNeeded({ areaM2, coats, coverageM2PerL: p.coverageM2PerL, containerSizesMl: p.containers.map((c) => c.ml) }) : null;
    const unitArea = units === "metric" ? 1 : 10 * M2_PER_FT2;
    const cure = cureWindow({ finishClass: p.finishClass, appliedOn, productId: p.id }, products);
    return {
      productId: p.id,
      product: p.name,
      finishClass: p.finishClass,
      classLabel: FINISH_CLASS_LABELS[p.finishClass],
      coats,
      surface,
      amountFor,
      alsoFor,
      unsized,
      perArea: { areaM2: unitArea, exactMl: productNeeded({ areaM2: unitArea, coats: 1, coverageM2PerL: p.coverageM2PerL }).exactMl },
      amount:
        areaM2 && need
          ? { areaM2, exactMl: need.exactMl, ml: need.ml, containers: need.containers.map((c) => `${c.count} × ${formatVolume(c.sizeMl, units)}`).join(" + ") }
          : null,
      cure: { lightUseHours: cure.lightUseHours, fullCureDays: cure.fullCureDays },
    };
  });
}

const mapsUrl = (address: string) => `https://www.openstreetmap.org/search?${new URLSearchParams({ query: address })}`;

/**
 * The visits of one technician on one local date (default today), in order, with what each needs: the
 * job's notes, the claim it repairs (description, photos), the finish stack, the owner's name and
 * phone (the studio's client record), the address with a map link, what to bring with its cure times,
 * and the cautions. A fixed number of queries for the whole day.
 */
export function technicianDay(ctx: StudioContext, opts: { date?: string; technicianId?: string } = {}, now = Date.now()) {
  const db = getDb();
  const tz = ctx.studio.timeZone;
  const date = visitDay().safeParse(opts.date).data ?? localDate(now, tz);
  const technicianId = ctx.role === "technician" ? ctx.user.id : (opts.technicianId ?? ctx.user.id);
  if (ctx.role !== "technician" && opts.technicianId && !isStudioTechnician(db, ctx.studio.id, opts.technicianId)) throw notFound("No such technician.");
  const from = new Date(zonedTimeToEpochMs(date, 0, tz));
  const to = new Date(zonedTimeToEpochMs(addDays(date, 1), 0, tz));
  const rows = db
    .select({ visit: visits, job: repairJobs, piece: pieces, ownerName: users.name, ownerPhone: clients.phone, claim: { id: claims.id, description: claims.description, category: claims.category, noticedOn: claims.noticedOn } })
    .from(visits)
    .innerJoin(repairJobs, eq(repairJobs.id, visits.jobId))
    .innerJoin(pieces, eq(pieces.id, visits.pieceId))
    .leftJoin(users, eq(users.id, repairJobs.ownerId))
    .leftJoin(clients, and(eq(clients.studioId, visits.studioId), eq(clients.userId, repairJobs.ownerId)))
    .leftJoin(claims, and(eq(claims.id, repairJobs.claimId), eq(claims.studioId, visits.studioId)))
    .where(and(visitVisibleTo(ctx), eq(visits.technicianId, technicianId), inArray(visits.state, ["booked", "done"]), gte(visits.startAt, from), lt(visits.startAt, to)))
    .orderBy(asc(visits.startAt))
    .all();
  const products = studioProducts(ctx.studio.id);
  const layersOf = layersByPiece(db, rows.map((r) => r.piece.id));
  const photosOf = photosByVisit(db, rows.map((r) => r.visit.id));
  const claimPhotosOf = claimPhotosByClaim(db, ctx.studio.id, rows.map((r) => r.claim?.id));
  const items = rows.map(({ visit, job, piece, ownerName, ownerPhone, claim }) => {
    const layers = layersOf.get(piece.id) ?? [];
    const bring = whatToBring(job, piece, layers, products, localDate(visit.startAt.getTime(), tz), ctx.studio.unitSystem);
    const jobTasks = job.quoteInput.tasks ?? [];
    // The cautions for this visit's tasks and the products brought, once each (lib/care/cautions).
    const cautions = cautionsFor({
      tasks: jobTasks,
      applying: bring.map((b) => b.finishClass),
      hasResin: piece.resinKind !== "none" || layers.some((l) => l.finishClass === "epoxy_surface"),
      audience: "technician",
    });
    const photos = (photosOf.get(visit.id) ?? []).map(({ id, kind }) => ({ id, kind }));
    const tasks = jobTasks.map((k) => CARE_TASK_LABELS[k] ?? k);
    return {
      visit: visitJson(visit, { when: formatVisitWhen(visit.startAt.getTime(), visit.endAt.getTime(), tz), mapsUrl: mapsUrl(visit.location), started: visit.startAt.getTime() <= now }),
      job: { id: job.id, title: job.title, tasks, notes: job.notes },
      claim: claim?.id
        ? { id: claim.id, description: claim.description, category: claim.category, noticedOn: claim.noticedOn, photos: (claimPhotosOf.get(claim.id) ?? []).map((f) => ({ id: f.id, url: fileUrl(f.id), thumbUrl: fileUrl(f.id, true) })) }
        : null,
      piece: { id: piece.id, title: piece.title, resinKind: piece.resinKind, primarySpeciesId: piece.primarySpeciesId, deliveredOn: piece.deliveredOn, internalNotes: piece.internalNotes },
      ownerName: ownerName ?? null,
      ownerPhone: ownerPhone ? { tel: ownerPhone, display: displayPhone(ownerPhone, ctx.studio.country) } : null,
      layers: layers.map((l) => ({ id: l.id, surface: l.surface, position: l.position, finishClass: l.finishClass, classLabel: FINISH_CLASS_LABELS[l.finishClass], productLabel: l.productLabel, coats: l.coats, appliedOn: l.appliedOn, notes: l.notes })),
      bring,
      /** The report's proposed layers: the quote's products and coats, on the surface each refreshes where the stack says. */
      defaultLayers: bring.map((b) => ({ surface: b.surface, finishClass: b.finishClass, productId: b.productId, coats: b.coats })),
      /** A layer added by hand starts as the piece's outer coat on the top (else any surface's), the finish a touch-up usually renews. */
      addLayerClass: (layers.filter((l) => l.surface === "top").sort((a, b) => b.position - a.position)[0] ?? [...layers].sort((a, b) => b.position - a.position)[0])?.finishClass ?? null,
      cautions,
      photos,
      report: visit.reportedAt
        ? { work: visit.reportWork ?? "", at: iso(visit.reportedAt), earlyReason: visit.reportEarlyReason, signedOffAt: visit.signedOffAt ? iso(visit.signedOffAt) : null, typedName: visit.reportSignOffName }
        : null,
    };
  });
  return {
    date,
    today: localDate(now, tz),
    timeZone: tz,
    technicianId,
    /** Whose day it is when a studio member opens another's (`?technician=`); null on one's own day. */
    otherTechnicianName: technicianId === ctx.user.id ? null : (db.select({ name: users.name }).from(users).where(eq(users.id, technicianId)).get()?.name ?? null),
    items,
    products: products.map((p) => ({ id: p.id, name: p.name, finishClass: p.finishClass })),
  };
}

