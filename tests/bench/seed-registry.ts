// Seeds a fresh, migrated SQLite file with one synthetic studio of N pieces (default 100,000): two
// finish layers each, ~55 % registered to synthetic owners, and their pieces_fts rows built with the
// product's own searchDocument(). All data is synthetic and invented.
// Standalone: DATABASE_URL=/tmp/x.db npx tsx tests/bench/seed-registry.ts [count]
import { randomUUID } from "node:crypto";
import { openDatabase } from "../../db/client";
import { applyMigrations } from "../../db/migrate";
import { mergeSearchIndexesAtOnce } from "../../db/search-indexes";
import { FINISH_CLASSES, PIECE_KINDS, USES, SUN_EXPOSURES, type FinishClass } from "../../lib/care/vocabulary";
import { SPECIES } from "../../lib/care/species";
import { searchDocument, searchScope } from "../../lib/pieces/search-index";

const FIRST = ["Ada", "Bram", "Cleo", "Dario", "Edda", "Fenn", "Gita", "Hugo", "Ines", "Jory", "Kaia", "Lev", "Mira", "Nico", "Orla", "Pim", "Quin", "Rosa", "Sven", "Tove", "Uma", "Vito", "Wren", "Yara", "Zeno"];
const LAST = Array.from({ length: 400 }, (_, i) => `${["Ash", "Birch", "Cove", "Dale", "Elm", "Fern", "Glen", "Holt", "Isle", "Jett", "Kerr", "Lund", "Moss", "Nash", "Oak", "Pike", "Quay", "Reed", "Stone", "Thorn"][i % 20]}${["ford", "wick", "by", "ton", "field", "more", "ley", "worth", "dale", "croft", "stead", "well", "brook", "wood", "gate", "holm", "shaw", "combe", "ridge", "hurst"][Math.floor(i / 20) % 20]}`);
const WORDS = ["live-edge", "river", "burl", "slab", "waterfall", "trestle", "pedestal", "bookmatched", "spalted", "charred", "floating", "farmhouse"];
const KIND_WORD: Record<string, string> = { dining_table: "dining table", coffee_table: "coffee table", desk: "desk", bench: "bench", countertop: "countertop", console: "console", shelf: "shelf", other: "piece" };

export type SeededRegistry = { studioId: string; staffUserId: string; pieces: number; owners: number };

