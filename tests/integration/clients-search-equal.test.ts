// The clients list search (lib/clients/list.ts) against a plain reference query written here with LIKE
// and EXISTS only (no full-text index, no count cap, no special read order): for every search text ×
// filter × sort × direction × page, the list returns the same rows in the same order, the same total
// and the same "more than 500" flag. The studio's data is ASCII words separated by spaces, where the
// indexes' rules (inside name, e-mail and phone digits; the start of a title word; case-blind) are
// exactly what the LIKE patterns below say. Also: a write made through another database connection is
// seen by the next search (nothing the list keeps in memory hides it).
import Database from "better-sqlite3";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { claims, pieceHandovers } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { listClients, type ClientPage } from "@/lib/clients/list";
import { clientListQuerySchema } from "@/lib/validation/clients";
import { createPiece, createStudio, createUser, memberContext } from "../support/fixtures";
import { randomUUID } from "node:crypto";

const FIRST = ["Ada", "bram", "Cleo", "dario", "Edda", "Finn", "Gus"];
const LAST = ["Thornwick", "Halloway", "marsh"];
const TITLES = ["Burl oak desk", "Walnut table", "Ash bench", "Burlap chest", "Oak sideboard"];
const FILTERS = [undefined, "account", "invited", "unregistered", "open_claims", "paused"] as const;
const SORTS = ["name", "newest", "updated"] as const;
const DIRS = [undefined, "asc", "desc"] as const;
const ORDER = { name: ["c.name COLLATE NOCASE", "ASC"], newest: ["c.created_at", "DESC"], updated: ["c.updated_at", "DESC"] } as const;
const OPEN = "'submitted', 'in_review', 'awaiting_owner'";

/** The reference: each word inside the name or e-mail, inside the phone's digits (3+), or starting a word of one of their pieces' titles. */
function referenceIds(studioId: string, q: string, filter: (typeof FILTERS)[number], sort: (typeof SORTS)[number], dir: (typeof DIRS)[number], wholePhone?: string): string[] {
  const words = q.split(/\s+/).filter(Boolean);
  const params: unknown[] = [studioId];
  const perWord = words.map((w) => {
    const digits = w.replace(/\D/g, "");
    params.push(`%${w}%`, `%${w}%`, `% ${w}%`);
    const phone = digits.length >= 3 ? (params.push(`%${digits}%`), " OR c.phone LIKE ?") : "";
    return `(c.name LIKE ? OR c.email LIKE ? OR EXISTS (SELECT 1 FROM pieces p WHERE p.client_id = c.id AND p.studio_id = c.studio_id AND ' ' || p.title LIKE ?)${phone})`;
  });
  const whole = wholePhone ? (params.push(wholePhone), " OR c.phone = ?") : "";
  const filters: Record<NonNullable<(typeof FILTERS)[number]>, string> = {
    account: "c.user_id IS NOT NULL",
    invited: `EXISTS (SELECT 1 FROM piece_handovers h JOIN pieces p ON p.id = h.piece_id WHERE h.client_id = c.id AND h.last_sent_at IS NOT NULL AND p.owner_id IS NULL AND p.archived_at IS NULL)`,
    unregistered: "EXISTS (SELECT 1 FROM pieces p WHERE p.client_id = c.id AND p.owner_id IS NULL AND p.archived_at IS NULL)",
    open_claims: `EXISTS (SELECT 1 FROM claims k WHERE k.owner_id = c.user_id AND k.studio_id = c.studio_id AND k.state IN (${OPEN}))`,
    paused: "(EXISTS (SELECT 1 FROM pieces p WHERE p.client_id = c.id AND p.reminders_paused = 1 AND p.archived_at IS NULL) OR EXISTS (SELECT 1 FROM users u WHERE u.id = c.user_id AND u.reminders_enabled = 0))",
  };
  const [column, defaultDir] = ORDER[sort];
  const d = dir ? dir.toUpperCase() : defaultDir;
  const rows = getDb()
    .$client.prepare(
      `SELECT c.id FROM clients c WHERE c.studio_id = ? AND ((${perWord.join(" AND ")})${whole})${filter ? ` AND ${filters[filter]}` : ""} ORDER BY ${column} ${d}, c.id ${d}`,
    )
    .all(...params) as { id: string }[];
  return rows.map((r) => r.id);
}

