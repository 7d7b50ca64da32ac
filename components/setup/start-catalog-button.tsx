"use client";

import { toast } from "sonner";
import { actionData } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import type { ActionResult } from "@/lib/validation/action";

/** Starts an empty catalog from one entry per finish class. */
export function StartCatalogButton({ action }: { action: (v: Record<string, never>) => Promise<ActionResult<unknown>> }) {
  const { run, busy, error } = useRefreshingMutation(() => actionData(action({})), {
    onSuccess: (r) => toast.success(r.message ?? "Catalog started."),
  });
  return (
    <div className="space-y-2">
      <Button disabled={busy} onClick={() => run(undefined)}>
        {busy ? "Adding…" : "Start from our starting values"}
      </Button>
      {error ? <Notice tone="error">{error}</Notice> : null}
    </div>
  );
}
