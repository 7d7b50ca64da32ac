// Registering a piece by its drawer-card code, through the route wrapper (real JSON status codes)
// and lib/owner against a real SQLite file. Each test uses its own IP so the per-IP buckets don't mix.
import { eq } from "drizzle-orm";
import { NextRequest } from "next/server";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { ownerships, pieces, users } from "@/db/schema";
import { rateLimits } from "@/lib/auth/rate-limit";
import { CROCKFORD_CHECK_ALPHABET, generateRegistrationCode } from "@/lib/care/registration-code";
import { route } from "@/lib/http/route";
import { lookupCard, registerPiece } from "@/lib/owner/registration";
import { releasePiece } from "@/lib/owner/transfer";
import { CODE_TYPO_MESSAGE, registrationSchema } from "@/lib/validation/owner";
import { createPiece, createStudio, createUser, unique } from "../support/fixtures";

let ipCounter = 0;
const freshIp = () => `198.51.100.${(++ipCounter % 250) + 1}-${unique("ip")}`;

async function verifiedUser() {
  return createUser({ emailVerifiedAt: new Date() });
}

/** The same wiring as app/api/registrations/route.ts, with the user and IP given instead of read from the request. */
function handlerFor(user: Awaited<ReturnType<typeof createUser>>, ip: string) {
  return route({ body: registrationSchema, status: 201 }, ({ body }) => registerPiece(user, body, ip));
}

async function post(user: Awaited<ReturnType<typeof createUser>>, ip: string, body: unknown) {
  const req = new NextRequest("http://localhost:3999/api/registrations", {
    method: "POST",
    body: typeof body === "string" ? body : JSON.stringify(body),
    headers: { "content-type": "application/json" },
  });
  const res = await handlerFor(user, ip)(req, { params: Promise.resolve({}) });
  return { status: res.status, body: (await res.json()) as { pieceId?: string; error?: { code: string; message: string; fieldErrors?: Record<string, string[]> } }, res };
}

/** The code with its check symbol replaced by a wrong one. */
function withWrongCheck(code: string): string {
  const last = code.slice(-1);
  const wrong = CROCKFORD_CHECK_ALPHABET[(CROCKFORD_CHECK_ALPHABET.indexOf(last) + 1) % CROCKFORD_CHECK_ALPHABET.length]!;
  return code.slice(0, -1) + wrong;
}

