// The clients list's totals (lib/clients/list.ts), against a real SQLite file: the same
// search, asked again in the same process after a client is created, changed or erased, or a piece
// moves to another client, shows the new total at once; a search counts its matches only up to 500 and
// then says "more than", as the registry does.
import { eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { pieces } from "@/db/schema";
import { createClient } from "@/lib/clients/create";
import { listClients } from "@/lib/clients/list";
import { eraseClient } from "@/lib/clients/personal-data";
import { updateClient } from "@/lib/clients/update";
import { clientListQuerySchema, clientPatchSchema, createClientSchema } from "@/lib/validation/clients";
import { createPiece, createStudio, memberContext, unique } from "../support/fixtures";

const NOW = new Date("2026-11-20T18:00:00Z");

describe("clients list totals", () => {
  it("a repeated search counts again after a client is created, changed or erased, or a piece changes hands", async () => {
    const studio = createStudio({ timeZone: "America/Los_Angeles", country: "US", currency: "USD" });
    const admin = await memberContext(studio, "admin");
    const tag = unique("t").replace(/\W/g, "").slice(-8).toLowerCase();
    const search = (q = `Wrenhollow ${tag}`) => listClients(admin, clientListQuerySchema.parse({ q }));
    const made = Array.from({ length: 3 }, (_, i) => createClient(admin, createClientSchema.parse({ name: `Wrenhollow ${tag} ${i + 1} (invented)`, phone: `(503) 555-01${60 + i}` }), NOW));
    expect(search().total).toBe(3);
    expect(search().total).toBe(3); // asked again

    const added = createClient(admin, createClientSchema.parse({ name: `Wrenhollow ${tag} 4 (invented)` }), NOW);
    expect(search().total).toBe(4);

    updateClient(admin, made[0]!.id, clientPatchSchema.parse({ name: `Ambersley ${tag} (invented)` }), NOW);
    expect(search().total).toBe(3);
    expect(search().rows.map((r) => r.id)).not.toContain(made[0]!.id);

    await eraseClient(admin, added.id, NOW);
    expect(search().total).toBe(2);

    // Found through a piece's title: the total follows the piece to its new client.
    const { piece } = createPiece(studio, { clientId: made[1]!.id, title: `Cloudcedar ${tag} lowboy (invented)` });
    expect(search(`lowboy ${tag}`).total).toBe(1);
    getDb().update(pieces).set({ clientId: made[2]!.id }).where(eq(pieces.id, piece.id)).run();
    expect(search(`lowboy ${tag}`).rows.map((r) => r.id)).toEqual([made[2]!.id]);
    getDb().delete(pieces).where(eq(pieces.id, piece.id)).run();
    expect(search(`lowboy ${tag}`).total).toBe(0);

    // Phones are shown in the studio's national format, and a changed number shows as changed.
    expect(search().rows.find((r) => r.id === made[1]!.id)!.phoneDisplay).toBe("(503) 555-0161");
    updateClient(admin, made[1]!.id, clientPatchSchema.parse({ phone: "+44 20 7946 0018" }), NOW);
    expect(search().rows.find((r) => r.id === made[1]!.id)!.phoneDisplay).toBe("+44 20 7946 0018");
  });

  it("a search past 500 matches says more than 500, and pages in name order", async () => {
    const studio = createStudio({ timeZone: "America/Los_Angeles", country: "US", currency: "USD" });
    const admin = await memberContext(studio, "admin");
    const tag = unique("m").replace(/\W/g, "").slice(-8).toLowerCase();
    for (let i = 0; i < 503; i++) createClient(admin, createClientSchema.parse({ name: `Marrowby ${tag} ${String(i).padStart(3, "0")} (invented)` }), NOW);
    const search = (page = 1) => listClients(admin, clientListQuerySchema.parse({ q: `Marrowby ${tag}`, page: String(page) }));
    const first = search();
    expect(first).toMatchObject({ total: 500, totalIsCapped: true, pageSize: 50 });
    expect(first.rows.map((r) => r.name).slice(0, 2)).toEqual([`Marrowby ${tag} 000 (invented)`, `Marrowby ${tag} 001 (invented)`]);
    expect(search(3).rows[0]!.name).toBe(`Marrowby ${tag} 100 (invented)`);
    // Fewer than the cap: the exact number.
    expect(listClients(admin, clientListQuerySchema.parse({ q: `Marrowby ${tag} 045` }))).toMatchObject({ total: 1, totalIsCapped: false });
  });
});
