// Starting a studio at /start (lib/studio/create.ts): who may, per STUDIO_SIGNUP and the first-studio
// rule; the new admin's membership; a second studio for the same account only when allowed; and the
// set-up checklist read from the studio's data (lib/studio/setup.ts).
// Each test opens a database file of its own, so "an install with no studio" is really empty.
// All data invented.
import fs from "node:fs";
import path from "node:path";
import { eq } from "drizzle-orm";
import { afterAll, describe, expect, it } from "vitest";
import { ZodError } from "zod";
import { openDatabase, type Db } from "@/db/client";
import { applyMigrations } from "@/db/migrate";
import { auditLog, finishProducts, invitations, memberships, studios, users, warrantyPolicies, type Studio } from "@/db/schema";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { AppError } from "@/lib/errors";
import { env } from "@/lib/env";
import { REFUSALS, createStudio, type SignupMode } from "@/lib/studio/create";
import { startStudioSchema } from "@/lib/studio/create-schema";
import { studioInviteLink, studioInviteToken } from "@/lib/studio/create-invite";
import { setupChecklist } from "@/lib/studio/setup";

const dir = path.resolve("tests/.tmp", `studio-start-${process.pid}-${Date.now()}`);
const opened: Db[] = [];
let n = 0;

function freshDb(): Db {
  const db = openDatabase(path.join(dir, `start-${++n}.db`));
  applyMigrations(db);
  opened.push(db);
  return db;
}
afterAll(() => {
  for (const db of opened) db.$client.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

function person(db: Db, name = "Wren Okafor (invented)") {
  return db
    .insert(users)
    .values({
      email: `person-${++n}@start.example`,
      name,
      passwordHash: "not-a-real-hash",
    })
    .returning()
    .get();
}

const input = {
  name: "Hollowbrook Joinery (invented)",
  timeZone: "Europe/Lisbon",
  currency: "EUR" as const,
  unitSystem: "metric" as const,
};

/** The refusal's status and words, or "made" when the studio was created. */
function attempt(db: Db, userId: string, mode: SignupMode, extra: { invite?: string } = {}, now?: Date): string {
  try {
    createStudio(userId, { ...input, ...extra }, { db, mode, now });
    return "made";
  } catch (e) {
    if (e instanceof AppError) return `${e.status} ${e.message}`;
    throw e;
  }
}

describe("STUDIO_SIGNUP", () => {
  it("is closed unless set", () => {
    expect(process.env.STUDIO_SIGNUP).toBeUndefined();
    expect(env.STUDIO_SIGNUP).toBe("closed");
  });

  it("lets the first visitor of an empty install start a studio whatever the setting, then follows it", () => {
    for (const mode of ["closed", "invite", "open"] as const) {
      const db = freshDb();
      const first = person(db);
      expect(attempt(db, first.id, mode), mode).toBe("made");
      const second = person(db);
      expect(attempt(db, second.id, mode), mode).toBe(mode === "open" ? "made" : `403 ${mode === "closed" ? REFUSALS.closed : REFUSALS.invite_needed}`);
    }
  });

  it("makes the account the admin of a studio with the name, zone, currency and units given", () => {
    const db = freshDb();
    const wren = person(db);
    const studio = createStudio(wren.id, input, { db, mode: "closed" });
    expect([studio.name, studio.slug, studio.timeZone, studio.currency, studio.unitSystem]).toEqual([
      input.name,
      "hollowbrook-joinery-invented",
      "Europe/Lisbon",
      "EUR",
      "metric",
    ]);
    const rows = db.select().from(memberships).where(eq(memberships.studioId, studio.id)).all();
    expect(rows.map((m) => [m.userId, m.role])).toEqual([[wren.id, "admin"]]);
    const audit = db.select().from(auditLog).where(eq(auditLog.subjectId, studio.id)).all();
    expect(audit.map((a) => [a.action, a.actorId, a.data])).toEqual([["studio.created", wren.id, { how: "first" }]]);
  });

  it("closed: nobody starts a second studio, not even with an invite link", () => {
    const db = freshDb();
    const wren = person(db);
    createStudio(wren.id, input, { db, mode: "closed" });
    expect(attempt(db, wren.id, "closed")).toBe(`403 ${REFUSALS.closed}`);
    expect(attempt(db, person(db).id, "closed", { invite: studioInviteToken() })).toBe(`403 ${REFUSALS.closed}`);
    expect(db.select().from(studios).all()).toHaveLength(1);
  });

  it("invite: a signed, in-date link starts exactly one studio; made-up, altered, expired and used links are refused", () => {
    const db = freshDb();
    createStudio(person(db).id, input, { db, mode: "invite" });
    const user = person(db).id;
    const token = studioInviteToken({ days: 14 });
    const [expiry, nonce, signature] = token.split(".") as [string, string, string];

    expect(attempt(db, user, "invite")).toBe(`403 ${REFUSALS.invite_needed}`);
    expect(attempt(db, user, "invite", { invite: "made-up" })).toBe(`403 ${REFUSALS.invite_bad}`);
    // A later expiry with the old signature, and a signature of another key, are both refused.
    expect(
      attempt(db, user, "invite", {
        invite: `${Number(expiry) + 86_400}.${nonce}.${signature}`,
      }),
    ).toBe(`403 ${REFUSALS.invite_bad}`);
    expect(
      attempt(db, user, "invite", {
        invite: `${expiry}.${nonce}.${"A".repeat(signature.length)}`,
      }),
    ).toBe(`403 ${REFUSALS.invite_bad}`);
    // Made 20 days ago for 14 days: expired 6 days ago.
    const old = studioInviteToken({
      days: 14,
      now: new Date(Date.now() - 20 * 86_400_000),
    });
    expect(attempt(db, user, "invite", { invite: old })).toBe(`403 ${REFUSALS.invite_expired}`);
    // Checked against the clock passed in: one second after its expiry it is refused, one second before it is good.
    expect(attempt(db, user, "invite", { invite: token }, new Date(Number(expiry) * 1000 + 1000))).toBe(`403 ${REFUSALS.invite_expired}`);
    expect(attempt(db, user, "invite", { invite: token }, new Date(Number(expiry) * 1000 - 1000))).toBe("made");
    const audit = db.select().from(auditLog).where(eq(auditLog.action, "studio.created")).all();
    expect(audit.at(-1)!.data).toEqual({ how: "invite", invite: nonce });
    expect(attempt(db, person(db).id, "invite", { invite: token })).toBe(`403 ${REFUSALS.invite_used}`);
    expect(db.select().from(studios).all()).toHaveLength(2);
    expect(studioInviteLink(token)).toBe(`${env.APP_URL}/start?invite=${token}`);
  });

  it("open: the same account starts a second studio of its own, admin of both, each with its own address", () => {
    const db = freshDb();
    const wren = person(db);
    const a = createStudio(wren.id, input, { db, mode: "open" });
    const b = createStudio(wren.id, input, { db, mode: "open" });
    expect(b.id).not.toBe(a.id);
    expect([a.slug, b.slug]).toEqual(["hollowbrook-joinery-invented", "hollowbrook-joinery-invented-2"]);
    const rows = db.select().from(memberships).where(eq(memberships.userId, wren.id)).all();
    expect(rows.map((m) => [m.studioId, m.role]).sort()).toEqual(
      [
        [a.id, "admin"],
        [b.id, "admin"],
      ].sort(),
    );
  });

  it("refuses a bad time zone or currency with the settings form's words, making nothing", () => {
    const db = freshDb();
    const user = person(db).id;
    for (const bad of [{ timeZone: "Mars/Olympus" }, { currency: "XYZ" }, { name: "  " }]) {
      expect(() => createStudio(user, startStudioSchema.parse({ ...input, ...bad }), { db, mode: "open" })).toThrow(ZodError);
    }
    try {
      createStudio(user, startStudioSchema.parse({ ...input, timeZone: "Mars/Olympus" }), { db, mode: "open" });
    } catch (e) {
      expect((e as ZodError).issues[0]!.message).toBe("Use a time zone name like America/Los_Angeles or Europe/Berlin.");
    }
    expect(db.select().from(studios).all()).toHaveLength(0);
  });
});

describe("set-up checklist", () => {
  it("lists all nine steps as left for a new studio and ticks each off from the data", () => {
    const db = freshDb();
    const wren = person(db);
    const studio = createStudio(wren.id, input, { db, mode: "open" });
    const left = () =>
      setupChecklist({ studio, role: "admin" }, db)
        .filter((i) => !i.done)
        .map((i) => i.key);
    expect(left()).toEqual(["details", "brand", "warranty", "catalog", "reminders", "visits", "team", "payments", "mail"]);
    expect(setupChecklist({ studio, role: "admin" }, db).map((i) => i.href)).toEqual(left().map((k) => `/studio/setup/${k}`));

    db.update(studios).set({ address: "2 Invented Row" }).where(eq(studios.id, studio.id)).run();
    db.insert(warrantyPolicies)
      .values({
        studioId: studio.id,
        version: 1,
        effectiveFrom: "2026-01-01",
        policy: DEFAULT_WARRANTY_POLICY,
      })
      .run();
    expect(left()).toEqual(["brand", "catalog", "reminders", "visits", "team", "payments", "mail"]);

    // An archived product is not a catalog.
    const product = db
      .insert(finishProducts)
      .values({
        studioId: studio.id,
        name: "Invented hardwax oil",
        finishClass: "hardwax_oil",
        coverageM2PerL: 20,
        archivedAt: new Date(),
      })
      .returning()
      .get();
    expect(left()).toContain("catalog");
    db.update(finishProducts).set({ archivedAt: null }).where(eq(finishProducts.id, product.id)).run();
    // A withdrawn invitation is not a team.
    const inv = db
      .insert(invitations)
      .values({
        studioId: studio.id,
        email: "tomas@start.example",
        role: "staff",
        tokenHash: `hash-${n}`,
        expiresAt: new Date(Date.now() + 86_400_000),
        revokedAt: new Date(),
      })
      .returning()
      .get();
    expect(left()).toEqual(["brand", "reminders", "visits", "team", "payments", "mail"]);
    db.update(invitations).set({ revokedAt: null }).where(eq(invitations.id, inv.id)).run();
    // A colour or logo is a brand; a checked Stripe key is payments; a sender name with a reply address is mail.
    db.update(studios).set({ accent: "walnut", stripeCheckedAt: new Date(), email: "desk@hollowbrook.example" }).where(eq(studios.id, studio.id)).run();
    expect(left()).toEqual(["reminders", "visits", "mail"]);
    db.update(studios).set({ mailSenderName: "Hollowbrook desk", setupDone: ["reminders", "visits"] }).where(eq(studios.id, studio.id)).run();
    expect(left()).toEqual([]);
  });

  it("counts a second member as a team and another studio's data for nothing; staff get no checklist", () => {
    const db = freshDb();
    const a = createStudio(person(db).id, input, { db, mode: "open" });
    const b = createStudio(person(db).id, input, { db, mode: "open" });
    db.insert(finishProducts)
      .values({
        studioId: b.id,
        name: "Invented topcoat",
        finishClass: "hardwax_oil",
        coverageM2PerL: 12,
      })
      .run();
    db.insert(memberships)
      .values({ studioId: a.id, userId: person(db).id, role: "technician" })
      .run();
    const done = (studio: Studio) =>
      setupChecklist({ studio, role: "admin" }, db)
        .filter((i) => i.done)
        .map((i) => i.key);
    expect(done(a)).toEqual(["team"]);
    expect(done(b)).toEqual(["catalog"]);
    expect(setupChecklist({ studio: a, role: "staff" }, db)).toEqual([]);
  });
});
