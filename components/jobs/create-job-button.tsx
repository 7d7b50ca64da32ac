"use client";

import { useTransition } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import type { ActionResult } from "@/lib/validation/action";

export function CreateJobButton({ action, from, id }: { action: (v: { from: "claim" | "refresh_offer"; id: string }) => Promise<ActionResult<unknown>>; from: "claim" | "refresh_offer"; id: string }) {
  const [pending, start] = useTransition();
  return (
    <Button
      variant="secondary"
      disabled={pending}
      onClick={() =>
        start(async () => {
          const r = await action({ from, id });
          if (r && !r.ok) toast.error(r.message);
        })
      }
    >
      {pending ? "Creating…" : "Create repair job"}
    </Button>
  );
}