function expectSameAsReference(ctx: StudioContext, q: string, pages: number[], wholePhone?: string) {
  for (const filter of FILTERS)
    for (const sort of SORTS)
      for (const dir of DIRS) {
        const all = referenceIds(ctx.studio.id, q, filter, sort, dir, wholePhone);
        for (const page of pages) {
          const got: ClientPage = listClients(ctx, clientListQuerySchema.parse({ q, filter, sort, dir, page: String(page) }));
          const label = `q=${q} filter=${filter} sort=${sort} dir=${dir} page=${page}`;
          expect(got.rows.map((r) => r.id), label).toEqual(all.slice((page - 1) * 50, page * 50));
          expect({ total: got.total, totalIsCapped: got.totalIsCapped }, label).toEqual({ total: Math.min(all.length, 500), totalIsCapped: all.length > 500 });
          expect(
            got.rows.map((r) => [r.id, r.pieces, r.unregistered, r.openClaims]),
            label,
          ).toEqual(got.rows.map((r) => [r.id, ...referenceCounts(r.id)]));
        }
      }
}

/** A listed client's counts as the list defines them: pieces not archived, of those the ones nobody registered, open claims of their account in the studio. */
function referenceCounts(clientId: string): [number, number, number] {
  const row = getDb()
    .$client.prepare(
      `SELECT (SELECT count(*) FROM pieces p WHERE p.client_id = c.id AND p.archived_at IS NULL) AS pieces,
        (SELECT count(*) FROM pieces p WHERE p.client_id = c.id AND p.archived_at IS NULL AND p.owner_id IS NULL) AS unregistered,
        (SELECT count(*) FROM claims k WHERE c.user_id IS NOT NULL AND k.owner_id = c.user_id AND k.studio_id = c.studio_id AND k.state IN (${OPEN})) AS openClaims
      FROM clients c WHERE c.id = ?`,
    )
    .get(clientId) as { pieces: number; unregistered: number; openClaims: number };
  return [row.pieces, row.unregistered, row.openClaims];
}

