"use server";

import { redirect } from "next/navigation";
import { action } from "@/lib/http/action";
import { setRemindersByToken } from "@/lib/reminders/unsubscribe";
import { unsubscribeFormSchema } from "@/lib/validation/reminders";

/** The mailed link's token is the authority: it works signed out. */
export const setRemindersAction = action({ schema: unsubscribeFormSchema, refused: "/unsubscribe?invalid=1" }, ({ t, enable }) => {
  setRemindersByToken(t, enable, "page");
  redirect(`/unsubscribe?t=${encodeURIComponent(t)}&done=${enable ? "on" : "off"}`);
});
