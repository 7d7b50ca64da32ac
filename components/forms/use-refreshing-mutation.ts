"use client";
// The one way a button or small form on a server-rendered page changes something through the JSON API
// and shows the result: TanStack Query's useMutation runs the call (its pending state disables the
// button), the page's server components are fetched again on success (router.refresh()), and a refusal
// becomes one sentence for the person — the API's own message (with its field messages where asked),
// or a plain line when the request never got an answer.
import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { isApiError } from "@/components/api-client";

const OFFLINE = "That didn't go through. Check your connection and try again.";

export function useRefreshingMutation<V, T>(call: (vars: V) => Promise<T>, opts: { onSuccess?: (result: T, vars: V) => void; withFieldErrors?: boolean } = {}) {
  const router = useRouter();
  const m = useMutation({
    mutationFn: call,
    onSuccess: (result, vars) => {
      opts.onSuccess?.(result, vars);
      router.refresh();
    },
  });
  const e = m.error;
  const error = !e ? null : !isApiError(e) ? OFFLINE : opts.withFieldErrors ? [e.message, ...Object.values(e.fieldErrors).flat()].join(" ") : e.message;
  return { run: m.mutate, busy: m.isPending, error, reset: m.reset };
}
