// Migration 0016 moves claim messages into the claims' threads: one thread per claim with messages,
// unread and waiting when the owner wrote last, open otherwise, every message kept with its author,
// and thread ids a reply address can carry. Run against a database migrated to just before it.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { migrate } from "drizzle-orm/better-sqlite3/migrator";
import { describe, expect, it } from "vitest";
import { openDatabase } from "@/db/client";
import { MIGRATIONS_FOLDER } from "@/db/migrate";
import { checkReplyAddress, replyAddress } from "@/lib/messages/reply-address";

describe("the migration that moved claim messages into threads", () => {
  it("keeps every message, one thread per claim, unread where the owner wrote last", () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), "gw-threads-mig-"));
    const before = path.join(dir, "before");
    fs.cpSync(MIGRATIONS_FOLDER, before, { recursive: true });
    const journalFile = path.join(before, "meta", "_journal.json");
    const journal = JSON.parse(fs.readFileSync(journalFile, "utf8")) as { entries: { tag: string }[] };
    const at = journal.entries.findIndex((e) => e.tag === "0016_claim-messages-into-threads");
    expect(at).toBeGreaterThan(0);
    journal.entries = journal.entries.slice(0, at);
    fs.writeFileSync(journalFile, JSON.stringify(journal));
    const db = openDatabase(path.join(dir, "old.sqlite"));
    migrate(db, { migrationsFolder: before });
    const raw = db.$client;
    const t0 = Date.UTC(2026, 10, 1);
    raw.prepare("INSERT INTO studios (id, slug, name, created_at) VALUES ('s1','s1','One (invented)',?)").run(t0);
    raw.prepare("INSERT INTO users (id, email, name, password_hash, created_at, reminders_enabled) VALUES ('o1','owner@test.example','Owner (invented)','x',?,1), ('st','staff@test.example','Staff (invented)','x',?,1)").run(t0, t0);
    raw
      .prepare("INSERT INTO pieces (id, studio_id, kind, title, shape_kind, primary_species_id, use, delivered_on, owner_id, registration_code_hash, registration_code_enc, created_at, updated_at) VALUES ('p1','s1','dining_table','T','rectangle','black_walnut','heavy','2025-01-01','o1','h1','e',?,?)")
      .run(t0, t0);
    const claim = raw.prepare("INSERT INTO claims (id, studio_id, piece_id, owner_id, category, noticed_on, description, answers, state, created_at, updated_at) VALUES (?,'s1','p1','o1','finish_wear','2026-10-01','Invented.','{}','declined',?,?)");
    for (const id of ["c1", "c2", "c3"]) claim.run(id, t0, t0);
    const message = raw.prepare("INSERT INTO claim_messages (id, studio_id, claim_id, author_id, from_studio, body, created_at) VALUES (?,'s1',?,?,?,?,?)");
    message.run("m1", "c1", "o1", 0, "First question", t0 + 1000);
    message.run("m2", "c1", "st", 1, "An answer", t0 + 2000);
    message.run("m3", "c1", "o1", 0, "A follow-up after the decision", t0 + 3000);
    message.run("m4", "c2", "st", 1, "Could you send a photo?", t0 + 4000);

    migrate(db, { migrationsFolder: MIGRATIONS_FOLDER });
    const threads = raw.prepare("SELECT id, claim_id AS claimId, subject, piece_id AS pieceId, owner_id AS ownerId, state, waiting_since AS waitingSince, last_message_at AS lastMessageAt FROM threads ORDER BY claim_id").all() as {
      id: string;
      claimId: string;
      state: string;
      waitingSince: number | null;
      lastMessageAt: number;
    }[];
    expect(threads.map(({ id: _id, ...t }) => t)).toEqual([
      { claimId: "c1", subject: "claim", pieceId: "p1", ownerId: "o1", state: "unread", waitingSince: t0 + 3000, lastMessageAt: t0 + 3000 },
      { claimId: "c2", subject: "claim", pieceId: "p1", ownerId: "o1", state: "open", waitingSince: null, lastMessageAt: t0 + 4000 },
    ]);
    for (const t of threads) expect(checkReplyAddress(replyAddress(t.id))).toEqual({ kind: "ok", threadId: t.id });
    const byThread = Object.fromEntries(threads.map((t) => [t.id, t.claimId]));
    const messages = raw.prepare("SELECT id, thread_id AS threadId, author, author_id AS authorId, source, body, created_at AS createdAt FROM thread_messages ORDER BY created_at").all() as { threadId: string }[];
    expect(messages.map((m) => ({ ...m, threadId: byThread[m.threadId] }))).toEqual([
      { id: "m1", threadId: "c1", author: "owner", authorId: "o1", source: "web", body: "First question", createdAt: t0 + 1000 },
      { id: "m2", threadId: "c1", author: "staff", authorId: "st", source: "web", body: "An answer", createdAt: t0 + 2000 },
      { id: "m3", threadId: "c1", author: "owner", authorId: "o1", source: "web", body: "A follow-up after the decision", createdAt: t0 + 3000 },
      { id: "m4", threadId: "c2", author: "staff", authorId: "st", source: "web", body: "Could you send a photo?", createdAt: t0 + 4000 },
    ]);
    expect(raw.prepare("SELECT name FROM sqlite_master WHERE name = 'claim_messages'").get()).toBeUndefined();
    db.$client.close();
    fs.rmSync(dir, { recursive: true, force: true });
  });
});
