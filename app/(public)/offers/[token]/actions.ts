"use server";

import { redirect } from "next/navigation";
import { isAppError } from "@/lib/errors";
import { action } from "@/lib/http/action";
import { acceptOfferByToken } from "@/lib/reminders/offers";
import { offerAcceptSchema } from "@/lib/validation/reminders";

/** The offer link's token is the authority: anyone holding it accepts, signed in or not. */
export const acceptOfferAction = action({ schema: offerAcceptSchema, refused: "/" }, ({ token }) => {
  let outcome = "accepted";
  try {
    acceptOfferByToken(token);
  } catch (e) {
    if (!isAppError(e)) throw e;
    outcome = e.status === 409 ? "closed" : "invalid";
  }
  redirect(`/offers/${encodeURIComponent(token)}?result=${outcome}`);
});
