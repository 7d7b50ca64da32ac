"use server";

import { redirect } from "next/navigation";
import { setRemindersByToken } from "@/lib/reminders/unsubscribe";
import { unsubscribeFormSchema } from "@/lib/validation/reminders";

export async function setRemindersAction(formData: FormData): Promise<void> {
  const parsed = unsubscribeFormSchema.safeParse({ t: formData.get("t"), enable: formData.get("enable") });
  if (!parsed.success) redirect("/unsubscribe?invalid=1");
  setRemindersByToken(parsed.data.t, parsed.data.enable, "page");
  redirect(`/unsubscribe?t=${encodeURIComponent(parsed.data.t)}&done=${parsed.data.enable ? "on" : "off"}`);
}
