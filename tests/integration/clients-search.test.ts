// The clients list search through its full-text indexes (migration 0025: clients_fts over name, e-mail
// and phone, client_titles_fts over their pieces' titles), kept by triggers: a client is found by part
// of the name, part of the e-mail, phone digits and the start of a piece-title word right after it is
// created, after each change (client record, piece title, piece moved to another client, piece
// deleted) and after erasure, whatever code path wrote the row.
import { eq, sql } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { pieces } from "@/db/schema";
import type { StudioContext } from "@/lib/auth/guards";
import { createClient } from "@/lib/clients/create";
import { listClients } from "@/lib/clients/list";
import { eraseClient } from "@/lib/clients/personal-data";
import { updateClient } from "@/lib/clients/update";
import { updatePiece } from "@/lib/pieces/registry-update";
import { clientListQuerySchema, clientPatchSchema, createClientSchema } from "@/lib/validation/clients";
import { createPiece, createStudio, memberContext, unique } from "../support/fixtures";

const NOW = new Date("2026-11-20T18:00:00Z");

async function studioWithAdmin() {
  const studio = createStudio({ timeZone: "America/Los_Angeles", country: "US", currency: "USD" });
  return { studio, admin: await memberContext(studio, "admin") };
}

const found = (ctx: StudioContext, q: string) => listClients(ctx, clientListQuerySchema.parse({ q })).rows.map((r) => r.id);

describe("clients list search, kept by the database's triggers", () => {
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

  it("reads name, e-mail and phone through the index, not the table (a row missing from the index is not found)", async () => {
    const { admin } = await studioWithAdmin();
    const tag = unique("ix").replace(/\W/g, "").slice(-8).toLowerCase();
    const c = createClient(admin, createClientSchema.parse({ name: `Orrin Velloway ${tag} (invented)` }), NOW);
    expect(found(admin, `velloway ${tag}`)).toEqual([c.id]);
    getDb().run(sql`DELETE FROM clients_fts WHERE rowid = (SELECT rowid FROM clients WHERE id = ${c.id})`);
    expect(found(admin, `velloway ${tag}`)).toEqual([]);
  });
});
