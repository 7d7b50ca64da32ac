"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { ApiError, apiJson } from "@/components/api-client";
import { Button } from "@/components/ui/button";

/** Assign the thread to someone on the staff, mark it done, or open it again. */
export function ThreadControls({ threadId, state, assignedToId, staff }: { threadId: string; state: "unread" | "open" | "done"; assignedToId: string | null; staff: { id: string; name: string }[] }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const patch = async (json: Record<string, unknown>, done: string) => {
    setBusy(true);
    try {
      await apiJson(`/api/threads/${threadId}`, { method: "PATCH", json });
      toast.success(done);
      router.refresh();
    } catch (e) {
      toast.error(e instanceof ApiError ? e.message : "That didn't work. Try again.");
    } finally {
      setBusy(false);
    }
  };
  return (
    <div className="flex flex-wrap items-end gap-3">
      <label className="flex flex-col gap-1 text-sm font-medium">
        Assigned to
        <select
          className="min-h-11 rounded-lg border border-line bg-white px-3 text-base"
          value={assignedToId ?? ""}
          disabled={busy}
          onChange={(e) => {
            const id = e.target.value || null;
            void patch({ assignedToId: id }, id ? `Assigned to ${staff.find((s) => s.id === id)?.name ?? "them"}.` : "No one is assigned now.");
          }}
        >
          <option value="">Nobody</option>
          {staff.map((s) => (
            <option key={s.id} value={s.id}>
              {s.name}
            </option>
          ))}
        </select>
      </label>
      {state === "done" ? (
        <Button variant="secondary" disabled={busy} onClick={() => void patch({ state: "open" }, "Opened again.")}>
          Open again
        </Button>
      ) : (
        <Button variant="secondary" disabled={busy} onClick={() => void patch({ state: "done" }, "Marked done.")}>
          Mark done
        </Button>
      )}
    </div>
  );
}

/** Set aside an e-mail that matched no conversation, once dealt with. */
export function ResolveUnmatched({ id }: { id: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  return (
    <Button
      variant="secondary"
      disabled={busy}
      onClick={async () => {
        setBusy(true);
        try {
          await apiJson(`/api/threads/unmatched/${id}/resolve`, { method: "POST" });
          toast.success("Set aside.");
          router.refresh();
        } catch (e) {
          toast.error(e instanceof ApiError ? e.message : "That didn't work. Try again.");
        } finally {
          setBusy(false);
        }
      }}
    >
      Dealt with
    </Button>
  );
}
