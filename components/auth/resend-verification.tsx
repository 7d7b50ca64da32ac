"use client";

import { useTransition } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import type { ActionResult } from "@/lib/validation/action";

export function ResendVerification({ action, next }: { action: (v: { next?: string }) => Promise<ActionResult<unknown>>; next?: string }) {
  const [pending, start] = useTransition();
  return (
    <Button
      variant="secondary"
      disabled={pending}
      onClick={() =>
        start(async () => {
          const r = await action({ next });
          if (r.ok) toast.success(r.message ?? "Sent.");
          else toast.error(r.message);
        })
      }
    >
      {pending ? "Sending…" : "Send the link again"}
    </Button>
  );
}
