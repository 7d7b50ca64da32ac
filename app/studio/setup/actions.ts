"use server";

import { action } from "@/lib/http/action";
import { revalidatePath } from "next/cache";
import { z } from "zod";
import { accentSchema, mailSenderSchema, stripeKeySchema } from "@/lib/studio/setup-schema";
import { saveAccent, saveMailSender, saveStripeKey, sendTestMessage, startCatalog } from "@/lib/studio/setup-steps";
import { ACCENTS, type AccentName } from "@/lib/studio/brand";
import { saveStripeWebhookSecret } from "@/lib/studio/setup-payments";
import { stripeWebhookSecretSchema } from "@/lib/studio/setup-payments-schema";

// The set-up's own steps; the others reuse the settings, catalog and team actions.

const nothing = z.object({}).strict();

export const saveAccentAction = action({ roles: ["admin"], schema: accentSchema }, async (input, ctx) => {
  const accent = saveAccent(ctx, input) as AccentName;
  revalidatePath("/studio", "layout");
  return { ok: true as const, data: undefined, message: `${ACCENTS[accent].label} saved as your colour.` };
});

export const startCatalogAction = action({ roles: ["admin"], schema: nothing }, async (_input, ctx) => {
  const n = startCatalog(ctx);
  revalidatePath("/studio/setup/catalog");
  return { ok: true as const, data: undefined, message: `${n} starting entries added, one per finish class. Check each against the maker's data sheet.` };
});

export const saveStripeKeyAction = action({ roles: ["admin"], schema: stripeKeySchema }, async (input, ctx) => {
  await saveStripeKey(ctx, input);
  revalidatePath("/studio/setup/payments");
  return { ok: true as const, data: undefined, message: "Stripe accepted the key; it is saved." };
});

export const saveStripeWebhookSecretAction = action({ roles: ["admin"], schema: stripeWebhookSecretSchema }, async (input, ctx) => {
  saveStripeWebhookSecret(ctx, input);
  revalidatePath("/studio/setup/payments");
  return { ok: true as const, data: undefined, message: "Signing secret saved; events from your Stripe account are checked with it." };
});

export const saveMailSenderAction = action({ roles: ["admin"], schema: mailSenderSchema }, async (input, ctx) => {
  saveMailSender(ctx, input);
  revalidatePath("/studio/setup/mail");
  return { ok: true as const, data: undefined, message: "Sender name and reply address saved." };
});

export const sendTestMessageAction = action({ roles: ["admin"], schema: nothing }, async (_input, ctx) => {
  const r = await sendTestMessage(ctx);
  return { ok: true as const, data: undefined, message: r.queued ? `The mail server is not answering; the test message to ${r.to} will be sent when it is.` : `Test message sent to ${r.to}.` };
});
