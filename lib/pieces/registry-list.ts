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
  countMatches,
  databaseVersion,
  ensureSqlFunctions,
  LIST_COUNT_CAP,
  loadForRows,
  policyTerms,
  SEARCH_COUNT_CAP,
  selectListRows,
  warrantyEndsOn,
  type Loaded,
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
// before the request read anything), so any change anywhere recomputes it.
const nextCares = new Map<string, { version: string; nextCare: RegistryRow["nextCare"] }>();

function nextCareFor(pieceId: string, timeZone: string, day: string, version: string, schedule: () => CareSchedule | null): RegistryRow["nextCare"] {
  const key = `${pieceId}|${timeZone}|${day}`;
  const hit = nextCares.get(key);
  if (hit && hit.version === version) return hit.nextCare;
  const nextCare = nextCareOf(schedule());
  if (nextCares.size >= 10_000) nextCares.delete(nextCares.keys().next().value!);
  nextCares.set(key, { version, nextCare });
  return nextCare;
}

function safeSchedule(l: Loaded, catalog: CatalogEntry[], timeZone: string, now: Date): CareSchedule | null {
  try {
    return scheduleFromColumns({ piece: l.piece, layers: l.layers, careLog: l.careLog, catalog, timeZone, now });
  } catch {
    return null; // a record the care engine cannot use yet (e.g. a bad imported date) still lists
  }
}

/** What the count of a filter depends on: the studio, the filters and search (not the page or order), the day. */
function filterKey(ctx: StudioContext, q: PieceListQuery, useCode: boolean, t: string): string {
  const { page: _page, pageSize: _pageSize, sort: _sort, dir: _dir, ...filters } = q;
  return JSON.stringify([ctx.studio.id, t, useCode, filters]);
}

/** GET /api/pieces: search, filters, sorting and pagination of the studio's registry. */
export function listPieces(ctx: StudioContext, q: PieceListQuery, now = new Date()): RegistryPage {
  return queryRegistry(ctx, q, now, false);
}

/** The registry query; `all` ignores pagination (CSV export of the current filter). */
export function queryRegistry(ctx: StudioContext, q: PieceListQuery, now: Date, all: boolean): RegistryPage {
  const db = getDb();
  ensureSqlFunctions(db);
  const version = databaseVersion(db); // before any read: see nextCareFor
  const terms = policyTerms(ctx.studio.id);
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
      const n = all || (page.length < q.pageSize && (page.length > 0 || q.page === 1)) ? offset + page.length : countMatches(f, limit + 1, filterKey(ctx, q, useCode, t));
      const capped = !all && n > limit;
      return { f, ids: page.map((r) => r.id), total: capped ? limit : n, capped, loaded: loadForRows(page), schedules: null as Map<string, CareSchedule | null> | null };
    }
    // Next care due is computed by the care engine, so filter and sort on it in memory.
    const rows = selectListRows(f, q, -1, 0);
    const candidates = rows.map((r) => r.id);
    const loaded = loadForRows(rows);
    const schedules = new Map(candidates.map((id) => [id, safeSchedule(loaded.get(id)!, studioCatalog(), ctx.studio.timeZone, now)]));
    let ids = candidates;
    const firstDue = (id: string) => schedules.get(id)?.tasks.find((x) => x.status !== "done")?.dueOn ?? schedules.get(id)?.tasks[0]?.dueOn ?? null;
    if (q.dueBefore) ids = ids.filter((id) => {
      const d = firstDue(id);
      return d !== null && d <= q.dueBefore!;
    });
    if (q.sort === "next_due") {
      const sign = q.dir === "desc" ? -1 : 1;
      ids = [...ids].sort((a, b) => {
        const da = firstDue(a) ?? "9999-12-31";
        const dbb = firstDue(b) ?? "9999-12-31";
        return da < dbb ? -sign : da > dbb ? sign : 0;
      });
    }
    const start = all ? 0 : (q.page - 1) * q.pageSize;
    return { f, ids: all ? ids : ids.slice(start, start + q.pageSize), total: ids.length, capped: false, loaded, schedules };
  };

  let result = run(true);
  let matchedBy: RegistryPage["matchedBy"] = result.f.codeHash ? "code" : result.f.fts ? "text" : null;
  // Something shaped like a code that is not one of ours may still be a word: search the text too.
  if (result.f.codeHash && result.total === 0) {
    result = run(false);
    matchedBy = result.f.fts ? "text" : null;
  }

  const loaded = result.loaded;
  const rows: RegistryRow[] = [];
  for (const id of result.ids) {
    const l = loaded.get(id);
    if (!l) continue;
    const nextCare = result.schedules ? nextCareOf(result.schedules.get(id) ?? null) : nextCareFor(id, ctx.studio.timeZone, t, version, () => safeSchedule(l, studioCatalog(), ctx.studio.timeZone, now));
    const ends = warrantyEndsOn(l.piece, terms);
    rows.push({
      id,
      title: l.piece.title,
      kind: l.piece.kind,
      primarySpecies: speciesName(l.piece.primarySpeciesId)!,
      secondarySpecies: speciesName(l.piece.secondarySpeciesId),
      deliveredOn: l.piece.deliveredOn,
      owner: l.piece.ownerName != null ? { name: l.piece.ownerName, email: l.piece.ownerEmail ?? "" } : null,
      registered: l.piece.ownerId !== null,
      archived: l.piece.archivedAt !== null,
      finishClasses: [...new Set(l.layers.map((x) => x.finishClass))],
      nextCare,
      warrantyEndsOn: ends,
      underWarranty: ends !== null && ends >= t,
    });
  }
  return { rows, total: result.total, totalIsCapped: result.capped, page: q.page, pageSize: q.pageSize, query: q, matchedBy };
}