export function seedRegistry(databaseUrl: string, count = 100_000): SeededRegistry {
  const db = openDatabase(databaseUrl);
  applyMigrations(db);
  const c = db.$client;
  const now = Date.now();
  const studioId = randomUUID();
  const staffUserId = randomUUID();
  c.prepare("INSERT INTO studios (id, slug, name, time_zone, created_at) VALUES (?, ?, ?, ?, ?)").run(studioId, `bench-${now}`, "Bench Studio (synthetic)", "America/New_York", now);
  c.prepare("INSERT INTO users (id, email, name, password_hash, email_verified_at, created_at) VALUES (?, ?, ?, ?, ?, ?)").run(staffUserId, `staff-${now}@bench.example`, "Bench Staff", "!", now, now);
  c.prepare("INSERT INTO memberships (id, studio_id, user_id, role, created_at) VALUES (?, ?, ?, 'staff', ?)").run(randomUUID(), studioId, staffUserId, now);

  const insUser = c.prepare("INSERT INTO users (id, email, name, password_hash, created_at) VALUES (?, ?, ?, '!', ?)");
  const insPiece = c.prepare(`INSERT INTO pieces (id, studio_id, kind, title, shape_kind, length_mm, width_mm, thickness_mm, primary_species_id, secondary_species_id,
    resin_kind, use, sun, delivered_on, delivery_address, internal_notes, owner_id, registered_at, registration_code_hash, registration_code_enc, created_at, updated_at)
    VALUES (?, ?, ?, ?, 'rectangle', ?, ?, 45, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 'synthetic', ?, ?)`);
  const insLayer = c.prepare(`INSERT INTO finish_layers (id, studio_id, piece_id, surface, position, finish_class, product_label, coats, applied_on, batch_lot, notes, created_at)
    VALUES (?, ?, ?, ?, 0, ?, ?, ?, ?, ?, '', ?)`);
  const insFts = c.prepare("INSERT INTO pieces_fts (rowid, scope, piece_id, studio_id, title, species, owner, notes) VALUES (?, ?, ?, ?, ?, ?, ?, ?)");

  const owners: { id: string; name: string; email: string }[] = [];
  c.transaction(() => {
    for (let i = 0; i < FIRST.length * LAST.length; i++) {
      const name = `${FIRST[i % FIRST.length]} ${LAST[Math.floor(i / FIRST.length)]}`;
      const o = { id: randomUUID(), name, email: `${name.toLowerCase().replace(/ /g, ".")}.${i}@owners.example` };
      insUser.run(o.id, o.email, o.name, now);
      owners.push(o);
    }
    for (let i = 0; i < count; i++) {
      const id = randomUUID();
      const kind = PIECE_KINDS[i % PIECE_KINDS.length]!;
      const species = SPECIES[(i * 7) % SPECIES.length]!;
      const secondary = i % 9 === 0 ? SPECIES[(i * 3 + 1) % SPECIES.length]! : null;
      const word = WORDS[i % WORDS.length]!;
      const title = `${word[0]!.toUpperCase()}${word.slice(1)} ${species.aliases[0] ?? species.commonName.toLowerCase()} ${KIND_WORD[kind]}`;
      const year = 2016 + (i % 10);
      const deliveredOn = `${year}-${String(1 + (i % 12)).padStart(2, "0")}-${String(1 + (i % 28)).padStart(2, "0")}`;
      const owner = i % 20 < 11 ? owners[(i * 13) % owners.length]! : null;
      const classes: [FinishClass, FinishClass] = [FINISH_CLASSES[i % FINISH_CLASSES.length]!, FINISH_CLASSES[(i + 3) % FINISH_CLASSES.length]!];
      const lot = `L${(i % 5000).toString(36).toUpperCase()}`;
      const notes = i % 4 === 0 ? `Delivered with ${word} care notes, batch ${lot}.` : "";
      const address = `${1 + (i % 200)} ${LAST[i % LAST.length]} Road, Testville`;
      const r = insPiece.run(id, studioId, kind, title, 1200 + (i % 1500), 500 + (i % 600), species.id, secondary?.id ?? null, i % 5 === 0 ? "deep_pour" : "none", USES[i % USES.length]!, SUN_EXPOSURES[i % 3]!, deliveredOn, address, notes, owner?.id ?? null, owner ? now : null, `bench-${id}`, now - i, now);
      insLayer.run(randomUUID(), studioId, id, "top", classes[0], `Synthetic ${classes[0].replace(/_/g, " ")}`, 2, deliveredOn, lot, now);
      insLayer.run(randomUUID(), studioId, id, "base", classes[1], "", 1, deliveredOn, "", now);
      const doc = searchDocument({
        title,
        kind,
        primarySpeciesId: species.id,
        secondarySpeciesId: secondary?.id ?? null,
        internalNotes: notes,
        deliveryAddress: address,
        baseMaterial: "",
        baseFinish: "",
        resinTint: null,
        owner,
        layers: [
          { finishClass: classes[0], productLabel: `Synthetic ${classes[0].replace(/_/g, " ")}`, batchLot: lot, notes: "" },
          { finishClass: classes[1], productLabel: "", batchLot: "", notes: "" },
        ],
      });
      insFts.run(r.lastInsertRowid, searchScope(studioId, false), id, studioId, doc.title, doc.species, doc.owner, doc.notes);
    }
  })();
  c.exec("ANALYZE; PRAGMA optimize;");
  mergeSearchIndexesAtOnce(c); // as the scheduler's nightly merge leaves them
  c.close();
  return { studioId, staffUserId, pieces: count, owners: owners.length };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("set DATABASE_URL to a new SQLite file");
  console.log(seedRegistry(url, Number(process.argv[2] ?? 100_000)));
}
