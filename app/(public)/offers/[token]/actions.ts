"use server";

import { redirect } from "next/navigation";
import { isAppError } from "@/lib/errors";
import { acceptOfferByToken } from "@/lib/reminders/offers";
import { offerAcceptSchema } from "@/lib/validation/reminders";

export async function acceptOfferAction(formData: FormData): Promise<void> {
  const parsed = offerAcceptSchema.safeParse({ token: formData.get("token") });
  if (!parsed.success) redirect("/");
  let outcome = "accepted";
  try {
    acceptOfferByToken(parsed.data.token);
  } catch (e) {
    if (!isAppError(e)) throw e;
    outcome = e.status === 409 ? "closed" : "invalid";
  }
  redirect(`/offers/${encodeURIComponent(parsed.data.token)}?result=${outcome}`);
}
