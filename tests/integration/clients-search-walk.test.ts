// The clients list past the search's count cap in name order (lib/clients/list.ts): its first pages test a
// title word of ASCII letters and digits on each client's titles text instead of through the title index
// (titleOnRow), and must list exactly what the index finds. The reference here is the brute-force
// definition: every client of the studio whose name, e-mail or phone the trigram index matches or whose
// titles the title index matches (client_titles_fts, the same MATCH text the list builds), sorted in full.
// The titles put the word after every ASCII character that is not a letter or a digit (the index splits
// words there), inside words, after a digit, in other cases, with accented letters the index folds
// ('Ḃurl' is the word 'burl'), and first inside a word then at a word's start.
import { randomUUID } from "node:crypto";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import type { StudioContext } from "@/lib/auth/guards";
import { listClients } from "@/lib/clients/list";
import { SEARCH_COUNT_CAP } from "@/lib/pieces/registry-sql";
import { ftsQuery } from "@/lib/pieces/search-index";
import { clientListQuerySchema } from "@/lib/validation/clients";
import { createPiece, createStudio, memberContext } from "../support/fixtures";

const ASCII_SEPARATORS = Array.from({ length: 95 }, (_, i) => String.fromCharCode(32 + i)).filter((ch) => !/[A-Za-z0-9]/.test(ch));
const TITLES = [
  "Burl oak desk",
  "Oak burl table",
  "BURL",
  "burlap chest",
  "Reburled chest",
  "Reburled chest with a burl lid",
  "Reburled oak-burl lid",
  "Unburled ash stool",
  "9burl shelf",
  "burl9 shelf",
  "Ḃurl walnut bowl",
  "Café burl stool",
  "Café reburl stool",
  "Bürl tray",
  "Oak\tburl box",
  "Maple bench",
  ...ASCII_SEPARATORS.map((ch) => `Oak${ch}burl stand`),
];
const FIRST = ["Bram", "cleo", "Dario", "edda", "Finn", "gus", "Hale"];

/** The reference ids: each word by the trigram index (name, e-mail, phone) or the title index, all of the studio's matches sorted. */
function referenceIds(studioId: string, q: string, dir: "ASC" | "DESC"): string[] {
  const words = q.split(/\s+/).filter(Boolean);
  const params: unknown[] = [studioId];
  const perWord = words.map((w) => {
    params.push(`"${w.replace(/"/g, '""')}"`, `titles : ${ftsQuery(w)}`);
    return "(c.rowid IN (SELECT rowid FROM clients_fts WHERE clients_fts MATCH ?) OR c.rowid IN (SELECT rowid FROM client_titles_fts WHERE client_titles_fts MATCH ?))";
  });
  const rows = getDb()
    .$client.prepare(`SELECT c.id FROM clients c WHERE c.studio_id = ? AND ${perWord.join(" AND ")} ORDER BY c.name COLLATE NOCASE ${dir}, c.id ${dir}`)
    .all(...params) as { id: string }[];
  return rows.map((r) => r.id);
}

function expectSameAsReference(ctx: StudioContext, q: string, pages: number[]) {
  for (const dir of ["asc", "desc"] as const) {
    const all = referenceIds(ctx.studio.id, q, dir === "asc" ? "ASC" : "DESC");
    for (const page of pages) {
      const got = listClients(ctx, clientListQuerySchema.parse({ q, dir, page: String(page) }));
      const label = `q=${q} dir=${dir} page=${page} (${all.length} matches)`;
      expect(got.rows.map((r) => r.id), label).toEqual(all.slice((page - 1) * 50, page * 50));
      expect({ total: got.total, totalIsCapped: got.totalIsCapped }, label).toEqual({ total: Math.min(all.length, SEARCH_COUNT_CAP), totalIsCapped: all.length > SEARCH_COUNT_CAP });
    }
  }
}

describe("clients list past the count cap, title words tested on each row", () => {
  it("lists what the title index finds, page by page in both directions, whether the word is common early in the order or not", async () => {
    const studio = createStudio({ timeZone: "America/Los_Angeles", country: "US", currency: "USD" });
    const admin = await memberContext(studio, "admin");
    const raw = getDb().$client;
    const { piece: template } = createPiece(studio, { title: "Template (invented)" });
    const columns = (raw.pragma("table_info(pieces)") as { name: string }[]).map((c) => c.name);
    const fresh: Record<string, string> = { id: "?", title: "?", client_id: "?", registration_code_hash: "lower(hex(randomblob(16)))" };
    const copyPiece = raw.prepare(`INSERT INTO pieces (${columns.join(", ")}) SELECT ${columns.map((c) => fresh[c] ?? c).join(", ")} FROM pieces WHERE id = ?`);
    const insertClient = raw.prepare("INSERT INTO clients (id, studio_id, name, email, phone, created_at, updated_at) VALUES (?, ?, ?, NULL, NULL, 1, 1)");
    raw.transaction(() => {
      // 400 clients first in name order ("Abel …") whose titles never say "zelkova"; 700 after them whose titles all do.
      // Every client's titles cycle through TITLES (about two in three say "burl" as a word's start); every ninth has no piece.
      for (let i = 0; i < 1100; i++) {
        const id = randomUUID();
        const first = i < 400 ? "Abel" : FIRST[i % FIRST.length]!;
        insertClient.run(id, studio.id, `${first} ${String((i * 37) % 1100).padStart(4, "0")} (invented)`);
        if (i % 9 === 4) continue;
        const title = TITLES[i % TITLES.length]!;
        copyPiece.run(randomUUID(), i < 400 ? `${title} (invented)` : `Zelkova ${title} (invented)`, id, template.id);
        if (i % 5 === 0) copyPiece.run(randomUUID(), `Second ${TITLES[(i * 7) % TITLES.length]} (invented)`, id, template.id);
      }
    })();
    // Another studio's client with the same words is never listed.
    const other = createStudio({ country: "US" });
    const otherClient = randomUUID();
    insertClient.run(otherClient, other.id, "Abel 0000 (invented)");
    createPiece(other, { clientId: otherClient, title: "Burl zelkova desk (invented)" });

    expect(referenceIds(studio.id, "burl", "ASC").length).toBeGreaterThan(SEARCH_COUNT_CAP);
    // Pages 1 to 3 are read on rows, 4 and 11 through the index's sets; "zelkova" (none among the first
    // 400 in name order) falls back to the sets in ascending order and is read on rows in descending.
    for (const q of ["burl", "BURL", "bur", "zelkova", "zelkova burl", "burl invented", "invented"]) expectSameAsReference(admin, q, [1, 2, 3, 4, 11]);
    // Words the index sees as more than one word, or with letters other than ASCII: through the sets only.
    for (const q of ["oak-burl", "ḃurl", "café"]) expectSameAsReference(admin, q, [1, 3]);
  }, 120_000);
});
