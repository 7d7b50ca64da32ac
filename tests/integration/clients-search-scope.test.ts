// The clients' title index carries each client's studio word (client_titles_fts.scope, migration 0032;
// the word searchScope in lib/pieces/search-index.ts gives a studio's live pieces), so a search's count
// takes a title word's matches in the studio from the index alone (lib/clients/list.ts, searchRowids).
// The word must follow the client whatever writes it: a piece added, moved to another client, deleted;
// the client moved to another studio (its pieces with it, in either order) or deleted. Another studio's
// client with the same title is never counted. Invented names and titles.
import { eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { clients, pieces } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { createClient } from "@/lib/clients/create";
import { listClients } from "@/lib/clients/list";
import { searchScope } from "@/lib/pieces/search-index";
import { clientListQuerySchema, createClientSchema } from "@/lib/validation/clients";
import { createPiece, createStudio, memberContext, unique } from "../support/fixtures";

const NOW = new Date("2026-11-20T18:00:00Z");

async function studioWithAdmin() {
  const studio = createStudio({ timeZone: "America/Los_Angeles", country: "US", currency: "USD" });
  return { studio, admin: await memberContext(studio, "admin") };
}

const search = (ctx: StudioContext, q: string) => {
  const page = listClients(ctx, clientListQuerySchema.parse({ q }));
  return { ids: page.rows.map((r) => r.id).sort(), total: page.total };
};
/** The client's row of the title index: its scope word and titles, or undefined when it has none. */
const titleRow = (clientId: string) =>
  getDb().get<{ scope: string; titles: string } | undefined>(
    sql`SELECT scope, titles FROM client_titles_fts WHERE rowid = (SELECT rowid FROM clients WHERE id = ${clientId})`,
  );
/** How many of the studio's clients the index alone finds for a title word, next to the count through the clients' rows. */
const counts = (studioId: string, word: string) => ({
  index: getDb().get<{ n: number }>(sql`SELECT count(*) AS n FROM client_titles_fts WHERE client_titles_fts MATCH ${`scope : "${searchScope(studioId, false)}" AND titles : ("${word}"*)`}`)!.n,
  rows: getDb().get<{ n: number }>(
    sql`SELECT count(*) AS n FROM client_titles_fts f JOIN clients c ON c.rowid = f.rowid WHERE client_titles_fts MATCH ${`titles : ("${word}"*)`} AND c.studio_id = ${studioId}`,
  )!.n,
});

describe("clients title index scope word", () => {
  it("follows a client's pieces and studio, and never counts another studio's client", async () => {
    const a = await studioWithAdmin();
    const b = await studioWithAdmin();
    const word = `gloam${unique("s").replace(/\W/g, "").slice(-8).toLowerCase()}`;
    const wordA = searchScope(a.studio.id, false);
    const wordB = searchScope(b.studio.id, false);

    const a1 = createClient(a.admin, createClientSchema.parse({ name: "Idris Fenmarrow (invented)" }), NOW);
    const a2 = createClient(a.admin, createClientSchema.parse({ name: "Ottilie Brankwell (invented)" }), NOW);
    const b1 = createClient(b.admin, createClientSchema.parse({ name: "Idris Fenmarrow (invented)" }), NOW);
    // No pieces, no row.
    expect(titleRow(a1.id)).toBeUndefined();
    const { piece } = createPiece(a.studio, { clientId: a1.id, title: `${word} bench (invented)` });
    createPiece(b.studio, { clientId: b1.id, title: `${word} bench (invented)` });
    expect(titleRow(a1.id)).toEqual({ scope: wordA, titles: `${word} bench (invented)` });
    expect(titleRow(b1.id)?.scope).toBe(wordB);
    // Each studio counts its own client only, by the index alone as by the rows.
    expect(search(a.admin, word)).toEqual({ ids: [a1.id], total: 1 });
    expect(search(b.admin, word)).toEqual({ ids: [b1.id], total: 1 });
    expect(counts(a.studio.id, word)).toEqual({ index: 1, rows: 1 });
    // A typed word never reaches the scope column, even the scope word itself.
    expect(search(a.admin, wordA).total).toBe(0);

    // The piece moved to another client: the title follows it, with the studio's word.
    getDb().update(pieces).set({ clientId: a2.id }).where(eq(pieces.id, piece.id)).run();
    expect(titleRow(a1.id)).toBeUndefined();
    expect(titleRow(a2.id)).toEqual({ scope: wordA, titles: `${word} bench (invented)` });
    expect(search(a.admin, word)).toEqual({ ids: [a2.id], total: 1 });

    // The client moved to studio B, its piece first: the piece no longer joins its client (row gone),
    // then the client's move rebuilds the row with B's word.
    getDb().update(pieces).set({ studioId: b.studio.id }).where(eq(pieces.id, piece.id)).run();
    expect(titleRow(a2.id)).toBeUndefined();
    getDb().update(clients).set({ studioId: b.studio.id }).where(eq(clients.id, a2.id)).run();
    expect(titleRow(a2.id)?.scope).toBe(wordB);
    expect(search(a.admin, word)).toEqual({ ids: [], total: 0 });
    expect(search(b.admin, word)).toEqual({ ids: [a2.id, b1.id].sort(), total: 2 });
    expect(counts(b.studio.id, word)).toEqual({ index: 2, rows: 2 });
    // And back, the client first: its row goes (its piece is in B), then comes back with A's word.
    getDb().update(clients).set({ studioId: a.studio.id }).where(eq(clients.id, a2.id)).run();
    expect(titleRow(a2.id)).toBeUndefined();
    getDb().update(pieces).set({ studioId: a.studio.id }).where(eq(pieces.id, piece.id)).run();
    expect(titleRow(a2.id)?.scope).toBe(wordA);
    expect(search(a.admin, word)).toEqual({ ids: [a2.id], total: 1 });
    expect(counts(a.studio.id, word)).toEqual({ index: 1, rows: 1 });

    // The piece deleted: the row goes.
    getDb().delete(pieces).where(eq(pieces.id, piece.id)).run();
    expect(titleRow(a2.id)).toBeUndefined();
    expect(search(a.admin, word)).toEqual({ ids: [], total: 0 });

    // The client deleted (their piece keeps no client): the row goes.
    getDb().run(sql`DELETE FROM client_consents WHERE client_id = ${b1.id}`);
    getDb().delete(clients).where(eq(clients.id, b1.id)).run();
    expect(getDb().get<{ n: number }>(sql`SELECT count(*) AS n FROM client_titles_fts WHERE client_titles_fts MATCH ${`titles : ("${word}"*)`}`)!.n).toBe(0);
    expect(search(b.admin, word)).toEqual({ ids: [], total: 0 });
  });
});
