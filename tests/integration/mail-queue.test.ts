// Mail SMTP refuses is kept and tried again: a real SMTP sink that is stopped and started again on the
// same port, a real SQLite file. This file runs its own sink, so it sets SMTP_PORT before lib/env is
// first imported (vi.hoisted runs ahead of the imports). All addresses invented.
import { afterAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { SmtpSink } from "@/lib/fakes/smtp-sink";

const started = await vi.hoisted(async () => {
  const { startSmtpSink } = await import("@/lib/fakes/smtp-sink");
  const sink = await startSmtpSink();
  process.env.SMTP_PORT = String(sink.smtpPort);
  return sink;
});

const { eq } = await import("drizzle-orm");
const { createElement } = await import("react");
const { getDb } = await import("@/db/client");
const { mailQueue } = await import("@/db/schema");
const { startSmtpSink } = await import("@/lib/fakes/smtp-sink");
const { MAIL_MAX_ATTEMPTS, MAIL_RETRY_BACKOFF_MIN, retryQueuedMail, sendMail, sendMailNow } = await import("@/lib/mail");
const { requestPasswordReset, resetPassword } = await import("@/lib/auth/accounts");
const { settleAfterAnswer } = await import("@/lib/auth/after-answer");
const { ownDatabaseFile } = await import("./reminders-helpers");
const { createUser } = await import("../support/fixtures");

ownDatabaseFile("mail-queue");
const port = Number(process.env.SMTP_PORT);
let sink: SmtpSink | undefined = started;
const up = async () => (sink ??= await startSmtpSink({ smtpPort: port }));
const down = async () => {
  await sink?.close();
  sink = undefined;
};
afterAll(down);
beforeEach(() => {
  getDb().delete(mailQueue).run();
});

const queued = () => getDb().select().from(mailQueue).all();
const note = (subject: string, extra: Partial<Parameters<typeof sendMail>[0]> = {}) => ({ to: "someone@owners.example", subject, email: createElement("p", null, `Body of ${subject}`), ...extra });

describe("mail to a deleted account", () => {
  // A deleted account's address is on the reserved ".invalid" domain (RFC 2606, section 2;
  // lib/owner/account-delete.ts). Mail for it is dropped: not handed to SMTP, not queued for retries.
  it("is not sent or queued, and the other recipients of the same message still get it", async () => {
    const s = await up();
    s.clear();
    const dead = "deleted-0b7e@deleted.invalid";
    expect(await sendMail(note("To a deleted account", { to: dead }))).toEqual({ messageId: null, queued: false });
    expect(queued()).toEqual([]);
    expect(s.messages()).toEqual([]);

    const sent = await sendMail(note("To a studio and a deleted account", { to: ["studio@larchmere.example", dead] }));
    expect(sent.queued).toBe(false);
    expect(s.messages().map((m) => m.to)).toEqual([["studio@larchmere.example"]]);
    expect(queued()).toEqual([]);
  });
});

describe("mail SMTP refuses", () => {
  it("a password reset asked for while SMTP is down is kept, goes out once SMTP is back, and its link works", async () => {
    const user = await createUser({ email: `reset-${Date.now()}@owners.example`, name: "Queue Owner (invented)" });
    await down();
    const t0 = Date.now();
    await expect(requestPasswordReset({ email: user.email }, "10.0.0.1")).resolves.toBeUndefined();
    await settleAfterAnswer(); // the link and its mail are made after the answer has gone
    const [row] = queued();
    expect(row).toMatchObject({ status: "waiting", attempts: 1, to: [user.email], subject: "Reset your Grainward password" });
    expect(row!.lastError).toMatch(/^try 1: .*ECONNREFUSED/);
    expect(row!.nextAttemptAt!.getTime() - t0).toBeGreaterThanOrEqual(MAIL_RETRY_BACKOFF_MIN[0] * 60_000 - 50);

    // The senders with their own ledger get the failure and nothing is queued for them.
    await expect(sendMailNow(note("Ledger-kept message"))).rejects.toThrow(/ECONNREFUSED/);
    expect(queued()).toHaveLength(1);

    // Not due yet: nothing is tried.
    expect(await retryQueuedMail({ now: new Date(t0 + 30_000) })).toEqual({ sent: 0, failed: 0, gaveUp: 0, stale: 0 });
    const s = await up();
    const due = new Date(row!.nextAttemptAt!.getTime() + 1);
    expect((await retryQueuedMail({ now: due })).sent).toBe(1);
    expect((await retryQueuedMail({ now: new Date(due.getTime() + 3_600_000) })).sent).toBe(0);
    const got = s.messages().filter((m) => m.to.includes(user.email));
    expect(got).toHaveLength(1);
    expect(got[0]!.subject).toBe("Reset your Grainward password");
    expect(queued()[0]).toMatchObject({ status: "sent", attempts: 2, messageId: expect.stringMatching(/@/) as string });
    const token = decodeURIComponent(/reset-password\?token=([^\s"&<>)]+)/.exec(got[0]!.text)![1]!);
    await expect(resetPassword({ token, password: "a new long passphrase", confirm: "a new long passphrase" })).resolves.not.toThrow();
  });

  it("keeps attachments byte for byte, and headers, through the queue", async () => {
    await down();
    const ics = "BEGIN:VCALENDAR\r\nVERSION:2.0\r\nPRODID:-//Grainward test//EN\r\nMETHOD:REQUEST\r\nSUMMARY:Visit – ünïcode\r\nEND:VCALENDAR\r\n";
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 255, 7]);
    const r = await sendMail(
      note("With attachments", {
        headers: { "X-Grainward-Test": "kept" },
        attachments: [
          { filename: "invite.ics", content: ics, contentType: "text/calendar; charset=utf-8; method=REQUEST" },
          { filename: "dot.png", content: png, contentType: "image/png" },
        ],
      }),
    );
    expect(r).toEqual({ messageId: null, queued: true });
    const s = await up();
    expect((await retryQueuedMail({ now: new Date(Date.now() + 61_000) })).sent).toBe(1);
    const m = s.messages().find((x) => x.subject === "With attachments")!;
    expect(m.headers["x-grainward-test"]).toBe("kept");
    expect(m.text).toContain("Body of With attachments");
    const byName = Object.fromEntries(m.attachments.map((a) => [a.filename, a]));
    expect(Buffer.from(byName["invite.ics"]!.contentBase64, "base64").toString("utf8")).toBe(ics);
    expect(byName["invite.ics"]!.contentType).toMatch(/^text\/calendar/);
    expect(Buffer.from(byName["dot.png"]!.contentBase64, "base64").equals(png)).toBe(true);
  });

  it("gives up after the last try, about a day later", async () => {
    await down();
    const t0 = Date.now();
    await sendMail(note("Never delivered"));
    let at = t0;
    for (let attempt = 2; attempt <= MAIL_MAX_ATTEMPTS; attempt++) {
      at = queued()[0]!.nextAttemptAt!.getTime();
      const r = await retryQueuedMail({ now: new Date(at) });
      expect(r.sent).toBe(0);
      expect(attempt === MAIL_MAX_ATTEMPTS ? r.gaveUp : r.failed).toBe(1);
    }
    const [row] = queued();
    expect(row).toMatchObject({ status: "gave_up", attempts: MAIL_MAX_ATTEMPTS, nextAttemptAt: null });
    expect(row!.lastError).toMatch(new RegExp(`^try ${MAIL_MAX_ATTEMPTS}: `));
    // The back-off adds up to the sum of its steps (1 + 5 + 15 + 60 + 240 + 720 minutes ≈ 17 h).
    expect(at - t0).toBeGreaterThanOrEqual((MAIL_RETRY_BACKOFF_MIN.slice(0, -1).reduce((a, b) => a + b, 0)) * 60_000);
    expect((await retryQueuedMail({ now: new Date(at + 7 * 86_400_000) })).failed).toBe(0);
  });

  it("two retry runs at once send each message once; a try cut off mid-send is taken up again", async () => {
    await down();
    for (let i = 0; i < 5; i++) await sendMail(note(`Parallel ${i}`));
    const s = await up();
    const now = new Date(Date.now() + 61_000);
    const [a, b] = await Promise.all([retryQueuedMail({ now }), retryQueuedMail({ now })]);
    expect(a.sent + b.sent).toBe(5);
    expect(s.messages().filter((m) => m.subject.startsWith("Parallel ")).map((m) => m.subject).sort()).toEqual([0, 1, 2, 3, 4].map((i) => `Parallel ${i}`));

    // A process died while handing one to SMTP: 15 minutes on, the next run takes it up again.
    await down();
    await sendMail(note("Cut off"));
    const id = queued().find((r) => r.subject === "Cut off")!.id;
    const cutAt = Date.now() + 61_000;
    getDb().update(mailQueue).set({ status: "sending", updatedAt: new Date(cutAt) }).where(eq(mailQueue.id, id)).run();
    const s2 = await up();
    expect(await retryQueuedMail({ now: new Date(cutAt + 60_000) })).toEqual({ sent: 0, failed: 0, gaveUp: 0, stale: 0 });
    expect(await retryQueuedMail({ now: new Date(cutAt + 16 * 60_000) })).toEqual({ sent: 1, failed: 0, gaveUp: 0, stale: 1 });
    expect(s2.messages().filter((m) => m.subject === "Cut off")).toHaveLength(1);
  });
});
