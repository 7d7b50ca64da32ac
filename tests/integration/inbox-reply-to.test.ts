// Every mail an owner may answer carries a Reply-To that brings their answer back to the right place:
// for each kind of mail, the message as the real SMTP sink holds it is read, its Reply-To taken, and
// the owner's answer sent over SMTP to the inbound listener; the answer must land in the thread of
// the claim, job or visit the mail was about (the hand-over mail, which belongs to no thread, carries
// the studio's own address, and the listener keeps the answer for that studio). All data is invented.
import { and, eq } from "drizzle-orm";
import nodemailer from "nodemailer";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getDb } from "@/db/client";
import { payments, repairJobs, threadMessages, unmatchedMail, warrantyPolicies } from "@/db/schema";
import { mailClaimDecision } from "@/lib/claims/mail";
import { DEFAULT_WARRANTY_POLICY } from "@/lib/care/coverage";
import { startInboundListener, type InboundListener } from "@/lib/mail/inbound";
import { findThread, type SubjectRef } from "@/lib/messages/store";
import { deliverPiece } from "@/lib/pieces/handover-delivery";
import { createJob } from "@/lib/repairs/jobs";
import { mailAutomaticRefund, mailReceipt, mailRefundIssued } from "@/lib/repairs/mail";
import { sendQuote } from "@/lib/repairs/payment";
import { deliverPieceSchema } from "@/lib/validation/clients";
import { loadVisitMailView, sendVisitReminder } from "@/lib/visits/mail";
import { bookVisit } from "@/lib/visits/book";
import { listJobSlots } from "@/lib/visits/slots";
import { submitReport } from "@/lib/visits/report";
import { createAcceptedClaim, createPiece, createStudio, createUser, memberContext, unique } from "../support/fixtures";
import { waitForMail } from "../support/mail";
import { claimWorld } from "./claims-helpers";
import { ownerActor, reportInput, visitWorld } from "./visits-helpers";

let listener: InboundListener;
beforeAll(async () => {
  listener = await startInboundListener({ port: 0 });
});
afterAll(async () => {
  await listener?.close();
});

async function answer(from: string, to: string, text: string) {
  const transport = nodemailer.createTransport({ host: "127.0.0.1", port: listener.port, secure: false, ignoreTLS: true });
  try {
    await transport.sendMail({ from, to, subject: "Re: (invented)", text, messageId: `<${unique("answer")}@owner-mail.test.example>` });
  } finally {
    transport.close();
  }
}

/** A repair job on an owner's piece, from an accepted claim. */
async function jobWorld() {
  const studio = createStudio({ email: `${unique("studio")}@test.example`, currency: "USD", labourRateMinor: 8500, travelFeeMinor: 4500 });
  const staff = await memberContext(studio, "staff");
  const owner = await createUser({ name: "Test Owner (invented)" });
  const { piece } = createPiece(studio, { ownerId: owner.id });
  const claim = createAcceptedClaim(studio, piece.id, owner.id, "chargeable");
  const job = createJob(staff, "claim", claim.id);
  return { studio, staff, owner, piece, job };
}

function paidPayment(w: Awaited<ReturnType<typeof jobWorld>>) {
  getDb().update(repairJobs).set({ state: "paid", paidAt: new Date(), quoteVersion: 1 }).where(eq(repairJobs.id, w.job.id)).run();
  return getDb()
    .insert(payments)
    .values({ studioId: w.studio.id, jobId: w.job.id, quoteVersion: 1, checkoutSessionId: unique("cs_test"), amountMinor: 13000, currency: "USD", status: "paid", paymentIntentId: unique("pi_test"), paidAt: new Date() })
    .returning()
    .get();
}

type Case = {
  kind: string;
  /** Sends the mail; returns who got it, its subject, and where the answer must land. */
  send: () => Promise<{ to: string; subject: RegExp; lands: SubjectRef | { studioId: string } }>;
};

const NOW = Date.parse("2027-05-03T12:00:00Z"); // a Monday, as in visits.test.ts

async function bookedVisit() {
  const w = await visitWorld();
  const slot = listJobSlots(ownerActor(w.owner), w.job.id, { from: "2027-05-05T00:00:00Z", to: "2027-05-08T00:00:00Z" }, NOW).slots[0]!;
  const visit = await bookVisit(ownerActor(w.owner), { jobId: w.job.id, technicianId: slot.technicianId, start: slot.start }, NOW);
  return { ...w, visit, slot };
}

