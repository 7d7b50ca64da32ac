// The clients list search (lib/clients/list.ts over its in-memory index, lib/clients/list-index.ts): a
// client is found by part of the name, part of the e-mail, phone digits and the start of a piece-title
// word right after it is created, after each change (client record, piece title, piece moved to
// another client, piece deleted) and after erasure, whatever code path or process wrote the row; and
// it finds what the database's full-text indexes (migration 0025) find for the same words.
import Database from "better-sqlite3";
import { eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { databaseFile, getDb } from "@/db/client";
import { pieces } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { createClient } from "@/lib/clients/create";
import { listClients } from "@/lib/clients/list";
import { eraseClient } from "@/lib/clients/personal-data";
import { updateClient } from "@/lib/clients/update";
import { updatePiece } from "@/lib/pieces/registry-update";
import { ftsQuery } from "@/lib/pieces/search-index";
import { clientListQuerySchema, clientPatchSchema, createClientSchema } from "@/lib/validation/clients";
import { createPiece, createStudio, memberContext, unique } from "../support/fixtures";

const NOW = new Date("2026-11-20T18:00:00Z");

async function studioWithAdmin() {
  const studio = createStudio({ timeZone: "America/Los_Angeles", country: "US", currency: "USD" });
  return { studio, admin: await memberContext(studio, "admin") };
}

const found = (ctx: StudioContext, q: string) => listClients(ctx, clientListQuerySchema.parse({ q })).rows.map((r) => r.id);

describe("clients list search, kept in step with every write", () => {
  it("finds a client by partial name, e-mail, phone digits and piece title after create, update and erase", async () => {
    const { studio, admin } = await studioWithAdmin();
    const tag = unique("q").replace(/\W/g, "").slice(-8).toLowerCase();
    const email = `ysolde.${tag}@harrowgate.example`;
    const c = createClient(admin, createClientSchema.parse({ name: `Ysolde Brackenfield ${tag} (invented)`, email, phone: "(503) 555-0191" }), NOW);
    const { piece } = createPiece(studio, { clientId: c.id, title: `Quartersawn ${tag} hallstand (invented)` });
    // A client of another studio with the same words is never listed.
    const other = await studioWithAdmin();
    createClient(other.admin, createClientSchema.parse({ name: `Ysolde Brackenfield ${tag} (invented)`, phone: "(503) 555-0191" }), NOW);

    // After create: inside the name (case-blind), inside the e-mail, phone digits as typed, a title word's start.
    for (const q of ["brackENF", `ackenfield ${tag}`, `ysolde.${tag}@harrow`, "gate.exam", "555-0191", "5035550191", "(503) 555 0191", `quarters ${tag}`, "hallst"]) {
      expect(found(admin, q), q).toEqual([c.id]);
    }
    // The middle of a title word is not a match (titles match by a word's start, as the registry does).
    expect(found(admin, `uartersawn ${tag}`)).toEqual([]);
    // Words under three characters are matched too (by LIKE), and LIKE's wildcards are taken literally.
    expect(found(admin, `Ys ${tag}`)).toEqual([c.id]);
    expect(found(admin, `% ${tag}`)).toEqual([]);

    // After the client record changes: the new name, e-mail and phone find it; the old ones don't.
    updateClient(admin, c.id, clientPatchSchema.parse({ name: `Ysolde Thistlemoor ${tag} (invented)`, email: `y.${tag}@fernhollow.example`, phone: "(503) 555-0178" }), NOW);
    for (const q of ["thistlem", `fernhollow ${tag}`, "5550178"]) expect(found(admin, q), q).toEqual([c.id]);
    for (const q of [`brackenfield ${tag}`, `harrowgate ${tag}`, `5550191 ${tag}`]) expect(found(admin, q), q).toEqual([]);

    // After the piece's title changes (the registry's update), the new title finds the client, the old one doesn't.
    updatePiece(admin, piece.id, { title: `Riftsawn ${tag} coatrack (invented)` });
    expect(found(admin, `coatrack ${tag}`)).toEqual([c.id]);
    expect(found(admin, `hallstand ${tag}`)).toEqual([]);
    // A second piece, moved to another client and then deleted: its title follows it, then goes.
    const c2 = createClient(admin, createClientSchema.parse({ name: `Second Buyer ${tag} (invented)` }), NOW);
    const { piece: bench } = createPiece(studio, { clientId: c.id, title: `Spalted ${tag} settle (invented)` });
    expect(found(admin, `settle ${tag}`)).toEqual([c.id]);
    getDb().update(pieces).set({ clientId: c2.id }).where(eq(pieces.id, bench.id)).run();
    expect(found(admin, `settle ${tag}`)).toEqual([c2.id]);
    expect(found(admin, `coatrack ${tag}`)).toEqual([c.id]);
    getDb().delete(pieces).where(eq(pieces.id, bench.id)).run();
    expect(found(admin, `settle ${tag}`)).toEqual([]);

    // After erasure: nothing of the person finds the record; their piece stays with the studio's record.
    await eraseClient(admin, c.id, NOW);
    for (const q of ["thistlem", "ysolde", `fernhollow ${tag}`, "5550178"]) expect(found(admin, q), q).not.toContain(c.id);
    expect(found(admin, `coatrack ${tag}`)).toEqual([c.id]);
  });

  it("sees a change another process wrote at the next search (the list's index is rebuilt when the database changed)", async () => {
    const { studio, admin } = await studioWithAdmin();
    const tag = unique("ix").replace(/\W/g, "").slice(-8).toLowerCase();
    const c = createClient(admin, createClientSchema.parse({ name: `Orrin Velloway ${tag} (invented)`, phone: "(503) 555-0142" }), NOW);
    const { piece } = createPiece(studio, { clientId: c.id, title: `Bog oak ${tag} lectern (invented)` });
    const row = () => listClients(admin, clientListQuerySchema.parse({ q: `velloway ${tag}` })).rows[0];
    expect(found(admin, `velloway ${tag}`)).toEqual([c.id]);
    expect(row()).toMatchObject({ pieces: 1, unregistered: 1 });

    // Another connection to the same file (a job, a script, a second server process) renames the client,
    // retitles the piece and archives it: this process's next search reads the change.
    const other = new Database(databaseFile());
    try {
      other.prepare("UPDATE clients SET name = ? WHERE id = ?").run(`Orrin Gallowmere ${tag} (invented)`, c.id);
      other.prepare("UPDATE pieces SET title = ?, archived_at = ? WHERE id = ?").run(`Bog oak ${tag} settle (invented)`, NOW.getTime(), piece.id);
    } finally {
      other.close();
    }
    expect(found(admin, `velloway ${tag}`)).toEqual([]);
    expect(found(admin, `gallowmere ${tag}`)).toEqual([c.id]);
    expect(found(admin, `lectern ${tag}`)).toEqual([]);
    expect(found(admin, `settle ${tag}`)).toEqual([c.id]);
    expect(listClients(admin, clientListQuerySchema.parse({ q: `gallowmere ${tag}` })).rows[0]).toMatchObject({ pieces: 0, unregistered: 0 });
  });

  it("finds what the database's full-text indexes find (migration 0025), for names, e-mails, phones and titles in several scripts", async () => {
    const { studio, admin } = await studioWithAdmin();
    const tag = unique("eq").replace(/\W/g, "").slice(-6).toLowerCase();
    const people = [
      ["Zoë Ærndahl", "zoe.aerndahl@fjordmark.example", "(503) 555-0101", ["Chêne massif buffet", "Oak-leaf side table"]],
      ["Émile O'Brannagh", "emile@brannagh.example", "(503) 555-0102", ["Walnut DESK, burl inlay"]],
      ["Ingrid Sæterbø", "", "+44 20 7946 0103", ["Eiche Truhe mit Schubladen", "Burled maple box"]],
      ["Kaito Ōmura", "k.omura@example.example", "", ["Hinoki bath stool", "ケヤキ chest"]],
      ["ali % under_score", "ALI@CAPS.EXAMPLE", "(503) 555-0199", []],
    ] as const;
    for (const [name, email, phone, titles] of people) {
      const c = createClient(admin, createClientSchema.parse({ name: `${name} ${tag}`, email: email || undefined, phone: phone || undefined }), NOW);
      for (const title of titles) createPiece(studio, { clientId: c.id, title: `${title} ${tag}` });
    }
    // What the indexes find for one word, as the list's search read them before it kept its own index.
    const byIndex = (w: string): string[] => {
      const phrase = (s: string) => `"${s.replace(/"/g, '""')}"`;
      const digits = w.replace(/\D/g, "");
      const short = [...w].length < 3;
      const terms = [short ? null : `{name email} : ${phrase(w)}`, digits.length >= 3 ? `phone : ${phrase(digits)}` : null].filter(Boolean).join(" OR ");
      const title = ftsQuery(w);
      const like = `%${w.replace(/[\\%_]/g, (x) => `\\${x}`)}%`;
      return getDb()
        .all<{ id: string }>(
          sql`SELECT c.id FROM clients c WHERE c.studio_id = ${studio.id} AND (
            ${short ? sql`c.name LIKE ${like} ESCAPE '\\' OR c.email LIKE ${like} ESCAPE '\\'` : sql`0`}
            OR ${terms ? sql`c.rowid IN (SELECT rowid FROM clients_fts WHERE clients_fts MATCH ${terms})` : sql`0`}
            OR ${title ? sql`c.rowid IN (SELECT rowid FROM client_titles_fts WHERE client_titles_fts MATCH ${`titles : ${title}`})` : sql`0`})`,
        )
        .map((r) => r.id)
        .sort();
    };
    const words = ["zoë", "ZOE", "ærn", "æ", "emile", "o'br", "brannagh", "sæter", "ōmura", "omura", "ケヤキ", "ケヤ", "chene", "chêne", "CHÊNE", "oak-leaf", "oak-le", "leaf", "desk,", "burl", "burled", "truhe", "schub", "hinoki", "%", "_", "al", "ALI", "caps.ex", "555", "0102", "5550199", "7946", "e", "a", ".", tag];
    const counts = Object.fromEntries(words.map((w) => [w, found(admin, `${w} ${tag}`).length]));
    for (const w of words) expect(found(admin, `${w} ${tag}`).sort(), w).toEqual(byIndex(w).filter((id) => byIndex(tag).includes(id)));
    // Not an empty agreement: what each kind of word finds here.
    expect(counts).toMatchObject({ zoë: 1, chene: 1, "oak-leaf": 1, burl: 2, "o'br": 1, ケヤキ: 1, ōmura: 1, "%": 1, al: 1, "5550199": 1, "7946": 1, [tag]: 5 });
  });

  it("orders and pages a search as SQL orders the rows: by name (case-blind), newest or last changed, either way, then id", async () => {
    const { admin } = await studioWithAdmin();
    const tag = unique("or").replace(/\W/g, "").slice(-6).toLowerCase();
    const names = ["adler", "Birchall", "birchall", "Cobb", "d'Arcy", "Eames", "éclair", "Zander", "zed"];
    for (let i = 0; i < 62; i++) {
      const at = new Date(NOW.getTime() + ((i * 7919) % 61) * 60_000); // created out of name order, two at one instant
      const c = createClient(admin, createClientSchema.parse({ name: `${names[i % names.length]} ${i % 3 ? "Rowan" : "Hale"} ${tag} (invented)` }), at);
      if (i % 4 === 0) updateClient(admin, c.id, clientPatchSchema.parse({ notes: "changed" }), new Date(at.getTime() + 3_600_000));
    }
    const columns = { name: sql`name COLLATE NOCASE`, newest: sql`created_at`, updated: sql`updated_at` } as const;
    for (const q of [tag, `rowan ${tag}`]) {
      for (const sort of ["name", "newest", "updated"] as const) {
        for (const dir of [undefined, "asc", "desc"] as const) {
          const d = sql.raw((dir ?? (sort === "name" ? "asc" : "desc")).toUpperCase());
          const like = `%${q.split(" ")[0]}%`;
          const expected = getDb()
            .all<{ id: string }>(sql`SELECT id FROM clients WHERE studio_id = ${admin.studio.id} AND name LIKE ${like} AND name LIKE ${`%${tag}%`} ORDER BY ${columns[sort]} ${d}, id ${d}`)
            .map((r) => r.id);
          const pages = [1, 2].map((page) => listClients(admin, clientListQuerySchema.parse({ q, sort, dir, page: String(page) })));
          expect(pages[0]!.total, `${q} ${sort} ${dir}`).toBe(expected.length);
          expect([...pages[0]!.rows, ...pages[1]!.rows].map((r) => r.id), `${q} ${sort} ${dir}`).toEqual(expected);
        }
      }
    }
  });
});
