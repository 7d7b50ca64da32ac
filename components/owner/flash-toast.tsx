"use client";

import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useEffect } from "react";
import { toast } from "sonner";

/**
 * What the piece page says on arriving from a redirect, by query parameter and value: a registration
 * (app/(owner)/register/actions.ts) and the way back from a care plan's payment page (lib/plans/subscriptions.ts
 * sends the owner to `?plan=started&session_id=…` or `?plan=cancelled`). `alsoRemove`: parameters that came with it.
 */
const MESSAGES: { param: string; value: string; tone: "success" | "info"; text: string; alsoRemove?: string[] }[] = [
  { param: "registered", value: "1", tone: "success", text: "Registered — this piece is now on your account." },
  { param: "plan", value: "started", tone: "success", text: "Thank you — your care plan is paid. It shows as running below once the payment is confirmed.", alsoRemove: ["session_id"] },
  { param: "plan", value: "cancelled", tone: "info", text: "The care plan was not started and your card was not charged. You can start it whenever you like." },
];

/** Confirms an action that ended in a redirect (e.g. ?registered=1) with a toast, then tidies the URL. */
export function FlashToast() {
  const params = useSearchParams();
  const router = useRouter();
  const pathname = usePathname();
  useEffect(() => {
    const message = MESSAGES.find((m) => params.get(m.param) === m.value);
    if (!message) return;
    if (message.tone === "success") toast.success(message.text);
    else toast.info(message.text);
    const rest = new URLSearchParams(params);
    for (const key of [message.param, ...(message.alsoRemove ?? [])]) rest.delete(key);
    router.replace(rest.size ? `${pathname}?${rest}` : pathname, { scroll: false });
  }, [params, pathname, router]);
  return null;
}
