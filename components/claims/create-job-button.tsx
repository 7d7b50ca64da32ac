"use client";

import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { apiJson } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";

/** Opens the repair job of an accepted claim (POST /api/claims/[id]/job) and goes to it. */
export function CreateRepairJobButton({ claimId }: { claimId: string }) {
  const { run, busy } = useRefreshingMutation(() => apiJson<{ job: { id: string } }>(`/api/claims/${claimId}/job`, { method: "POST" }), {
    onSuccess: () => toast.success("Repair job created. Price it and send the quote."),
    goTo: ({ job }) => `/studio/jobs/${job.id}`,
    onError: (words) => toast.error(words),
  });
  return (
    <Button disabled={busy} onClick={() => run(undefined)}>
      <SpriteIcon name="hammer" className="size-5" /> {busy ? "Creating…" : "Create repair job"}
    </Button>
  );
}
