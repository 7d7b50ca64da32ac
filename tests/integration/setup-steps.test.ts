// The studio's set-up in steps (lib/studio/setup.ts, lib/studio/setup-steps.tsx): which steps are left,
// each marked done by its save and left undone when skipped; the logo through the photo pipeline;
// the accent from our set; the warranty template and the starter catalog; the Stripe key checked with
// one call to the real Stripe fake over HTTP and kept sealed; the sender name and Reply-To on a test
// message read back from the real SMTP sink, with the studio's brand in it. All data invented.
import fs from "node:fs";
import path from "node:path";
import { createElement } from "react";
import { renderToBuffer } from "@react-pdf/renderer";
import { getDocument, OPS } from "pdfjs-dist/legacy/build/pdf.mjs";
import { eq } from "drizzle-orm";
import sharp from "sharp";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ZodError } from "zod";
import { getDb } from "@/db/client";
import { finishProducts, studios } from "@/db/schema";
import { CLAIM_CATEGORIES, FINISH_CLASSES } from "@/lib/care/vocabulary";
import { decrypt } from "@/lib/crypto";
import { env } from "@/lib/env";
import { startStripeFake, type StripeFake } from "@/lib/fakes/stripe-fake";
import { AppError } from "@/lib/errors";
import { jobFigures } from "@/lib/repairs/figures";
import { ReceiptDocument, type ReceiptData } from "@/lib/repairs/receipt";
import {
  createPolicyVersion,
  updateProfile,
  updateReminderTiming,
} from "@/lib/settings";
import { profileSchema } from "@/lib/validation/settings";
import { ACCENTS } from "@/lib/studio/brand";
import { accentSchema, mailSenderSchema, stripeKeySchema } from "@/lib/studio/setup-schema";
import { firstUnfinishedStep, setupChecklist } from "@/lib/studio/setup";
import {
  mailSenderValues,
  removeLogo,
  saveAccent,
  saveMailSender,
  saveStripeKey,
  sendTestMessage,
  startCatalog,
  studioLogo,
  uploadLogo,
  warrantyStartValues,
} from "@/lib/studio/setup-steps";
import { STARTER_NOTE, WARRANTY_TEMPLATE } from "@/lib/studio/starters";
import { createStudio, memberContext } from "../support/fixtures";
import { waitForMail } from "../support/mail";

const row = (id: string) =>
  getDb().select().from(studios).where(eq(studios.id, id)).get()!;

async function failure(fn: () => unknown): Promise<number | string> {
  try {
    await fn();
    return "no error";
  } catch (e) {
    return e instanceof AppError
      ? e.status
      : e instanceof ZodError
        ? "zod"
        : String(e);
  }
}

const profile = {
  name: "Alder Row Studio (invented)",
  address: "3 Invented Yard",
  phone: "+1 555 0100",
  email: "",
  timeZone: "America/Chicago",
  currency: "USD" as const,
  unitSystem: "imperial" as const,
  taxRatePct: "7",
  labourRate: "80",
  travelFee: "40",
};

