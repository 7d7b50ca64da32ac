// The mail path end to end: templates → lib/mail (nodemailer over real SMTP) → the local sink →
// its HTTP read API. The test starts its own sink on free ports.
import { createElement } from "react";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { startSmtpSink, type SmtpSink } from "@/lib/fakes/smtp-sink";
import { PasswordResetEmail, passwordResetSubject } from "@/emails/password-reset";
import { StaffInvitationEmail, staffInvitationSubject } from "@/emails/staff-invitation";
import { VerifyEmail, verifyEmailSubject } from "@/emails/verify-email";
import { clearMail, extractLinks, getMail, listMail, waitForMail } from "@/tests/support/mail";

type MailModule = typeof import("@/lib/mail");

let sink: SmtpSink;
let mail: MailModule;

beforeAll(async () => {
  sink = await startSmtpSink();
  // lib/env parses process.env once, at first import: point it at this sink before importing lib/mail.
  process.env.SMTP_HOST = "127.0.0.1";
  process.env.SMTP_PORT = String(sink.smtpPort);
  process.env.MAIL_SINK_URL = sink.url;
  mail = await import("@/lib/mail");
  const { env } = await import("@/lib/env");
  if (env.SMTP_PORT !== sink.smtpPort) {
    throw new Error(`lib/env was imported before this test set SMTP_PORT (${env.SMTP_PORT} ≠ ${sink.smtpPort})`);
  }
});

afterAll(async () => {
  mail?.closeMailTransport();
  await sink?.close();
});

beforeEach(() => sink.clear());

describe("templates through lib/mail to the sink", () => {
  it("sends the verification e-mail with the link in both parts", async () => {
    const url = "https://grainward.example/verify-email?token=t0k3n&next=%2Fpieces";
    const since = new Date();
    const { messageId } = await mail.sendMail({
      to: "jonah@owners.example",
      subject: verifyEmailSubject,
      email: createElement(VerifyEmail, { name: "Jonah Reyes", url }),
    });

    const m = await waitForMail({ to: "jonah@owners.example", subject: verifyEmailSubject, since });
    expect(m.to).toEqual(["jonah@owners.example"]);
    expect(m.envelope.to).toEqual(["jonah@owners.example"]);
    expect(m.from).toBe("Grainward <no-reply@grainward.example>");
    expect(m.envelope.from).toBe("no-reply@grainward.example");
    expect(m.headers["message-id"]).toBe(messageId);
    expect(m.text.length).toBeGreaterThan(0);
    expect(m.text).toContain("Hi Jonah Reyes");
    // The product's word is "e-mail" (it said "email" here alone).
    expect(m.subject).toBe("Confirm your e-mail address for Grainward");
    expect(m.text.replace(/https?:\/\/\S+/g, "")).not.toMatch(/\bemail\b/i);
    expect(extractLinks(m.text)).toContain(url);
    expect(extractLinks(m.html)).toContain(url);
    expect(m.html).toContain("#0f5e5e");
    expect(m.headers["content-type"]).toMatch(/^multipart\/alternative/);
  });

  it("sends the password reset e-mail: link, 1 hour, single use, safe to ignore", async () => {
    const url = "https://grainward.example/reset-password?token=reset-123";
    await mail.sendMail({
      to: "ines@larchmere.example",
      subject: passwordResetSubject,
      email: createElement(PasswordResetEmail, { name: "Ines Varga", url, expiresInMinutes: 60 }),
    });
    const m = await waitForMail({ to: "ines@larchmere.example", subject: /reset/i });
    expect(m.subject).toBe(passwordResetSubject);
    expect(extractLinks(m.text)).toContain(url);
    expect(extractLinks(m.html)).toContain(url);
    expect(m.text).toContain("expires in 1 hour");
    expect(m.text).toContain("used once");
    expect(m.text).toMatch(/safely ignore/);
  });

  it("sends the staff invitation with studio, inviter, role and expiry", async () => {
    const url = "https://grainward.example/invitations/inv-456";
    const subject = staffInvitationSubject({ studioName: "Larchmere Slab & Resin" });
    await mail.sendMail({
      to: "teo@larchmere.example",
      subject,
      email: createElement(StaffInvitationEmail, {
        studioName: "Larchmere Slab & Resin",
        role: "staff",
        inviterName: "Maren Okafor",
        url,
        expiresInDays: 7,
      }),
    });
    const m = await waitForMail({ to: "teo@larchmere.example", subject });
    expect(m.subject).toBe("You're invited to join Larchmere Slab & Resin on Grainward");
    expect(m.text).toContain("Maren Okafor invited you to join Larchmere Slab & Resin on Grainward as a staff member");
    expect(m.text).toContain("7 days");
    expect(extractLinks(m.text)).toContain(url);
    expect(extractLinks(m.html)).toContain(url);
  });

  it("passes headers, reply-to, attachments and non-ASCII subjects through", async () => {
    const ics = "BEGIN:VCALENDAR\r\nVERSION:2.0\r\nPRODID:-//Grainward//test//EN\r\nMETHOD:REQUEST\r\nEND:VCALENDAR\r\n";
    const subject = "Touch-up visit — Holloway dining table";
    await mail.sendMail({
      to: ["holloway@owners.example", "Jonah Reyes <jonah@owners.example>"],
      subject,
      email: createElement(VerifyEmail, { name: "Holloway household", url: "https://grainward.example/x" }),
      headers: {
        "List-Unsubscribe": "<https://grainward.example/unsubscribe/abc>",
        "List-Unsubscribe-Post": "List-Unsubscribe=One-Click",
      },
      replyTo: "studio@larchmere.example",
      attachments: [{ filename: "visit.ics", content: ics, contentType: "text/calendar; charset=utf-8; method=REQUEST" }],
    });
    const m = await waitForMail({ to: "holloway@owners.example", subject });
    expect(m.to).toEqual(["holloway@owners.example", "jonah@owners.example"]);
    expect(m.headers["list-unsubscribe"]).toBe("<https://grainward.example/unsubscribe/abc>");
    expect(m.headers["list-unsubscribe-post"]).toBe("List-Unsubscribe=One-Click");
    expect(m.headers["reply-to"]).toBe("studio@larchmere.example");
    expect(m.headers["subject"]).toBe(subject);
    expect(m.text.length).toBeGreaterThan(0);
    expect(m.attachments).toHaveLength(1);
    const [att] = m.attachments;
    expect(att?.filename).toBe("visit.ics");
    expect(att?.contentType).toBe("text/calendar");
    expect(Buffer.from(att?.contentBase64 ?? "", "base64").toString("utf8")).toBe(ics);
    expect(att?.size).toBe(Buffer.byteLength(ics));
  });
});

