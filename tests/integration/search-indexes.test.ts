// The full-text indexes' nightly merge (db/search-indexes.ts) on a database of its own: after many
// small writes each index holds several segments; the merge leaves one per index, in steps, and every
// search answers exactly as before; a second run has nothing to do.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { openDatabase } from "@/db/client";
import { applyMigrations } from "@/db/migrate";
import { clients, pieces, studios } from "@/db/schema";
import { mergeSearchIndexes, searchIndexes } from "@/db/search-indexes";

const dir = fs.mkdtempSync(path.join(os.tmpdir(), "gw-search-indexes-"));
const db = openDatabase(path.join(dir, "test.db"));
applyMigrations(db);
afterAll(() => {
  db.$client.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

/** Segments in an FTS5 index, from its structure record (row 10 of <index>_data: a 4-byte cookie, then varints: levels, segments; fts5_index.c). */
function segments(index: string): number {
  const block = db.$client.prepare(`SELECT block FROM "${index}_data" WHERE id = 10`).pluck().get() as Buffer;
  let at = 4;
  const varint = () => {
    let v = 0;
    for (let i = 0; i < 9; i++) {
      const b = block[at++]!;
      if (i === 8) return v * 256 + b;
      v = v * 128 + (b & 0x7f);
      if (!(b & 0x80)) return v;
    }
    return v;
  };
  varint(); // levels
  return varint();
}

describe("mergeSearchIndexes", () => {
  it("leaves one segment per index and the same search results", async () => {
    const studio = db.insert(studios).values({ slug: "merge-test", name: "Merge Test Studio (invented)", timeZone: "Europe/Berlin" }).returning().get();
    // One write per statement: each commit adds a segment to every index it touches.
    for (let i = 0; i < 40; i++) {
      const client = db.insert(clients).values({ studioId: studio.id, name: `Client ${i} Thornwick`, email: `c${i}@owners.example`, phone: `+1555000${String(i).padStart(4, "0")}` }).returning().get();
      db.insert(pieces).values({ studioId: studio.id, clientId: client.id, title: `Walnut table ${i}`, kind: "dining_table", shapeKind: "rectangle", lengthMm: 2000, widthMm: 900, primarySpeciesId: "black_walnut", use: "heavy", deliveredOn: "2026-01-15", registrationCodeHash: `hash-${i}`, registrationCodeEnc: `enc-${i}` }).run();
    }
    const indexes = searchIndexes(db.$client);
    expect(indexes).toEqual(expect.arrayContaining(["clients_fts", "client_titles_fts", "pieces_fts"]));
    const searches: [string, string][] = [
      ["clients_fts", "Thornwick"],
      ["clients_fts", '"0017"'],
      ["client_titles_fts", "walnut*"],
    ];
    const answer = () => searches.map(([index, q]) => db.$client.prepare(`SELECT rowid FROM "${index}" WHERE "${index}" MATCH ? ORDER BY rowid`).pluck().all(q));
    const before = answer();
    expect(before.map((rows) => rows.length)).toEqual([40, 1, 40]);
    for (const index of ["clients_fts", "client_titles_fts"]) expect(segments(index)).toBeGreaterThan(1);

    const merged = await mergeSearchIndexes(db.$client);
    expect(merged.map((m) => m.index)).toEqual(indexes);
    for (const index of indexes) expect(segments(index), index).toBeLessThanOrEqual(1);
    for (const m of merged.filter((x) => ["clients_fts", "client_titles_fts"].includes(x.index))) expect(m.steps, m.index).toBeGreaterThan(0);
    expect(answer()).toEqual(before);
    for (const index of indexes) db.$client.prepare(`INSERT INTO "${index}" ("${index}") VALUES ('integrity-check')`).run();

    // Nothing left to merge: no step does any work.
    expect((await mergeSearchIndexes(db.$client)).map((m) => m.steps)).toEqual(indexes.map(() => 0));
  });

  it("stops between indexes once aborted", async () => {
    const stop = new AbortController();
    stop.abort();
    expect(await mergeSearchIndexes(db.$client, { signal: stop.signal })).toEqual([]);
  });
});