describe("set-up steps", () => {
  it("lists every step as left for a new studio, each linking to its step; a save ticks its step off, a skipped one stays", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const left = () =>
      setupChecklist(admin)
        .filter((i) => !i.done)
        .map((i) => i.key);
    expect(left()).toEqual([
      "details",
      "brand",
      "warranty",
      "catalog",
      "reminders",
      "visits",
      "team",
      "payments",
      "mail",
    ]);
    expect(setupChecklist(admin).map((i) => i.href)).toEqual(
      left().map((k) => `/studio/setup/${k}`),
    );
    expect(firstUnfinishedStep(setupChecklist(admin))).toBe("details");

    updateProfile(admin, profile);
    expect(row(studio.id).phone).toBe("+1 555 0100");
    // "brand" is skipped: the next save is the reminders step; brand stays first.
    updateReminderTiming(admin, { sendHour: 8, steps: ["due_day"] });
    expect(left()).toEqual([
      "brand",
      "warranty",
      "catalog",
      "visits",
      "team",
      "payments",
      "mail",
    ]);
    expect(firstUnfinishedStep(setupChecklist(admin))).toBe("brand");

    // A profile saved without a phone keeps the stored one.
    const { phone: _phone, ...withoutPhone } = profile;
    updateProfile(admin, withoutPhone);
    expect(row(studio.id).phone).toBe("+1 555 0100");
    expect(
      await failure(() =>
        updateProfile(admin, profileSchema.parse({ ...profile, phone: "call me <b>" })),
      ),
    ).toBe("zod");
  });

  it("takes a logo through the photo pipeline: re-encoded JPEG on white, at most 480 px, replaced and removed with its file", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    // A 1200 × 600 PNG with transparency.
    const png = await sharp({
      create: {
        width: 1200,
        height: 600,
        channels: 4,
        background: { r: 20, g: 90, b: 60, alpha: 0.5 },
      },
    })
      .png()
      .toBuffer();
    const saved = await uploadLogo(admin, async () => new Uint8Array(png));
    expect(saved.logoKey).toMatch(/\.thumb\.jpg$/);
    const bytes = (await studioLogo(studio.id))!;
    const meta = await sharp(bytes).metadata();
    expect([meta.format, meta.width, meta.height, meta.hasAlpha]).toEqual([
      "jpeg",
      480,
      240,
      false,
    ]);
    expect(setupChecklist(admin).find((i) => i.key === "brand")!.done).toBe(
      true,
    );

    const first = path.resolve(env.DATA_DIR, saved.logoKey!);
    const again = await uploadLogo(admin, async () => new Uint8Array(png));
    expect(again.logoKey).not.toBe(saved.logoKey);
    expect(fs.existsSync(first)).toBe(false);

    expect(
      await failure(() =>
        uploadLogo(admin, async () =>
          new TextEncoder().encode("not an image at all"),
        ),
      ),
    ).toBe(415);
    expect(row(studio.id).logoKey).toBe(again.logoKey);

    await removeLogo(admin);
    expect(row(studio.id).logoKey).toBeNull();
    expect(await studioLogo(studio.id)).toBeNull();
    expect(fs.existsSync(path.resolve(env.DATA_DIR, again.logoKey!))).toBe(
      false,
    );
  });

  it("keeps an accent from the set only, and only for admins", async () => {
    const studio = createStudio();
    const admin = await memberContext(studio, "admin");
    const staff = await memberContext(studio, "staff");
    expect(await failure(() => saveAccent(admin, accentSchema.parse({ accent: "neon" })))).toBe(
      "zod",
    );
    expect(await failure(() => saveAccent(staff, { accent: "moss" }))).toBe(
      403,
    );
    expect(row(studio.id).accent).toBe("default");
    saveAccent(admin, { accent: "moss" });
    expect(row(studio.id).accent).toBe("moss");
    expect(ACCENTS.moss.hex).toMatch(/^#/);
  });

  it("starts the warranty from our template and the catalog from one entry per finish class, marked as starting values", async () => {
    const studio = createStudio();
    const other = createStudio();
    const admin = await memberContext(studio, "admin");
    const start = warrantyStartValues(admin, null);
    expect(start.fromTemplate).toBe(true);
    const covered = CLAIM_CATEGORIES.filter(
      (c) => start.values.lines[c].covered,
    );
    expect(covered).toEqual(
      CLAIM_CATEGORIES.filter((c) => WARRANTY_TEMPLATE.lines[c]),
    );
    createPolicyVersion(admin, start.values);
    expect(setupChecklist(admin).find((i) => i.key === "warranty")!.done).toBe(
      true,
    );

    expect(startCatalog(admin)).toBe(FINISH_CLASSES.length);
    const rows = getDb()
      .select()
      .from(finishProducts)
      .where(eq(finishProducts.studioId, studio.id))
      .all();
    expect(rows.map((r) => r.finishClass).sort()).toEqual(
      [...FINISH_CLASSES].sort(),
    );
    for (const r of rows)
      expect(r.safetyNotes.startsWith(STARTER_NOTE)).toBe(true);
    // Interval and cure overrides stay empty: the care engine's class defaults apply.
    expect(
      rows.every(
        (r) => r.intervalHeavyMonths === null && r.cureFullDays === null,
      ),
    ).toBe(true);
    expect(await failure(() => startCatalog(admin))).toBe(409);
    expect(
      getDb()
        .select()
        .from(finishProducts)
        .where(eq(finishProducts.studioId, other.id))
        .all(),
    ).toEqual([]);
  });

  describe("payments", () => {
    // A fake of our own on a free port (payments.test.ts runs one on STRIPE_API_PORT at the same time).
    let fake: StripeFake;
    const key = "sk_test_setup_steps_studio_key";
    beforeAll(async () => {
      fake = await startStripeFake({
        port: 0,
        secretKey: key,
        webhookSecret: "whsec_setup_steps",
      });
    });
    afterAll(() => fake.close());
    const api = () => ({
      host: "127.0.0.1",
      port: fake.port,
      protocol: "http" as const,
    });

    it("checks a Stripe key with the Stripe fake before keeping it sealed; a refused key keeps nothing", async () => {
      const studio = createStudio();
      const admin = await memberContext(studio, "admin");
      expect(
        await failure(() =>
          saveStripeKey(admin, stripeKeySchema.parse({ secretKey: "pk_test_public" }), { api: api() }),
        ),
      ).toBe("zod");
      expect(
        await failure(() =>
          saveStripeKey(
            admin,
            { secretKey: "sk_test_not_the_right_one" },
            { api: api() },
          ),
        ),
      ).toBe(422);
      expect([
        row(studio.id).stripeSecretSealed,
        row(studio.id).stripeCheckedAt,
      ]).toEqual([null, null]);
      // Nothing listening: the key can't be checked, and nothing is kept.
      expect(
        await failure(() =>
          saveStripeKey(
            admin,
            { secretKey: key },
            { api: { ...api(), port: 1 } },
          ),
        ),
      ).toBe(503);
      expect(row(studio.id).stripeSecretSealed).toBeNull();

      await saveStripeKey(
        admin,
        { secretKey: key },
        { api: api(), now: new Date("2026-06-01T12:00:00Z") },
      );
      const s = row(studio.id);
      expect(s.stripeSecretSealed).not.toContain(key);
      expect(decrypt("stripe-key", s.stripeSecretSealed!)).toBe(key);
      expect(s.stripeCheckedAt?.toISOString()).toBe("2026-06-01T12:00:00.000Z");
      expect(
        setupChecklist(admin).find((i) => i.key === "payments")!.done,
      ).toBe(true);
    });
  });

  it("sends the test message from the studio's sender name with its Reply-To, name, logo, accent and Grainward's small line", async () => {
    const studio = createStudio({
      name: "Fernhollow Benches (invented)",
      accent: "oxblood",
    });
    const admin = await memberContext(studio, "admin");
    expect(mailSenderValues(admin)).toEqual({
      senderName: "Fernhollow Benches (invented)",
      replyTo: "",
    });
    expect(
      await failure(() =>
        saveMailSender(admin, mailSenderSchema.parse({ senderName: 'Evil "Name" <x@y>', replyTo: "" })),
      ),
    ).toBe("zod");
    saveMailSender(admin, {
      senderName: "Fernhollow workshop",
      replyTo: "hello@fernhollow.example",
    });
    expect(setupChecklist(admin).find((i) => i.key === "mail")!.done).toBe(
      true,
    );
    const png = await sharp({
      create: { width: 300, height: 100, channels: 3, background: "#445566" },
    })
      .png()
      .toBuffer();
    await uploadLogo(admin, async () => new Uint8Array(png));

    const since = new Date();
    const sent = await sendTestMessage(admin);
    expect(sent).toEqual({ to: admin.user.email, queued: false });
    const m = await waitForMail({
      to: admin.user.email,
      subject: /Test message from Fernhollow workshop/,
      since,
    });
    expect(m.from).toBe(
      `Fernhollow workshop <${/<([^>]+)>/.exec(env.MAIL_FROM)![1]}>`,
    );
    expect(m.headers["reply-to"]).toContain("hello@fernhollow.example");
    expect(m.html).toContain("Fernhollow Benches (invented)");
    expect(m.html).toContain(ACCENTS.oxblood.hex);
    expect(m.html).toContain(
      `${env.APP_URL.replace(/\/$/, "")}/api/studio-logo/${studio.id}?v=`,
    );
    expect(m.text).toContain("care records by Grainward");
  });

  it("prints the studio's logo, name, phone and Grainward's small line on the receipt", async () => {
    const logo = await sharp({ create: { width: 200, height: 80, channels: 3, background: "#6a3462" } }).jpeg().toBuffer();
    const figures = jobFigures({ currency: "USD", lines: [], subtotalMinor: 0, coveredMinor: 0, coveredPct: 0, netMinor: 0, taxMinor: 0, totalMinor: 0, pricingRules: {} } as never, { country: "US", taxNumber: "" });
    const d: ReceiptData = {
      studio: { name: "Brackenfold Tables (invented)", address: "9 Invented Lane", phone: "+1 555 0142", accent: ACCENTS.plum.hex, logoKey: "files/xx/unused.jpg" },
      ownerName: "An Owner (invented)",
      pieceTitle: "Invented table",
      jobTitle: "Invented repair",
      refunds: [],
      kept: null,
      paidOn: "2026-06-01 10:00 EDT",
      reference: "pi_test_invented",
      figures,
      letter: true,
    };
    const render = (receipt: ReceiptData, withLogo: Buffer | null) => renderToBuffer(createElement(ReceiptDocument, { d: receipt, logo: withLogo }) as Parameters<typeof renderToBuffer>[0]);
    const read = async (buffer: Buffer) => {
      const doc = await getDocument({ data: new Uint8Array(buffer), useSystemFonts: false, isEvalSupported: false, standardFontDataUrl: path.resolve("node_modules/pdfjs-dist/standard_fonts") + "/" }).promise;
      const page = await doc.getPage(1);
      const text = (await page.getTextContent()).items.map((it) => ("str" in it ? it.str : "")).join(" ");
      const ops = (await page.getOperatorList()).fnArray;
      return { text, images: ops.filter((op) => op === OPS.paintImageXObject).length };
    };
    const withLogo = await read(await render(d, logo));
    for (const words of ["Brackenfold Tables (invented)", "+1 555 0142", "care records by Grainward"]) expect(withLogo.text).toContain(words);
    expect(withLogo.images).toBe(1);
    const without = await read(await render({ ...d, studio: { ...d.studio, logoKey: null } }, null));
    expect(without.images).toBe(0);
  });
});
