// The reads every request makes keep their id as `+?` (db/bound.ts), so each is planned once per
// connection and then run with one value after another. Whatever the value, each run must read only its
// own rows: the session of the id asked for, the memberships of that person, the piece only for the
// owner who holds it (another owner's is a 404 or null), a studio's conversations and an owner's claims
// only theirs. Checked on a database that ANALYZE has
// sampled (sqlite_stat4), where a bare `?` was planned again on every run, with the values interleaved
// so that every statement is run for several owners in turn. Its own SQLite file (ANALYZE would change
// the statistics other test files plan with); invented studios, owners and pieces.
import { beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { memberships, sessions, threadMessages, threads, type Piece, type Studio } from "@/db/schema";
import { studioMemberships } from "@/lib/auth/actor";
import { getLucia } from "@/lib/auth/lucia";
import { randomToken, sha256Hex } from "@/lib/crypto";
import { isAppError } from "@/lib/errors";
import { listOwnerClaims, ownerClaimsOverview } from "@/lib/claims/list";
import { listInbox, studioThread, unreadCount } from "@/lib/messages/service";
import { getMyPiece, ownedPieceRow, ownedPieceShell } from "@/lib/owner/pieces";
import { createAcceptedClaim, createPiece, createStudio, createUser, memberContext } from "../support/fixtures";
import { ownDatabaseFile } from "./reminders-helpers";

const NOW = new Date("2026-03-15T18:00:00Z");

type Person = Awaited<ReturnType<typeof createUser>>;
let people: Person[];
let held: { owner: Person; piece: Piece }[];
const sessionOf = new Map<string, string[]>();
const studioName = new Map<string, string>();
let studios: Studio[];
/** Each studio's threads, and how many of them are unread (studio one: 3 of 4, studio two: 1 of 2). */
const threadsOf = new Map<string, { ids: string[]; unread: number }>();

beforeAll(async () => {
  ownDatabaseFile("bound-values");
  studios = [createStudio({ name: "Bound Studio One (invented)" }), createStudio({ name: "Bound Studio Two (invented)" })];
  for (const s of studios) studioName.set(s.id, s.name);
  people = [];
  for (let i = 0; i < 5; i++) people.push(await createUser({ name: `Owner ${i} (invented)` }));
  // Owners 0-3 hold two pieces each, one from each studio; owner 4 holds none. One unowned piece.
  held = [];
  people.slice(0, 4).forEach((owner, i) => {
    for (const studio of studios) held.push({ owner, piece: createPiece(studio, { ownerId: owner.id, title: `Table ${i} of ${studio.name}` }).piece });
  });
  createPiece(studios[0]!, { title: "Unregistered bench (invented)" });
  // Owner 0 works in studio one, owner 1 in both (staff in two), owner 2 in studio two; 3 and 4 in none.
  getDb()
    .insert(memberships)
    .values([
      { studioId: studios[0]!.id, userId: people[0]!.id, role: "admin" },
      { studioId: studios[0]!.id, userId: people[1]!.id, role: "staff" },
      { studioId: studios[1]!.id, userId: people[1]!.id, role: "technician" },
      { studioId: studios[1]!.id, userId: people[2]!.id, role: "admin" },
    ])
    .run();
  for (const person of people) {
    const ids = [sha256Hex(randomToken(24)), sha256Hex(randomToken(24))];
    for (const id of ids) await getLucia().createSession(person.id, {}, { sessionId: id });
    sessionOf.set(person.id, ids);
  }
  // Conversations about the owners' claims, each with one message: four in studio one, two in studio two.
  const states = [["unread", "unread", "unread", "open"], ["unread", "done"]] as const;
  studios.forEach((studio, s) => {
    const ids: string[] = [];
    held.filter((h) => h.piece.studioId === studio.id).forEach(({ owner, piece }, i) => {
      const state = states[s]![i];
      if (!state) return;
      const claim = createAcceptedClaim(studio, piece.id, owner.id, "covered");
      const thread = getDb().insert(threads).values({ studioId: studio.id, subject: "claim", claimId: claim.id, pieceId: piece.id, ownerId: owner.id, state, lastMessageAt: NOW }).returning().get();
      getDb().insert(threadMessages).values({ studioId: studio.id, threadId: thread.id, author: "owner", authorId: owner.id, body: `About ${piece.title}` }).run();
      ids.push(thread.id);
    });
    threadsOf.set(studio.id, { ids, unread: states[s]!.filter((x) => x === "unread").length });
  });
  getDb().$client.exec("ANALYZE");
});

describe("reads planned once, run with one value after another", () => {
  it("the database is sampled, as the statements are planned with", () => {
    const sampled = getDb().$client.prepare("SELECT DISTINCT tbl FROM sqlite_stat4").pluck().all();
    expect(sampled).toEqual(expect.arrayContaining(["sessions", "memberships", "pieces", "finish_layers", "threads"]));
  });

  it("a session id finds its own session and person, an unknown id nothing", async () => {
    for (let round = 0; round < 2; round++) {
      for (const person of people) {
        for (const id of sessionOf.get(person.id)!) {
          const { session, user } = await getLucia().validateSession(id);
          expect(session?.id).toBe(id);
          expect(user?.id).toBe(person.id);
        }
        expect(await getLucia().validateSession(sha256Hex(`${person.id}-not-a-session`))).toEqual({ session: null, user: null });
      }
    }
    // Every session row is still one of the ids made above (validating only reads or extends).
    expect(getDb().select().from(sessions).all()).toHaveLength(people.length * 2);
  });

  it("a person's studios are theirs only, for each person in turn", async () => {
    const expected = (p: number) => getDb().$client.prepare("SELECT studio_id, role FROM memberships WHERE user_id = ? ORDER BY created_at, rowid").all(people[p]!.id);
    for (let round = 0; round < 2; round++) {
      for (let p = 0; p < people.length; p++) {
        const rows = await studioMemberships(people[p]!.id);
        expect(rows.map((r) => ({ studio_id: r.studio.id, role: r.role }))).toEqual(expected(p));
      }
    }
    expect((await studioMemberships(people[1]!.id)).map((r) => r.role)).toEqual(["staff", "technician"]);
    expect(await studioMemberships(people[3]!.id)).toEqual([]);
  });

  it("a piece's page reads answer only for the owner who holds it", () => {
    const notFound = (read: () => unknown) => {
      try {
        read();
      } catch (e) {
        return isAppError(e) && e.status === 404;
      }
      return false;
    };
    for (let round = 0; round < 2; round++) {
      for (const asker of people) {
        for (const { owner, piece } of held) {
          if (owner.id === asker.id) {
            expect(ownedPieceRow(asker, piece.id).id).toBe(piece.id);
            expect(ownedPieceShell(asker, piece.id)?.brand.name).toBe(studioName.get(piece.studioId));
            const page = getMyPiece(asker, piece.id, NOW);
            expect(page.id).toBe(piece.id);
            expect(page.title).toBe(piece.title);
            const layers = getDb().$client.prepare("SELECT count(*) FROM finish_layers WHERE piece_id = ?").pluck().get(piece.id);
            expect(page.layers).toHaveLength(layers as number);
          } else {
            expect(notFound(() => ownedPieceRow(asker, piece.id))).toBe(true);
            expect(ownedPieceShell(asker, piece.id)).toBeNull();
            expect(notFound(() => getMyPiece(asker, piece.id, NOW))).toBe(true);
          }
        }
      }
    }
  });

  it("a studio's unread count, inbox and threads are its own, for each studio in turn", async () => {
    const staff = [await memberContext(studios[0]!, "staff"), await memberContext(studios[1]!, "admin")];
    for (let round = 0; round < 3; round++) {
      for (const ctx of staff) {
        const own = threadsOf.get(ctx.studio.id)!;
        expect(unreadCount(ctx)).toBe(own.unread);
        const inbox = listInbox(ctx, { view: "all" }, NOW.getTime());
        expect(inbox.threads.map((t) => t.id).sort()).toEqual([...own.ids].sort());
        for (const [studioId, { ids }] of threadsOf) {
          for (const id of ids) {
            if (studioId === ctx.studio.id) expect(studioThread(ctx, id).id).toBe(id);
            else expect(() => studioThread(ctx, id)).toThrow(/No conversation with that id in this studio/);
          }
        }
      }
    }
  });

  it("an owner's claims and the pieces to claim on are their own, for each owner in turn", () => {
    const claimsOf = (id: string) => getDb().$client.prepare("SELECT id FROM claims WHERE owner_id = ? ORDER BY id").pluck().all(id);
    expect(claimsOf(people[0]!.id)).toHaveLength(2);
    for (let round = 0; round < 2; round++) {
      for (const person of people) {
        expect(listOwnerClaims(person).map((c) => c.id).sort()).toEqual(claimsOf(person.id));
        const overview = ownerClaimsOverview(person);
        expect(overview.claims.map((c) => c.id).sort()).toEqual(claimsOf(person.id));
        expect(overview.pieces.map((p) => p.id).sort()).toEqual(held.filter((h) => h.owner.id === person.id).map((h) => h.piece.id).sort());
      }
    }
  });
});
