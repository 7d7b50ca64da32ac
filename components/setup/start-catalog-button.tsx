"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/notice";
import type { ActionResult } from "@/lib/validation/action";

/** Starts an empty catalog from one entry per finish class. */
export function StartCatalogButton({ action }: { action: (v: Record<string, never>) => Promise<ActionResult<unknown>> }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  async function start() {
    setBusy(true);
    setError(null);
    const r = await action({});
    setBusy(false);
    if (!r.ok) return setError(r.message);
    toast.success(r.message ?? "Catalog started.");
    router.refresh();
  }
  return (
    <div className="space-y-2">
      <Button disabled={busy} onClick={() => void start()}>
        {busy ? "Adding…" : "Start from our starting values"}
      </Button>
      {error ? <Notice tone="error">{error}</Notice> : null}
    </div>
  );
}
