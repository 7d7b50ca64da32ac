// The hand-over mail: a piece recorded at delivery with a new buyer sends them the mail (what they
// bought, its finish, first care, cure time, cautions, warranty, a one-tap link); signing up with that
// address and confirming links account and client; the link registers the piece. Resend replaces the
// link; no consent or no e-mail sends nothing. Real SQLite file, real SMTP sink.
import { and, eq } from "drizzle-orm";
import { describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { auditLog, clientConsents, clients, pieceHandovers, pieces, users, warrantyPolicies, type Studio } from "@/db/schema";
import { signUp, verifyEmail } from "@/lib/auth/accounts";
import { settleAfterAnswer } from "@/lib/auth/after-answer";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { createClient } from "@/lib/clients/create";
import { AppError } from "@/lib/errors";
import { handoverStatus, openHandover, registerByHandover, sendHandover } from "@/lib/pieces/handover";
import { deliverPiece } from "@/lib/pieces/handover-delivery";
import { createClientSchema, deliverPieceSchema, type DeliverPieceInput } from "@/lib/validation/clients";
import { createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { extractLinks, listMail, waitForMail } from "../support/mail";

// Delivered the day before; the layer applied two days before delivery, so it is still curing.
const NOW = new Date("2026-11-20T18:00:00Z");
let ipSeq = 0;
const freshIp = () => `10.19.${(++ipSeq >> 8) & 255}.${ipSeq & 255}`;

async function world() {
  const studio = createStudio({ name: "Harrow Bench Works (invented)", timeZone: "America/Los_Angeles", country: "US", email: "hello@harrow.example" });
  getDb().insert(warrantyPolicies).values({ studioId: studio.id, version: 1, effectiveFrom: "2024-01-01", policy: DEFAULT_WARRANTY_POLICY }).run();
  const staff = await memberContext(studio, "staff");
  return { studio, staff };
}

function pieceInput(over: Partial<DeliverPieceInput> = {}): DeliverPieceInput {
  return {
    kind: "dining_table",
    title: `Walnut trestle table ${unique("t")} (invented)`,
    shapeKind: "rectangle",
    lengthMm: 2000,
    widthMm: 900,
    primarySpeciesId: "black_walnut",
    use: "heavy",
    deliveredOn: "2026-11-19",
    deliveryAddress: "4 Ferry Row, Port Alder (invented)",
    layers: [{ surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2026-11-17", productLabel: "Shoreline oil (invented)" }],
    ...over,
  } as DeliverPieceInput;
}

const deliver = (ctx: Awaited<ReturnType<typeof world>>["staff"], over: Partial<DeliverPieceInput>) => deliverPiece(ctx, deliverPieceSchema.parse(pieceInput(over)), NOW);
const tokenOf = (link: string) => new URL(link).pathname.split("/").pop()!;

async function handoverMail(to: string, since?: Date) {
  const mail = await waitForMail({ to, subject: /its care and warranty/, since });
  const link = extractLinks(mail.text).find((l) => l.includes("/hand-over/"));
  expect(link).toBeDefined();
  return { mail, token: tokenOf(link!) };
}

async function expectAppError(p: Promise<unknown> | (() => unknown), status: number): Promise<AppError> {
  let caught: unknown;
  try {
    await (typeof p === "function" ? p() : p);
  } catch (e) {
    caught = e;
  }
  expect(caught).toBeInstanceOf(AppError);
  expect((caught as AppError).status).toBe(status);
  return caught as AppError;
}

describe("delivery with a new buyer → hand-over mail → one-tap registration", () => {
  it("creates the client, mails them, links their new account, and the link registers the piece", async () => {
    const { staff } = await world();
    const email = `${unique("maren")}@test.example`;
    const out = await deliver(staff, { buyer: "new", buyerName: "Maren Tallis (invented)", buyerEmail: email, buyerPhone: "(415) 555-0148", buyerServiceMail: true });

    // The buyer is a client of the studio, with the phone in E.164, the delivery address, and consent recorded.
    const client = getDb().select().from(clients).where(eq(clients.id, out.clientId!)).get()!;
    expect(client).toMatchObject({ studioId: staff.studio.id, name: "Maren Tallis (invented)", email, phone: "+14155550148", address: "4 Ferry Row, Port Alder (invented)", consentService: true, userId: null });
    expect(getDb().select().from(clientConsents).where(eq(clientConsents.clientId, client.id)).all()).toEqual([expect.objectContaining({ kind: "service", granted: true, source: "in_person" })]);
    expect(getDb().select({ clientId: pieces.clientId }).from(pieces).where(eq(pieces.id, out.piece.id)).get()!.clientId).toBe(client.id);
    expect(out.handover).toEqual({ sent: true, reason: null });

    // The mail: what they bought, the finish, first care dates, cure time, cautions, warranty, the link.
    const { mail, token } = await handoverMail(email);
    expect(mail.subject).toBe(`Your ${out.piece.title} from Harrow Bench Works (invented): its care and warranty`);
    expect(mail.text).toContain(out.piece.title);
    expect(mail.text).toContain("Top: hardwax oil (Shoreline oil (invented)), 2 coats, applied 17 November 2026");
    expect(mail.text).toMatch(/First care[\s\S]*due \d+ \w+ 20\d\d/);
    // Hardwax oil without a catalogue product: the class default of lib/care/cure.ts (24 h light use,
    // 14 days full use; common practice, no published source) from 17 November 2026.
    expect(mail.text).toContain("full use (children, heavy dishes, wiping with water) from 1 December 2026");
    expect(mail.text).toMatch(/oily rags/i);
    expect(mail.text).toMatch(/Warranty[\s\S]*months, until/);
    expect(mail.text).not.toContain(out.registrationCode); // no code to type: the link carries it
    const sent = getDb().select().from(pieceHandovers).where(eq(pieceHandovers.pieceId, out.piece.id)).get()!;
    expect(sent).toMatchObject({ clientId: client.id, email, sendCount: 1, openedAt: null, registeredAt: null });
    expect(sent.tokenHash).not.toContain(token); // only the hash is stored

    // Opening the link records it once and registers nothing.
    expect(openHandover(token, null, NOW)).toMatchObject({ state: "available", email, title: out.piece.title });
    expect(handoverStatus(staff, out.piece.id).openedAt).toBe(NOW.toISOString());
    openHandover(token, null, new Date(NOW.getTime() + 60_000));
    expect(handoverStatus(staff, out.piece.id).openedAt).toBe(NOW.toISOString());

    // Sign-up with that address, confirm: the account and the client are linked.
    const next = `/hand-over/${token}`;
    await signUp({ name: "Maren Tallis", email, password: "a long enough password", next }, freshIp());
    await settleAfterAnswer();
    const verify = await waitForMail({ to: email, subject: /confirm your e-mail/i });
    const verifyLink = extractLinks(verify.text).find((l) => l.includes("/verify-email?"))!;
    expect(new URL(verifyLink).searchParams.get("next")).toBe(next);
    const userId = verifyEmail(new URL(verifyLink).searchParams.get("token")!)!;
    expect(getDb().select({ userId: clients.userId }).from(clients).where(eq(clients.id, client.id)).get()!.userId).toBe(userId);
    const user = getDb().select().from(users).where(eq(users.id, userId)).get()!;

    // One tap registers the piece; the client stays the same record (nothing duplicated).
    await expect(registerByHandover(user, token, freshIp(), NOW)).resolves.toEqual({ pieceId: out.piece.id });
    const piece = getDb().select().from(pieces).where(eq(pieces.id, out.piece.id)).get()!;
    expect(piece.ownerId).toBe(userId);
    expect(piece.clientId).toBe(client.id);
    expect(getDb().select().from(clients).where(eq(clients.studioId, staff.studio.id)).all()).toHaveLength(1);
    const status = handoverStatus(staff, out.piece.id);
    expect(status).toMatchObject({ sendCount: 1, registeredAt: NOW.toISOString(), block: "registered" });
    // Single use; the page now says it's theirs.
    await expectAppError(registerByHandover(user, token, freshIp(), NOW), 409);
    expect(openHandover(token, { id: userId }, NOW)).toMatchObject({ state: "yours", pieceId: out.piece.id });
    // Staff can't send it again once the piece is registered.
    await expectAppError(sendHandover(staff, out.piece.id, NOW), 409);
  });

  it("refuses another account, an unconfirmed one, and a link that has expired", async () => {
    const { staff } = await world();
    const email = `${unique("ines")}@test.example`;
    const out = await deliver(staff, { buyer: "new", buyerName: "Ines Varga (invented)", buyerEmail: email, buyerServiceMail: true });
    const { token } = await handoverMail(email);
    const other = await createUser({ emailVerifiedAt: NOW });
    const e = await expectAppError(registerByHandover(other, token, freshIp(), NOW), 403);
    expect(e.message).toContain(email);
    const unconfirmed = await createUser({ email });
    await expectAppError(registerByHandover(unconfirmed, token, freshIp(), NOW), 403);
    const later = new Date(NOW.getTime() + 91 * 24 * 3600 * 1000);
    expect(openHandover(token, null, later).state).toBe("expired");
    getDb().update(users).set({ emailVerifiedAt: NOW }).where(eq(users.id, unconfirmed.id)).run();
    await expectAppError(registerByHandover({ ...unconfirmed, emailVerifiedAt: NOW }, token, freshIp(), later), 409);
    expect(getDb().select({ ownerId: pieces.ownerId }).from(pieces).where(eq(pieces.id, out.piece.id)).get()!.ownerId).toBeNull();
    // Within its time it works for the right, confirmed account.
    await expect(registerByHandover({ ...unconfirmed, emailVerifiedAt: NOW }, token, freshIp(), NOW)).resolves.toEqual({ pieceId: out.piece.id });
  });
});

describe("resend, consent and the buyer picker", () => {
  it("resends with a fresh link: the old link stops working, the count and times are kept", async () => {
    const { staff } = await world();
    const email = `${unique("olu")}@test.example`;
    const c = createClient(staff, createClientSchema.parse({ name: "Olu Brandt (invented)", email, consent: { service: { granted: true, source: "paper" } } }), NOW);
    const out = await deliver(staff, { buyer: "existing", buyerClientId: c.id });
    expect(out.clientId).toBe(c.id);
    const first = await handoverMail(email);
    const later = new Date(NOW.getTime() + 3600_000);
    const before = new Date();
    const status = await sendHandover(staff, out.piece.id, later);
    expect(status).toMatchObject({ sendCount: 2, firstSentAt: NOW.toISOString(), lastSentAt: later.toISOString(), block: null });
    const second = await handoverMail(email, before);
    expect(second.token).not.toBe(first.token);
    expect(openHandover(first.token, null, later).state).toBe("unknown");
    expect(openHandover(second.token, null, later).state).toBe("available");
    const actions = getDb().select({ action: auditLog.action }).from(auditLog).where(and(eq(auditLog.subjectType, "piece"), eq(auditLog.subjectId, out.piece.id))).all().map((a) => a.action);
    expect(actions).toEqual(expect.arrayContaining(["piece.created", "piece.handover_sent", "piece.handover_resent"]));
  });

  it("sends nothing without consent to service mail or without an e-mail, and says why", async () => {
    const { staff } = await world();
    const email = `${unique("noconsent")}@test.example`;
    const out = await deliver(staff, { buyer: "new", buyerName: "Pia Lund (invented)", buyerEmail: email, buyerServiceMail: false });
    expect(out.handover.sent).toBe(false);
    expect(out.handover.reason).toMatch(/hasn't agreed to service mail/);
    await expectAppError(sendHandover(staff, out.piece.id, NOW), 422);
    expect(handoverStatus(staff, out.piece.id)).toMatchObject({ block: "no_consent", sendCount: 0 });
    const noMail = await deliver(staff, { buyer: "new", buyerName: "No Mail Person (invented)", buyerServiceMail: true });
    expect(noMail.handover).toMatchObject({ sent: false });
    expect(handoverStatus(staff, noMail.piece.id).block).toBe("no_email");
    // Staff unticking "send" sends nothing either, even with consent.
    const quiet = `${unique("quiet")}@test.example`;
    const q = await deliver(staff, { buyer: "new", buyerName: "Quiet Buyer (invented)", buyerEmail: quiet, buyerServiceMail: true, sendHandover: false });
    expect(q.handover).toEqual({ sent: false, reason: null });
    await settleAfterAnswer();
    await new Promise((r) => setTimeout(r, 300));
    expect(await listMail({ to: email })).toHaveLength(0);
    expect(await listMail({ to: quiet })).toHaveLength(0);
    expect(getDb().select().from(pieceHandovers).where(eq(pieceHandovers.pieceId, out.piece.id)).get()).toBeUndefined();
  });

  it("refuses another studio's client (404), a taken e-mail beside the buyer's field (409), and writes nothing", async () => {
    const { staff } = await world();
    const other: Studio = createStudio();
    const otherStaff = await memberContext(other, "staff");
    const foreign = createClient(otherStaff, createClientSchema.parse({ name: "Elsewhere (invented)" }), NOW);
    const title = `Never saved ${unique("x")}`;
    await expectAppError(deliver(staff, { title, buyer: "existing", buyerClientId: foreign.id }), 404);
    const email = `${unique("taken")}@test.example`;
    createClient(staff, createClientSchema.parse({ name: "Taken Address (invented)", email }), NOW);
    const e = await expectAppError(deliver(staff, { title, buyer: "new", buyerName: "Someone New (invented)", buyerEmail: email }), 409);
    expect(e.fieldErrors?.buyerEmail?.[0]).toMatch(/pick them from your clients/);
    expect(getDb().select().from(pieces).where(eq(pieces.title, title)).all()).toHaveLength(0);
    // The form's schema asks for the choice it needs.
    expect(deliverPieceSchema.safeParse(pieceInput({ buyer: "existing" })).success).toBe(false);
    expect(deliverPieceSchema.safeParse(pieceInput({ buyer: "new" })).success).toBe(false);
  });
});
