// The nightly upkeep of the database: the merge of the full-text indexes (db/search-indexes.ts), then the
// query planner's statistics refreshed where they went stale (refreshPlannerStatistics, db/client.ts),
// with a summary line for each that did work.
import { getDb, refreshPlannerStatistics } from "@/db/client";
import { mergeSearchIndexes } from "@/db/search-indexes";

export async function searchIndexesJob(signal?: AbortSignal): Promise<string[]> {
  const sqlite = getDb().$client;
  const lines: string[] = [];
  const worked = (await mergeSearchIndexes(sqlite, { signal })).filter((m) => m.steps > 0);
  if (worked.length > 0) lines.push(`search index merge: ${worked.map((m) => `${m.index} in ${m.steps} step${m.steps === 1 ? "" : "s"}, ${Math.round(m.ms)} ms`).join("; ")}`);
  if (signal?.aborted) return lines;
  const started = performance.now();
  const analyzed = refreshPlannerStatistics(sqlite);
  if (analyzed.length > 0) lines.push(`planner statistics: ${analyzed.join(", ")} analyzed in ${Math.round(performance.now() - started)} ms`);
  return lines;
}
