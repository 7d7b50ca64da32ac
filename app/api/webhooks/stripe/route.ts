import { NextResponse } from "next/server";
import { BODY_LIMITS, readText } from "@/lib/http/body";
import { route } from "@/lib/http/route";
import { handleStripeWebhook } from "@/lib/repairs/payment";

// The signature is verified on the raw body, so read it as text before anything parses it.
export const POST = route(async (req) => {
  const result = await handleStripeWebhook(await readText(req, BODY_LIMITS.webhook), req.headers.get("stripe-signature"));
  return NextResponse.json(result);
});
