// The nightly merge of the full-text indexes (db/search-indexes.ts), with a summary line when it did work.
import { getDb } from "@/db/client";
import { mergeSearchIndexes } from "@/db/search-indexes";

export async function searchIndexesJob(signal?: AbortSignal): Promise<string[]> {
  const worked = (await mergeSearchIndexes(getDb().$client, { signal })).filter((m) => m.steps > 0);
  if (worked.length === 0) return [];
  return [`search index merge: ${worked.map((m) => `${m.index} in ${m.steps} step${m.steps === 1 ? "" : "s"}, ${Math.round(m.ms)} ms`).join("; ")}`];
}