describe("sink HTTP API", () => {
  async function sendTo(to: string, subject: string) {
    await mail.sendMail({ to, subject, email: createElement(VerifyEmail, { name: "Test", url: "https://grainward.example/v" }) });
  }

  it("lists newest first and filters by recipient, case-insensitively", async () => {
    await sendTo("holloway@owners.example", "first");
    await sendTo("jonah@owners.example", "second");
    await sendTo("holloway@owners.example", "third");

    const all = await listMail();
    expect(all.map((m) => m.subject)).toEqual(["third", "second", "first"]);
    expect(all[0]).not.toHaveProperty("raw");

    const holloway = await listMail({ to: "HOLLOWAY@Owners.Example" });
    expect(holloway.map((m) => m.subject)).toEqual(["third", "first"]);
    expect(await listMail({ to: "nobody@owners.example" })).toEqual([]);
    expect(sink.messages().map((m) => m.subject)).toEqual(["third", "second", "first"]);
  });

  it("serves one message, its raw source, health, and 404s", async () => {
    await sendTo("jonah@owners.example", "raw check");
    const [summary] = await listMail();
    expect(summary).toBeDefined();
    const id = summary!.id;

    const full = await getMail(id);
    expect(full.subject).toBe("raw check");
    expect(full.raw).toContain("Subject: raw check");

    const raw = await fetch(`${sink.url}/messages/${id}/raw`);
    expect(raw.status).toBe(200);
    expect(raw.headers.get("content-type")).toBe("message/rfc822");
    expect(await raw.text()).toBe(full.raw);

    expect((await fetch(`${sink.url}/messages/no-such-id`)).status).toBe(404);
    expect((await fetch(`${sink.url}/nowhere`)).status).toBe(404);
    expect((await fetch(`${sink.url}/messages/${id}`, { method: "POST" })).status).toBe(405);

    const health = await fetch(`${sink.url}/health`);
    expect(health.status).toBe(200);
    expect(await health.json()).toMatchObject({ ok: true, messages: 1, smtpPort: sink.smtpPort });
  });

  it("DELETE /messages clears the store", async () => {
    await sendTo("jonah@owners.example", "to be cleared");
    expect(await listMail()).toHaveLength(1);
    await clearMail();
    expect(await listMail()).toEqual([]);
    expect(sink.messages()).toEqual([]);
  });

  it("waitForMail honours since and times out with what the sink holds", async () => {
    await sendTo("jonah@owners.example", "old news");
    const since = new Date(Date.now() + 1);
    await new Promise((r) => setTimeout(r, 5));
    await expect(waitForMail({ to: "jonah@owners.example", since, timeoutMs: 300 })).rejects.toThrow(/old news/);
    await sendTo("jonah@owners.example", "fresh");
    await expect(waitForMail({ to: "jonah@owners.example", since })).resolves.toMatchObject({ subject: "fresh" });
  });

  it("keeps only the newest messages when capped", async () => {
    const small = await startSmtpSink({ maxMessages: 3 });
    try {
      const nodemailer = (await import("nodemailer")).default;
      const t = nodemailer.createTransport({ host: "127.0.0.1", port: small.smtpPort, secure: false, ignoreTLS: true });
      for (let i = 1; i <= 5; i++) {
        await t.sendMail({ from: "a@grainward.example", to: "b@owners.example", subject: `n${i}`, text: "x" });
      }
      t.close();
      expect(small.messages().map((m) => m.subject)).toEqual(["n5", "n4", "n3"]);
    } finally {
      await small.close();
    }
  });
});

describe("extractLinks", () => {
  it("finds URLs in text and HTML without trailing punctuation, deduplicated", () => {
    const text = 'Go to https://grainward.example/a?x=1&amp;y=2. Or <a href="https://grainward.example/b">b</a> (https://grainward.example/a?x=1&y=2)';
    expect(extractLinks(text)).toEqual(["https://grainward.example/a?x=1&y=2", "https://grainward.example/b"]);
  });
});