const CASES: Case[] = [
  {
    kind: "quote",
    send: async () => {
      const w = await jobWorld();
      await sendQuote(w.staff, w.job.id);
      return { to: w.owner.email, subject: /quote|covered/i, lands: { kind: "job", id: w.job.id } };
    },
  },
  {
    kind: "payment receipt",
    send: async () => {
      const w = await jobWorld();
      await mailReceipt(paidPayment(w).id);
      return { to: w.owner.email, subject: /^Receipt from/, lands: { kind: "job", id: w.job.id } };
    },
  },
  {
    kind: "refund",
    send: async () => {
      const w = await jobWorld();
      await mailRefundIssued(paidPayment(w), 13000);
      return { to: w.owner.email, subject: /^Refund from/, lands: { kind: "job", id: w.job.id } };
    },
  },
  {
    kind: "automatic refund",
    send: async () => {
      const w = await jobWorld();
      await mailAutomaticRefund(paidPayment(w), "already_paid");
      return { to: w.owner.email, subject: /refund/i, lands: { kind: "job", id: w.job.id } };
    },
  },
  {
    kind: "visit invite",
    send: async () => {
      const w = await bookedVisit();
      return { to: w.owner.email, subject: /^Visit booked/, lands: { kind: "visit", id: w.visit.id } };
    },
  },
  {
    kind: "visit reminder",
    send: async () => {
      const w = await bookedVisit();
      await sendVisitReminder(loadVisitMailView(w.visit.id)!, Date.parse(w.slot.start) - 20 * 3_600_000);
      return { to: w.owner.email, subject: /your visit/, lands: { kind: "visit", id: w.visit.id } };
    },
  },
  {
    kind: "visit summary",
    send: async () => {
      const w = await bookedVisit();
      await submitReport(w.tech, w.visit.id, reportInput({ work: "Re-oiled the top (invented).", layers: [] }), new Date(Date.parse(w.slot.start) + 3_600_000));
      return { to: w.owner.email, subject: /^Visit report/, lands: { kind: "visit", id: w.visit.id } };
    },
  },
  {
    kind: "claim decision",
    send: async () => {
      const w = await claimWorld();
      const claim = createAcceptedClaim(w.studio, w.piece.id, w.owner.id, "partly_covered", 40);
      await mailClaimDecision({ claim, piece: w.piece, studio: w.studio, owner: w.owner });
      return { to: w.owner.email, subject: /./, lands: { kind: "claim", id: claim.id } };
    },
  },
  {
    kind: "hand-over (no thread: the studio's own address)",
    send: async () => {
      const studio = createStudio({ name: "Reply Bench Works (invented)", timeZone: "UTC", email: `${unique("bench")}@test.example` });
      getDb().insert(warrantyPolicies).values({ studioId: studio.id, version: 1, effectiveFrom: "2024-01-01", policy: DEFAULT_WARRANTY_POLICY }).run();
      const staff = await memberContext(studio, "staff");
      const email = `${unique("buyer")}@test.example`;
      await deliverPiece(
        staff,
        deliverPieceSchema.parse({
          kind: "dining_table",
          title: `Oak table ${unique("t")} (invented)`,
          shapeKind: "rectangle",
          lengthMm: 1800,
          widthMm: 900,
          primarySpeciesId: "white_oak",
          use: "heavy",
          deliveredOn: "2026-11-19",
          layers: [{ surface: "top", finishClass: "hardwax_oil", coats: 2, appliedOn: "2026-11-17" }],
          buyer: "new",
          buyerName: "Test Buyer (invented)",
          buyerEmail: email,
          buyerServiceMail: true,
        }),
        new Date("2026-11-20T18:00:00Z"),
      );
      return { to: email, subject: /its care and warranty/, lands: { studioId: studio.id } };
    },
  },
];

describe("the Reply-To of every mail an owner may answer", () => {
  it.each(CASES)("$kind: the answer lands where the mail was about", async ({ send }) => {
    const since = new Date();
    const { to, subject, lands } = await send();
    const mail = await waitForMail({ to, since, subject });
    const replyTo = mail.headers["reply-to"];
    expect(replyTo, "the mail has a Reply-To").toBeTruthy();
    const address = /<([^>]+)>/.exec(replyTo!)?.[1] ?? replyTo!.trim();
    const body = `Answer to the ${subject.source} mail (invented) ${unique("n")}`;
    await answer(to, address, body);
    if ("studioId" in lands) {
      const kept = getDb().select().from(unmatchedMail).where(and(eq(unmatchedMail.studioId, lands.studioId), eq(unmatchedMail.body, body))).all();
      expect(kept).toHaveLength(1);
      return;
    }
    const thread = findThread(getDb(), lands);
    expect(thread, `a thread for the ${lands.kind}`).toBeDefined();
    const bodies = getDb().select({ body: threadMessages.body, source: threadMessages.source }).from(threadMessages).where(eq(threadMessages.threadId, thread!.id)).all();
    expect(bodies).toContainEqual({ body, source: "email" });
    expect(getDb().select().from(unmatchedMail).where(eq(unmatchedMail.body, body)).all()).toHaveLength(0);
  });
});
