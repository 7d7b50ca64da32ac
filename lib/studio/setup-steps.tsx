import "server-only";
// The set-up steps that have no settings page of their own: logo and accent colour, starting the
// warranty and the catalog from our starting points, the studio's Stripe key (checked with one call),
// and the mail sender with a test message. The other steps save through lib/settings, lib/catalog and
// lib/auth/accounts like their settings pages do. Every function takes the admin's StudioContext.
import { count, eq } from "drizzle-orm";
import Stripe from "stripe";
import { getDb } from "@/db/client";
import { finishProducts, studios, type Studio } from "@/db/schema";
import { recordAudit } from "@/lib/audit";
import type { StudioContext } from "@/lib/auth/guards";
import { createCatalogProduct } from "@/lib/catalog";
import { encrypt } from "@/lib/crypto";
import { env } from "@/lib/env";
import { SEALED } from "@/lib/payments/stripe";
import { conflict, serviceUnavailable, unprocessable } from "@/lib/errors";
import { sendMail } from "@/lib/mail";
import { assertAdmin, freshStudio, studioToday } from "@/lib/settings";
import { policyToForm } from "@/lib/settings/policy";
import { readStoredFile, removeStoredFiles, storeImage } from "@/lib/storage";
import type { PolicyVersionInput } from "@/lib/validation/settings";
import StudioTestMessage from "@/emails/studio-test-message";
import { markSetupStep } from "./setup";
import type { AccentValues, MailSenderValues, StripeKeyValues } from "./setup-schema";
import { CATALOG_STARTERS, STARTER_NOTE, WARRANTY_TEMPLATE } from "./starters";

// ---- logo and accent ----

/**
 * Stores an uploaded logo through the photo pipeline (lib/storage: checked by content, decoded with a
 * pixel limit, metadata dropped, re-encoded as JPEG on white); the studio keeps its 480 px copy.
 */
export async function uploadLogo(ctx: StudioContext, read: () => Promise<Uint8Array>): Promise<Studio> {
  assertAdmin(ctx);
  const stored = await storeImage(await read(), ctx.user.id);
  await removeStoredFiles(stored.storageKey);
  let previous: string | null = null;
  try {
    const row = getDb().transaction((tx) => {
      previous = tx.select({ k: studios.logoKey }).from(studios).where(eq(studios.id, ctx.studio.id)).get()?.k ?? null;
      tx.update(studios).set({ logoKey: stored.thumbKey }).where(eq(studios.id, ctx.studio.id)).run();
      markSetupStep(tx, ctx.studio.id, "brand");
      recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "settings.logo_changed", subjectType: "studio", subjectId: ctx.studio.id, data: { width: stored.width, height: stored.height } });
      return tx.select().from(studios).where(eq(studios.id, ctx.studio.id)).get()!;
    });
    if (previous) await removeStoredFiles(previous);
    return row;
  } catch (e) {
    await removeStoredFiles(stored.thumbKey);
    throw e;
  }
}

export async function removeLogo(ctx: StudioContext): Promise<void> {
  assertAdmin(ctx);
  const previous = getDb().transaction((tx) => {
    const k = tx.select({ k: studios.logoKey }).from(studios).where(eq(studios.id, ctx.studio.id)).get()?.k ?? null;
    tx.update(studios).set({ logoKey: null }).where(eq(studios.id, ctx.studio.id)).run();
    if (k) recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "settings.logo_changed", subjectType: "studio", subjectId: ctx.studio.id, data: { removed: true } });
    return k;
  });
  if (previous) await removeStoredFiles(previous);
}

/** A studio's logo for its public logo route: the JPEG bytes, or null without one. Logos are not secret. */
export async function studioLogo(studioId: string): Promise<Buffer | null> {
  const row = getDb().select({ k: studios.logoKey }).from(studios).where(eq(studios.id, studioId)).get();
  if (!row?.k) return null;
  return readStoredFile(row.k).catch(() => null);
}

export function saveAccent(ctx: StudioContext, { accent }: AccentValues): string {
  assertAdmin(ctx);
  getDb().transaction((tx) => {
    const before = tx.select({ a: studios.accent }).from(studios).where(eq(studios.id, ctx.studio.id)).get()?.a;
    tx.update(studios).set({ accent }).where(eq(studios.id, ctx.studio.id)).run();
    markSetupStep(tx, ctx.studio.id, "brand");
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "settings.accent_changed", subjectType: "studio", subjectId: ctx.studio.id, data: { from: before, to: accent } });
  });
  return accent;
}

// ---- warranty and catalog starting points ----

/** The warranty editor's values in the set-up: the studio's newest terms, or our template until it has some. */
export function warrantyStartValues(ctx: StudioContext, latest: PolicyVersionInput | null, now = new Date()): { values: PolicyVersionInput; fromTemplate: boolean } {
  assertAdmin(ctx);
  if (latest) return { values: latest, fromTemplate: false };
  return { values: policyToForm(WARRANTY_TEMPLATE, studioToday(ctx, now)), fromTemplate: true };
}