describe("clients list search equals a plain reference query", () => {
  it("for search texts × filters × sorts × directions × pages, including past the 500 cap", async () => {
    const studio = createStudio({ timeZone: "America/Los_Angeles", country: "US", currency: "USD" });
    const admin = await memberContext(studio, "admin");
    const raw = getDb().$client;
    const insert = raw.prepare("INSERT INTO clients (id, studio_id, name, email, phone, user_id, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)");
    const owner = await createUser();
    const quiet = await createUser({ remindersEnabled: false });
    const base = Date.UTC(2026, 0, 1);
    let n = 0;
    for (const last of LAST)
      for (const first of FIRST) {
        n++;
        const id = randomUUID();
        const userId = n === 3 ? owner.id : n === 8 ? quiet.id : null;
        // Some share a creation time (the id breaks the tie), changes come in another order than creation.
        insert.run(id, studio.id, `${first} ${last} (invented)`, n % 4 === 0 ? null : `${first.toLowerCase()}.${n}@example.test`, n % 3 === 0 ? null : `+1503555${String(100 + n).padStart(4, "0")}`, userId, base + Math.floor(n / 3) * 1000, base + ((n * 7) % 11) * 1000);
        for (let k = 0; k < n % 3; k++) {
          const { piece } = createPiece(studio, {
            clientId: id,
            title: `${TITLES[(n + k) % TITLES.length]} (invented)`,
            ownerId: n % 5 === 0 ? owner.id : null,
            archivedAt: n % 7 === 0 && k === 0 ? new Date(base) : null,
            remindersPaused: n % 6 === 1,
          });
          if (n % 4 === 1) getDb().insert(pieceHandovers).values({ studioId: studio.id, pieceId: piece.id, clientId: id, lastSentAt: new Date(base) }).run();
          if (userId === owner.id) {
            getDb()
              .insert(claims)
              .values({ studioId: studio.id, pieceId: piece.id, ownerId: owner.id, category: "finish_wear", noticedOn: "2026-10-01", description: "Rings (invented test claim).", answers: {}, state: "submitted" })
              .run();
          }
        }
      }
    // Another studio with the same words: never listed.
    const other = createStudio({ country: "US" });
    insert.run(randomUUID(), other.id, "Ada Thornwick (invented)", "ada.x@example.test", "+15035550101", null, base, base);

    for (const q of ["thornwick", "ADA", "ad", "d", "burl", "burl ada", "walnut MARSH", "oak", "555", "0105", "5550110", "example", "invented", "a", "nothing", "bur lap"]) expectSameAsReference(admin, q, [1, 2]);
    // A whole number as typed: each of its words, or the number itself (its E.164).
    expectSameAsReference(admin, "503 555 0110", [1], "+15035550110");

    // Past the cap: 520 more clients with one word in common; pages in each order, the flag, the total.
    const many = raw.transaction(() => {
      for (let i = 0; i < 520; i++) insert.run(randomUUID(), studio.id, `Quillon ${String((i * 37) % 520).padStart(3, "0")} (invented)`, null, null, null, base + (i % 13) * 1000, base + (i % 17) * 1000);
    });
    many();
    expectSameAsReference(admin, "quillon", [1, 2, 10, 11, 12]);
    expectSameAsReference(admin, "invented", [1, 11]);
  }, 120_000);

  it("a title word of more than 500 clients: counted from its title matches alone only when those pass the cap in the studio, with the filter and every word", async () => {
    // lib/clients/list.ts counts a search's title matches alone first (titlesPassCap) and, when more than
    // 500 of the studio's clients pass the filter that way, says "more than 500" without merging the other
    // indexes' matches. Here exactly 500 of the studio's clients have a "Gimlet" title, another studio has
    // more, a few have accounts, some pieces are registered, paused or archived, and a second word is rare.
    const studio = createStudio({ timeZone: "America/Los_Angeles", country: "US", currency: "USD" });
    const admin = await memberContext(studio, "admin");
    const raw = getDb().$client;
    const owner = await createUser();
    const other = createStudio({ country: "US" });
    const templates = new Map([studio, other].map((s) => [s.id, createPiece(s, { title: "Template (invented)" }).piece.id]));
    const columns = (raw.pragma("table_info(pieces)") as { name: string }[]).map((c) => c.name);
    const fresh: Record<string, string> = { id: "@id", title: "@title", client_id: "@clientId", owner_id: "@ownerId", reminders_paused: "@paused", archived_at: "@archivedAt", registration_code_hash: "lower(hex(randomblob(16)))" };
    const copy = raw.prepare(`INSERT INTO pieces (${columns.join(", ")}) SELECT ${columns.map((c) => fresh[c] ?? c).join(", ")} FROM pieces WHERE id = @template`);
    const copyPiece = (studioId: string, clientId: string, title: string, ownerId: string | null, paused: number, archivedAt: number | null) =>
      copy.run({ id: randomUUID(), title, clientId, ownerId, paused, archivedAt, template: templates.get(studioId) });
    const insert = raw.prepare("INSERT INTO clients (id, studio_id, name, email, phone, user_id, created_at, updated_at) VALUES (?, ?, ?, NULL, NULL, ?, ?, ?)");
    const accounts = [owner, await createUser(), await createUser({ remindersEnabled: false })];
    const base = Date.UTC(2026, 0, 1);
    const addGimlet = (studioId: string, i: number) => {
      const id = randomUUID();
      const account = studioId === studio.id && i % 150 === 7 && i < 450 ? accounts[Math.floor(i / 150)]!.id : null;
      insert.run(id, studioId, `Patron ${String((i * 37) % 503).padStart(3, "0")} (invented)`, account, base + (i % 13) * 1000, base + (i % 17) * 1000);
      const title = i % 50 === 3 ? "Gimlet zebrawood stool (invented)" : "Gimlet oak stool (invented)";
      copyPiece(studioId, id, title, i % 7 === 0 ? owner.id : null, i % 11 === 0 ? 1 : 0, i % 13 === 5 ? base : null);
      if (i % 4 === 0) copyPiece(studioId, id, "Ash bench (invented)", null, 0, null);
      return id;
    };
    raw.transaction(() => {
      for (let i = 0; i < 500; i++) addGimlet(studio.id, i);
      for (let i = 0; i < 8; i++) addGimlet(other.id, i);
    })();
    const first = raw.prepare("SELECT id FROM clients WHERE studio_id = ? AND user_id = ?").pluck().get(studio.id, owner.id) as string;
    getDb()
      .insert(claims)
      .values({ studioId: studio.id, pieceId: raw.prepare("SELECT id FROM pieces WHERE client_id = ?").pluck().get(first) as string, ownerId: owner.id, category: "finish_wear", noticedOn: "2026-10-01", description: "Rings (invented test claim).", answers: {}, state: "submitted" })
      .run();

    // 500 in the studio (the other studio's 8 not counted): exact, not capped; the rare word with it, few.
    for (const q of ["gimlet", "zebrawood gimlet"]) expectSameAsReference(admin, q, [1, 2]);
    // One more: past the cap by the title matches alone, the filters (a few with an account, some paused) under it.
    raw.transaction(() => addGimlet(studio.id, 500))();
    for (const q of ["gimlet", "GIMLET oak", "gimlet zebrawood", "gimlet patron"]) expectSameAsReference(admin, q, [1, 2, 4, 11]);
  }, 120_000);

  it("a client written through another connection is found by the next search, and its old words no longer find it", async () => {
    const studio = createStudio({ country: "US" });
    const admin = await memberContext(studio, "admin");
    const found = (q: string) => listClients(admin, clientListQuerySchema.parse({ q }));
    expect(found("Ravelstone").total).toBe(0); // asked once before the write
    const other = new Database(getDb().$client.name);
    try {
      const id = randomUUID();
      other.prepare("INSERT INTO clients (id, studio_id, name, phone, created_at, updated_at) VALUES (?, ?, 'Ida Ravelstone (invented)', '+15035550177', 1, 1)").run(id, studio.id);
      expect(found("Ravelstone").rows.map((r) => r.id)).toEqual([id]);
      expect(found("5550177").rows.map((r) => r.id)).toEqual([id]);
      other.prepare("UPDATE clients SET name = 'Ida Penhallow (invented)' WHERE id = ?").run(id);
      expect(found("Ravelstone").total).toBe(0);
      expect(found("Penhallow").rows.map((r) => r.id)).toEqual([id]);
      const { piece } = createPiece(studio, { clientId: id, title: "Cherry lowboy (invented)" });
      expect(found("lowboy").rows.map((r) => r.id)).toEqual([id]);
      other.prepare("UPDATE pieces SET title = 'Cherry highboy (invented)' WHERE id = ?").run(piece.id);
      expect(found("lowboy").total).toBe(0);
      expect(found("highboy").rows.map((r) => r.id)).toEqual([id]);
      // The filters read the rows too: the piece registered elsewhere leaves "not registered".
      const unregistered = () => listClients(admin, clientListQuerySchema.parse({ q: "Penhallow", filter: "unregistered" })).total;
      expect(unregistered()).toBe(1);
      const buyer = await createUser();
      other.prepare("UPDATE pieces SET owner_id = ? WHERE id = ?").run(buyer.id, piece.id);
      expect(unregistered()).toBe(0);
      other.prepare("DELETE FROM clients WHERE id = ?").run(id);
      expect(found("Penhallow").total).toBe(0);
    } finally {
      other.close();
    }
  });
});
