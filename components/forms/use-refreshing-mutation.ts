"use client";
// The one way a button or small form on a server-rendered page changes something and shows the result:
// TanStack Query's useMutation runs the call (a JSON route through components/api-client, or a server
// action through actionData), its pending state disables the button, the page's server components are
// fetched again on success (router.refresh()) or the page moves on (`goTo`), and a refusal becomes one
// sentence for the person — the API's own message (with its field messages where asked), or a plain
// line when the request never got an answer.
import { useMutation } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { isApiError } from "@/components/api-client";

const OFFLINE = "That didn't go through. Check your connection and try again.";

/** The sentence shown for a failed call: the API's message (and its field messages, when asked), or a plain line. */
export function refusalWords(e: unknown, withFieldErrors = false): string {
  if (!isApiError(e)) return OFFLINE;
  return withFieldErrors ? [e.message, ...Object.values(e.fieldErrors).flat()].join(" ") : e.message;
}

/**
 * The sentence shown when a list or a panel could not be loaded: what is wrong with what was asked (its
 * field messages, e.g. "Search for at most 200 characters."), else the API's message, else a plain line
 * when no answer came ("Failed to fetch" is never shown to a person).
 */
export function loadRefusalWords(e: unknown): string {
  if (!isApiError(e)) return OFFLINE;
  const fields = Object.values(e.fieldErrors).flat();
  return fields.length ? fields.join(" ") : e.message;
}

type Refresh = "success" | "always" | "never";

export type RefreshingMutationOptions<V, T> = {
  onSuccess?: (result: T, vars: V) => void;
  /** Told the sentence shown for a refusal (e.g. to toast it), with the error itself for its field messages. */
  onError?: (words: string, error: unknown, vars: V) => void;
  withFieldErrors?: boolean;
  /**
   * When to fetch the page again: after a success (the default); after a refusal too, when part of the
   * change can stand; or never, when the component follows the change itself (a mailing's progress).
   */
  refresh?: Refresh;
  /** Where the page goes after a success instead of staying (a path in the app, or a full address); null stays. The button stays busy while it goes. */
  goTo?: (result: T, vars: V) => string | null;
};

/** What the page does after a success: open an address outside the app, go to a path in it, and/or fetch itself again. */
export function afterSuccess(to: string | null | undefined, refresh: Refresh = "success"): { open?: string; push?: string; refresh: boolean } {
  if (to && /^https?:/.test(to)) return { open: to, refresh: false };
  if (to) return { push: to, refresh: true };
  return { refresh: refresh !== "never" };
}

export function useRefreshingMutation<V, T>(call: (vars: V) => Promise<T>, opts: RefreshingMutationOptions<V, T> = {}) {
  const router = useRouter();
  const m = useMutation({
    mutationFn: call,
    onSuccess: (result, vars) => {
      opts.onSuccess?.(result, vars);
      const next = afterSuccess(opts.goTo?.(result, vars), opts.refresh);
      if (next.open) window.location.assign(next.open);
      if (next.push) router.push(next.push);
      if (next.refresh) router.refresh();
    },
    onError: (e, vars) => {
      opts.onError?.(refusalWords(e, opts.withFieldErrors), e, vars);
      if (opts.refresh === "always") router.refresh();
    },
  });
  const leaving = m.isSuccess && !!opts.goTo?.(m.data, m.variables);
  return {
    run: m.mutate,
    busy: m.isPending || leaving,
    /** The last call's input, while it runs and after it fails: which row or which button a busy state or an error belongs to. */
    vars: m.variables,
    error: m.error ? refusalWords(m.error, opts.withFieldErrors) : null,
    reset: m.reset,
  };
}