/** Adds one starter entry per finish class to an empty catalog; a catalog with entries is left alone (409). */
export function startCatalog(ctx: StudioContext): number {
  assertAdmin(ctx);
  const has = getDb().select({ n: count() }).from(finishProducts).where(eq(finishProducts.studioId, ctx.studio.id)).get()?.n ?? 0;
  if (has > 0) throw conflict("Your catalog already has entries; add or change them on the catalog page.", { code: "catalog_not_empty" });
  for (const s of CATALOG_STARTERS) createCatalogProduct(ctx, { ...s, safetyNotes: `${STARTER_NOTE} ${s.safetyNotes}`, containers: [] });
  return CATALOG_STARTERS.length;
}

// ---- payments ----

/**
 * Checks a Stripe secret key with one read-only call (GET /v1/balance) to the service the install
 * talks to (the local fake when STRIPE_API_HOST is set; `api` names another, for tests), then keeps it sealed (lib/crypto.ts). A key
 * Stripe refuses is not kept (422); an unreachable service keeps nothing either (503).
 */
export async function saveStripeKey(ctx: StudioContext, { secretKey }: StripeKeyValues, opts: { now?: Date; api?: { host: string; port: number; protocol: "http" | "https" } } = {}): Promise<void> {
  assertAdmin(ctx);
  const now = opts.now ?? new Date();
  const api = opts.api ?? (env.STRIPE_API_HOST ? { host: env.STRIPE_API_HOST, port: env.STRIPE_API_PORT, protocol: env.STRIPE_API_PROTOCOL } : null);
  const stripe = new Stripe(secretKey, {
    ...(api ?? {}),
    maxNetworkRetries: 1,
    timeout: 10_000,
    appInfo: { name: "Grainward" },
  });
  try {
    await stripe.balance.retrieve();
  } catch (e) {
    if (e instanceof Stripe.errors.StripeAuthenticationError || e instanceof Stripe.errors.StripePermissionError) {
      throw unprocessable("stripe_key_refused", "Stripe did not accept that key. Copy the secret key again from your Stripe dashboard (Developers → API keys).", { secretKey: ["Stripe did not accept this key."] });
    }
    if (e instanceof Stripe.errors.StripeError && !(e instanceof Stripe.errors.StripeConnectionError) && !(e instanceof Stripe.errors.StripeAPIError)) {
      throw unprocessable("stripe_key_refused", `Stripe answered: ${e.message}`, { secretKey: ["Stripe did not accept this key."] });
    }
    throw serviceUnavailable("payment_service_unavailable", "Stripe can't be reached right now, so the key could not be checked. Nothing was saved; try again in a minute.");
  }
  getDb().transaction((tx) => {
    tx.update(studios).set({ stripeSecretSealed: encrypt(SEALED.secretKey, secretKey), stripeCheckedAt: now }).where(eq(studios.id, ctx.studio.id)).run();
    markSetupStep(tx, ctx.studio.id, "payments");
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "settings.stripe_key_saved", subjectType: "studio", subjectId: ctx.studio.id, data: { mode: secretKey.includes("_live_") ? "live" : "test", last4: secretKey.slice(-4) } });
  });
}

// ---- mail ----

export function mailSenderValues(ctx: StudioContext): { senderName: string; replyTo: string } {
  assertAdmin(ctx);
  const s = freshStudio(ctx);
  return { senderName: s.mailSenderName || s.name, replyTo: s.email };
}

/** The sender name and the Reply-To address (studios.email, which the studio's mail already answers to). */
export function saveMailSender(ctx: StudioContext, v: MailSenderValues): void {
  assertAdmin(ctx);
  getDb().transaction((tx) => {
    const before = tx.select({ n: studios.mailSenderName, e: studios.email }).from(studios).where(eq(studios.id, ctx.studio.id)).get();
    tx.update(studios).set({ mailSenderName: v.senderName, email: v.replyTo }).where(eq(studios.id, ctx.studio.id)).run();
    markSetupStep(tx, ctx.studio.id, "mail");
    recordAudit(tx, { studioId: ctx.studio.id, actorId: ctx.user.id, action: "settings.mail_sender_saved", subjectType: "studio", subjectId: ctx.studio.id, data: { from: before, to: { n: v.senderName, e: v.replyTo } } });
  });
}

/** Sends a test message to the admin's own address, from the studio's sender name, with its Reply-To and brand. */
export async function sendTestMessage(ctx: StudioContext): Promise<{ to: string; queued: boolean }> {
  assertAdmin(ctx);
  const s = freshStudio(ctx);
  const r = await sendMail({
    to: ctx.user.email,
    subject: `Test message from ${s.mailSenderName || s.name}`,
    email: <StudioTestMessage studioName={s.name} senderName={s.mailSenderName || s.name} replyTo={s.email} />,
    replyTo: s.email || undefined,
    studioId: s.id,
  });
  return { to: ctx.user.email, queued: r.queued };
}
