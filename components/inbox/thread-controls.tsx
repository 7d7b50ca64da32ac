"use client";

import { toast } from "sonner";
import { apiJson } from "@/components/api-client";
import { useRefreshingMutation } from "@/components/forms/use-refreshing-mutation";
import { Button } from "@/components/ui/button";

/** Assign the thread to someone on the staff, mark it done, or open it again. */
export function ThreadControls({ threadId, state, assignedToId, staff }: { threadId: string; state: "unread" | "open" | "done"; assignedToId: string | null; staff: { id: string; name: string }[] }) {
  const { run, busy } = useRefreshingMutation(({ json }: { json: Record<string, unknown>; done: string }) => apiJson(`/api/threads/${threadId}`, { method: "PATCH", json }), {
    onSuccess: (_, { done }) => toast.success(done),
    onError: (words) => toast.error(words),
  });
  const patch = (json: Record<string, unknown>, done: string) => run({ json, done });
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
            patch({ assignedToId: id }, id ? `Assigned to ${staff.find((s) => s.id === id)?.name ?? "them"}.` : "No one is assigned now.");
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
        <Button variant="secondary" disabled={busy} onClick={() => patch({ state: "open" }, "Opened again.")}>
          Open again
        </Button>
      ) : (
        <Button variant="secondary" disabled={busy} onClick={() => patch({ state: "done" }, "Marked done.")}>
          Mark done
        </Button>
      )}
    </div>
  );
}

/** Set aside an e-mail that matched no conversation, once dealt with. */
export function ResolveUnmatched({ id }: { id: string }) {
  const { run, busy } = useRefreshingMutation(() => apiJson(`/api/threads/unmatched/${id}/resolve`, { method: "POST" }), {
    onSuccess: () => toast.success("Set aside."),
    onError: (words) => toast.error(words),
  });
  return (
    <Button variant="secondary" disabled={busy} onClick={() => run(undefined)}>
      Dealt with
    </Button>
  );
}
