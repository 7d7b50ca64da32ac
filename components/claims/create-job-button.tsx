"use client";

import { Hammer } from "lucide-react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { apiJson } from "@/components/api-client";

/** Opens the repair job of an accepted claim (POST /api/claims/[id]/job) and goes to it. */
export function CreateRepairJobButton({ claimId }: { claimId: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  return (
    <Button
      disabled={busy}
      onClick={async () => {
        setBusy(true);
        try {
          const { job } = await apiJson<{ job: { id: string } }>(`/api/claims/${claimId}/job`, { method: "POST" });
          toast.success("Repair job created. Price it and send the quote.");
          router.push(`/studio/jobs/${job.id}`);
        } catch (e) {
          toast.error(e instanceof Error ? e.message : "That didn't work.");
          setBusy(false);
        }
      }}
    >
      <Hammer aria-hidden className="size-5" /> {busy ? "Creating…" : "Create repair job"}
    </Button>
  );
}
