// The registry list: search, filters, sorting and pagination of a studio's pieces (GET /api/pieces),
// and the same query unpaginated for the CSV export. The SQL is in registry-sql.ts; the next care
// date of each row comes from the care engine.
import "server-only";
import { getDb } from "@/db/client";
import type { Piece } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import type { CareSchedule, CareTask, CatalogEntry } from "@/lib/care/schedule";
import { getSpecies } from "@/lib/care/species";
import type { FinishClass } from "@/lib/care/vocabulary";
import type { PieceListQuery } from "@/lib/validation/pieces";
import { scheduleFromColumns, toCatalog } from "./care-inputs";
import { studioProducts, today } from "./registry-common";
import {
  buildFilter,
  countBy,
  countMatches,
  databaseVersion,
  ensureSqlFunctions,
  LIST_COUNT_CAP,
  loadCareInputs,
  policyTerms,
  SEARCH_COUNT_CAP,
  selectListRows,
  warrantyEndsOn,
  type CareInputs,
  type ListPieceRow,
} from "./registry-sql";

export type RegistryRow = {
  id: string;
  title: string;
  kind: Piece["kind"];
  primarySpecies: string;
  secondarySpecies: string | null;
  deliveredOn: string;
  owner: { name: string; email: string } | null;
  registered: boolean;
  archived: boolean;
  finishClasses: FinishClass[];
  nextCare: { label: string; dueOn: string; status: CareTask["status"] } | null;
  warrantyEndsOn: string | null;
  underWarranty: boolean;
};

export type RegistryPage = { rows: RegistryRow[]; total: number; /** true: at least `total` matches (SEARCH_COUNT_CAP). */ totalIsCapped: boolean; page: number; pageSize: number; query: PieceListQuery; matchedBy: "code" | "text" | null };

function speciesName(id: string | null): string | null {
  if (!id) return null;
  return getSpecies(id)?.commonName ?? id;
}

function nextCareOf(schedule: CareSchedule | null): RegistryRow["nextCare"] {
  const t = schedule?.tasks.find((x) => x.status !== "done") ?? schedule?.tasks[0];
  return t ? { label: t.label, dueOn: t.dueOn, status: t.status } : null;
}

// A row's next care depends only on the piece's record, the studio's catalog and the day: kept per
// process for the last 10,000 rows shown, each with the database version it was computed at (taken
// before the request read anything), so any change anywhere recomputes it. Only the rows without a
// kept one read the care engine's inputs (loadCareInputs).
const nextCares = new Map<string, { version: string; nextCare: RegistryRow["nextCare"] }>();

function keptNextCare(key: string, version: string): { nextCare: RegistryRow["nextCare"] } | undefined {
  const hit = nextCares.get(key);
  return hit && hit.version === version ? hit : undefined;
}

function keepNextCare(key: string, version: string, nextCare: RegistryRow["nextCare"]): RegistryRow["nextCare"] {
  if (nextCares.size >= 10_000) nextCares.delete(nextCares.keys().next().value!);
  nextCares.set(key, { version, nextCare });
  return nextCare;
}

function safeSchedule(l: CareInputs, catalog: CatalogEntry[], timeZone: string, now: Date): CareSchedule | null {
  try {
    return scheduleFromColumns({ piece: l.piece, layers: l.layers, careLog: l.careLog, catalog, timeZone, now });
  } catch {
    return null; // a record the care engine cannot use yet (e.g. a bad imported date) still lists
  }
}

/** GET /api/pieces: search, filters, sorting and pagination of the studio's registry. */
export function listPieces(ctx: StudioContext, q: PieceListQuery, now = new Date()): RegistryPage {
  return queryRegistry(ctx, q, now, false);
}