describe("POST /api/registrations", () => {
  it("201 with the piece id; the piece, its ownership and registeredAt are written", async () => {
    const studio = createStudio();
    const { piece, code } = createPiece(studio);
    const user = await verifiedUser();
    const r = await post(user, freshIp(), { code });
    expect(r.status).toBe(201);
    expect(r.body).toEqual({ pieceId: piece.id });
    const row = getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!;
    expect(row.ownerId).toBe(user.id);
    expect(row.registeredAt).toBeInstanceOf(Date);
    const own = getDb().select().from(ownerships).where(eq(ownerships.pieceId, piece.id)).all();
    expect(own).toHaveLength(1);
    expect(own[0]).toMatchObject({ userId: user.id, via: "registration", endedAt: null });
  });

  it("ignores case, spaces and hyphens, and reads I/L as 1 and O as 0", async () => {
    const studio = createStudio();
    // A code containing a 1 and a 0, so the look-alike letters are exercised.
    let made = createPiece(studio);
    while (!/1/.test(made.code.slice(0, -1)) || !/0/.test(made.code.slice(0, -1))) {
      made = createPiece(studio);
    }
    const typed = made.code
      .slice(0, -1)
      .replace(/-/g, " ")
      .replace("1", "l")
      .replace("0", "o")
      .toLowerCase() + made.code.slice(-1).toLowerCase();
    const r = await post(await verifiedUser(), freshIp(), { code: `  ${typed.replace(/ /, " - ")} ` });
    expect(r.status).toBe(201);
    expect(r.body.pieceId).toBe(made.piece.id);
  });

  it("400 with a field error when the check symbol fails, before any lookup and without using an attempt", async () => {
    const studio = createStudio();
    const { code } = createPiece(studio);
    const user = await verifiedUser();
    const ip = freshIp();
    for (let i = 0; i < rateLimits.codeAccount.points + 2; i++) {
      const r = await post(user, ip, { code: withWrongCheck(code) });
      expect(r.status).toBe(400);
      expect(r.body.error?.fieldErrors?.code).toEqual([CODE_TYPO_MESSAGE]);
    }
    // Typos cost nothing: the real code still registers from the same account and IP.
    expect((await post(user, ip, { code })).status).toBe(201);
  });

  it("400 for a body without a code, for a non-JSON body, and for a code of the wrong length", async () => {
    const user = await verifiedUser();
    expect((await post(user, freshIp(), {})).status).toBe(400);
    expect((await post(user, freshIp(), "not json")).status).toBe(400);
    const short = await post(user, freshIp(), { code: "ABCD-EFGH" });
    expect(short.status).toBe(400);
    expect(short.body.error?.fieldErrors?.code?.[0]).toMatch(/13 symbols/);
  });

  it("404 for a well-formed code no piece carries", async () => {
    const r = await post(await verifiedUser(), freshIp(), { code: generateRegistrationCode() });
    expect(r.status).toBe(404);
    expect(r.body.error?.message).toMatch(/don't know that code/);
  });

  it("409 when the piece is already registered, with how to ask for a transfer", async () => {
    const studio = createStudio({ name: "Transfer Test Studio (invented)", email: "desk@transfer-test.example" });
    const { code } = createPiece(studio);
    const first = await verifiedUser();
    expect((await post(first, freshIp(), { code })).status).toBe(201);
    const second = await post(await verifiedUser(), freshIp(), { code });
    expect(second.status).toBe(409);
    expect(second.body.error?.message).toMatch(/release it/);
    expect(second.body.error?.message).toContain("Transfer Test Studio (invented)");
    // The owner trying again hears it is already theirs.
    const again = await post(first, freshIp(), { code });
    expect(again.status).toBe(409);
    expect(again.body.error?.message).toMatch(/already registered to you/);
  });

  it("403 until the e-mail address is confirmed", async () => {
    const { code } = createPiece(createStudio());
    const unverified = await createUser();
    expect((await post(unverified, freshIp(), { code })).status).toBe(403);
  });

  it("429 with Retry-After once the account has used its attempts", async () => {
    const user = await verifiedUser();
    const statuses: number[] = [];
    let last: Response | undefined;
    for (let i = 0; i < rateLimits.codeAccount.points + 1; i++) {
      const r = await post(user, freshIp(), { code: generateRegistrationCode() });
      statuses.push(r.status);
      last = r.res;
    }
    expect(statuses.slice(0, rateLimits.codeAccount.points).every((s) => s === 404)).toBe(true);
    expect(statuses.at(-1)).toBe(429);
    expect(Number(last!.headers.get("Retry-After"))).toBeGreaterThan(0);
  });

  it("429 once one IP has used its attempts, across accounts", async () => {
    const ip = freshIp();
    // A new account for every attempt, so only the IP bucket can run out (made first: the window is short in tests).
    const users = await Promise.all(Array.from({ length: rateLimits.codeIp.points + 1 }, () => verifiedUser()));
    const statuses: number[] = [];
    for (const user of users) statuses.push((await post(user, ip, { code: generateRegistrationCode() })).status);
    expect(statuses.at(-1)).toBe(429);
    expect(statuses.filter((s) => s === 404)).toHaveLength(rateLimits.codeIp.points);
  });

  it("exactly one of many simultaneous registrations of one code wins", async () => {
    const { piece, code } = createPiece(createStudio());
    const users = await Promise.all(Array.from({ length: 8 }, () => verifiedUser()));
    const results = await Promise.all(users.map((u) => post(u, freshIp(), { code })));
    const statuses = results.map((r) => r.status).sort();
    expect(statuses.filter((s) => s === 201)).toHaveLength(1);
    expect(statuses.filter((s) => s === 409)).toHaveLength(7);
    const winner = users[results.findIndex((r) => r.status === 201)]!;
    expect(getDb().select().from(pieces).where(eq(pieces.id, piece.id)).get()!.ownerId).toBe(winner.id);
    expect(getDb().select().from(ownerships).where(eq(ownerships.pieceId, piece.id)).all()).toHaveLength(1);
  });
});

describe("drawer-card landing lookup", () => {
  it("shows only the studio, title, kind and delivery month, and says whose it is", async () => {
    const studio = createStudio({ name: "Landing Studio (invented)" });
    const { piece, code } = createPiece(studio, { title: "Landing table (invented)", deliveredOn: "2025-11-20", deliveryAddress: "1 Secret Way", internalNotes: "private" });
    const anon = await lookupCard(code.toLowerCase(), freshIp(), null);
    expect(anon.state).toBe("available");
    expect(anon).toMatchObject({ card: { studioName: "Landing Studio (invented)", title: "Landing table (invented)", kindLabel: "Dining table", deliveredMonth: "November 2025" }, pieceId: null });
    expect(JSON.stringify(anon)).not.toMatch(/Secret Way|private|2025-11-20/);

    const owner = await verifiedUser();
    await registerPiece(owner, { code }, freshIp());
    expect((await lookupCard(code, freshIp(), owner)).state).toBe("yours");
    expect(await lookupCard(code, freshIp(), owner)).toMatchObject({ pieceId: piece.id });
    const stranger = await lookupCard(code, freshIp(), await verifiedUser());
    expect(stranger).toMatchObject({ state: "registered", pieceId: null });
  });

  it("registering and releasing keep the registry's owner search up to date", async () => {
    const studio = createStudio();
    const { piece, code } = createPiece(studio);
    const owner = await verifiedUser();
    getDb().update(users).set({ name: "Marisol Quenby (invented)" }).where(eq(users.id, owner.id)).run();
    await registerPiece(owner, { code }, freshIp());
    const ownerText = () => (getDb().$client.prepare("SELECT owner FROM pieces_fts WHERE piece_id = ?").get(piece.id) as { owner: string } | undefined)?.owner ?? "";
    expect(ownerText()).toContain("Marisol Quenby");
    const full = getDb().select().from(users).where(eq(users.id, owner.id)).get()!;
    await releasePiece(full, piece.id, { confirm: true });
    expect(ownerText()).not.toContain("Marisol Quenby");
  });

  it("tells a typo from an unknown code, and rate-limits misses per IP", async () => {
    const { code } = createPiece(createStudio());
    expect((await lookupCard(withWrongCheck(code), freshIp(), null)).state).toBe("typo");
    expect((await lookupCard("hello", freshIp(), null)).state).toBe("malformed");
    const ip = freshIp();
    const states: string[] = [];
    for (let i = 0; i < rateLimits.codeIp.points + 1; i++) states.push((await lookupCard(generateRegistrationCode(), ip, null)).state);
    expect(states.slice(0, -1).every((s) => s === "unknown")).toBe(true);
    expect(states.at(-1)).toBe("rate_limited");
    // Hits cost nothing.
    expect((await lookupCard(code, ip, null)).state).toBe("available");
  });
});

describe("the studio's view of the card's code (staff piece page)", () => {
  it("shows the current code; after a release it says the old card's code is dead until someone registers with the new one", async () => {
    const { cardCodeStatus } = await import("@/lib/pieces/card-status");
    const { memberContext } = await import("../support/fixtures");
    const studio = createStudio({ name: "Code Desk (invented)" });
    const staff = await memberContext(studio, "staff");
    const { piece, code } = createPiece(studio, { title: `Code desk table ${unique("t")}` });
    expect(cardCodeStatus(staff, piece.id)).toEqual({ code, releasedAt: null });

    const first = await verifiedUser();
    await registerPiece(first, { code }, freshIp());
    expect(cardCodeStatus(staff, piece.id)).toEqual({ code, releasedAt: null });

    const releasedAt = new Date("2026-06-01T10:00:00Z");
    const { code: fresh } = await releasePiece({ ...first, timeZone: "UTC", unitSystem: "metric" }, piece.id, { confirm: true }, releasedAt);
    expect(fresh).not.toBe(code);
    expect(cardCodeStatus(staff, piece.id)).toEqual({ code: fresh, releasedAt });
    expect((await lookupCard(code, freshIp(), null)).state).toBe("unknown");

    const second = await verifiedUser();
    await registerPiece(second, { code: fresh }, freshIp());
    expect(cardCodeStatus(staff, piece.id)).toEqual({ code: fresh, releasedAt: null });

    // Another studio's staff: a 404, no code.
    const stranger = await memberContext(createStudio(), "staff");
    expect(() => cardCodeStatus(stranger, piece.id)).toThrow(expect.objectContaining({ status: 404 }));
  });
});
