"use client";

import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useEffect } from "react";
import { toast } from "sonner";

const MESSAGES: Record<string, string> = {
  registered: "Registered — this piece is now on your account.",
};

/** Confirms an action that ended in a redirect (e.g. ?registered=1) with a toast, then tidies the URL. */
export function FlashToast() {
  const params = useSearchParams();
  const router = useRouter();
  const pathname = usePathname();
  useEffect(() => {
    const key = Object.keys(MESSAGES).find((k) => params.get(k) === "1");
    if (!key) return;
    toast.success(MESSAGES[key]);
    const rest = new URLSearchParams(params);
    rest.delete(key);
    router.replace(rest.size ? `${pathname}?${rest}` : pathname, { scroll: false });
  }, [params, pathname, router]);
  return null;
}