/** The registry query; `all` ignores pagination (CSV export of the current filter). */
export function queryRegistry(ctx: StudioContext, q: PieceListQuery, now: Date, all: boolean): RegistryPage {
  const db = getDb();
  ensureSqlFunctions(db);
  const version = databaseVersion(db); // before any read: see keptNextCare
  const terms = policyTerms(ctx.studio.id, version);
  const t = today(ctx, now);
  let catalog: CatalogEntry[] | null = null;
  const studioCatalog = () => (catalog ??= toCatalog(studioProducts(ctx.studio.id)));

  const run = (useCode: boolean) => {
    const f = buildFilter(ctx, q, terms, useCode, t);
    const computed = q.sort === "next_due" || q.dueBefore !== undefined;
    if (!computed) {
      const offset = all ? 0 : (q.page - 1) * q.pageSize;
      const limit = f.fts ? SEARCH_COUNT_CAP : LIST_COUNT_CAP;
      const page = selectListRows(f, q, all ? -1 : q.pageSize, offset);
      // A page that is not full tells the total without counting.
      const n = all || (page.length < q.pageSize && (page.length > 0 || q.page === 1)) ? offset + page.length : countMatches(f, limit + 1, countBy(f, q, page));
      const capped = !all && n > limit;
      return { f, rows: page, total: capped ? limit : n, capped, schedules: null as Map<string, CareSchedule | null> | null };
    }
    // Next care due is computed by the care engine, so filter and sort on it in memory.
    const candidates = selectListRows(f, q, -1, 0);
    const inputs = loadCareInputs(candidates.map((r) => r.id));
    const schedules = new Map(candidates.map((r) => [r.id, safeSchedule(inputs.get(r.id)!, studioCatalog(), ctx.studio.timeZone, now)]));
    let rows = candidates;
    const firstDue = (id: string) => schedules.get(id)?.tasks.find((x) => x.status !== "done")?.dueOn ?? schedules.get(id)?.tasks[0]?.dueOn ?? null;
    if (q.dueBefore) rows = rows.filter((r) => {
      const d = firstDue(r.id);
      return d !== null && d <= q.dueBefore!;
    });
    if (q.sort === "next_due") {
      const sign = q.dir === "desc" ? -1 : 1;
      rows = [...rows].sort((a, b) => {
        const da = firstDue(a.id) ?? "9999-12-31";
        const dbb = firstDue(b.id) ?? "9999-12-31";
        return da < dbb ? -sign : da > dbb ? sign : 0;
      });
    }
    const start = all ? 0 : (q.page - 1) * q.pageSize;
    return { f, rows: all ? rows : rows.slice(start, start + q.pageSize), total: rows.length, capped: false, schedules };
  };

  let result = run(true);
  let matchedBy: RegistryPage["matchedBy"] = result.f.codeHash ? "code" : result.f.fts ? "text" : null;
  // Something shaped like a code that is not one of ours may still be a word: search the text too.
  if (result.f.codeHash && result.total === 0) {
    result = run(false);
    matchedBy = result.f.fts ? "text" : null;
  }

  const tz = ctx.studio.timeZone;
  const nextCare = new Map<string, RegistryRow["nextCare"]>();
  if (result.schedules) for (const r of result.rows) nextCare.set(r.id, nextCareOf(result.schedules.get(r.id) ?? null));
  else {
    const missing: ListPieceRow[] = [];
    for (const r of result.rows) {
      const kept = keptNextCare(`${r.id}|${tz}|${t}`, version);
      if (kept) nextCare.set(r.id, kept.nextCare);
      else missing.push(r);
    }
    const inputs = missing.length ? loadCareInputs(missing.map((r) => r.id)) : null;
    for (const r of missing) {
      const input = inputs!.get(r.id);
      nextCare.set(r.id, keepNextCare(`${r.id}|${tz}|${t}`, version, nextCareOf(input ? safeSchedule(input, studioCatalog(), tz, now) : null)));
    }
  }

  const rows: RegistryRow[] = result.rows.map((r) => {
    const ends = warrantyEndsOn(r, terms);
    return {
      id: r.id,
      title: r.title,
      kind: r.kind,
      primarySpecies: speciesName(r.primarySpeciesId)!,
      secondarySpecies: speciesName(r.secondarySpeciesId),
      deliveredOn: r.deliveredOn,
      owner: r.ownerName != null ? { name: r.ownerName, email: r.ownerEmail ?? "" } : null,
      registered: r.ownerId !== null,
      archived: r.archivedAt !== null,
      finishClasses: r.finishClasses,
      nextCare: nextCare.get(r.id) ?? null,
      warrantyEndsOn: ends,
      underWarranty: ends !== null && ends >= t,
    };
  });
  return { rows, total: result.total, totalIsCapped: result.capped, page: q.page, pageSize: q.pageSize, query: q, matchedBy };
}
