"use client";
// A table's search, filters, sort and page, kept in the URL so a view can be shared and survives a
// reload: the one way the registry, the clients list and the claims queue hold that state.
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useEffect, useMemo, useState } from "react";

/** How long typing rests before the search goes into the URL. */
const SEARCH_DEBOUNCE_MS = 300;

export type UrlFilters<K extends string> = {
  /** The known keys that are set, as a query string ("" when none): the API call and the cache key. */
  qs: string;
  /** A key's value, "" when unset. */
  get: (key: K) => string;
  /** Sets (or, with "" or null, removes) keys; any change but the page itself goes back to the first page. */
  set: (changes: Partial<Record<K, string | null>>) => void;
  /** Removes every key, and the typed search. */
  clear: () => void;
  /** Whether any key other than these is set (e.g. ["sort", "dir", "page"] to ask "is anything filtered?"). */
  anySetBut: (ignore: readonly K[]) => boolean;
  /** The search box: its text now, and the setter; the URL follows once typing rests. */
  typed: string;
  setTyped: (text: string) => void;
};

/**
 * `known`: for keys whose values come from a list (a sort, a filter), the values there are; any other
 * value in the URL (an old or mistyped link) reads as unset, so the link opens the list's default view
 * instead of an error about a value nobody typed.
 */
export function useUrlFilters<K extends string>(keys: readonly (K | "q")[], known: Partial<Record<K, readonly (string | number)[]>> = {}): UrlFilters<K | "q"> {
  type Key = K | "q";
  const searchParams = useSearchParams();
  const params = useMemo(() => {
    const p = new URLSearchParams(searchParams.toString());
    for (const [k, values] of Object.entries(known) as [string, readonly (string | number)[]][]) {
      const v = p.get(k);
      if (v && !values.map(String).includes(v)) p.delete(k);
    }
    return p;
    // known is a module constant in every caller
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [searchParams]);
  const router = useRouter();
  const pathname = usePathname();
  const qs = useMemo(() => {
    const p = new URLSearchParams();
    for (const k of keys) {
      const v = params.get(k);
      if (v) p.set(k, v);
    }
    return p.toString();
    // keys is a module constant in every caller
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [params]);

  const go = (s: string) => router.replace(s ? `${pathname}?${s}` : pathname, { scroll: false });
  const set = (changes: Partial<Record<Key, string | null>>) => {
    const p = new URLSearchParams(qs);
    for (const [k, v] of Object.entries(changes) as [Key, string | null | undefined][]) {
      if (v) p.set(k, v);
      else p.delete(k);
    }
    if (!("page" in changes)) p.delete("page");
    go(p.toString());
  };

  const urlQ = params.get("q") ?? "";
  const [typed, setTyped] = useState(urlQ);
  useEffect(() => {
    if (typed.trim() === urlQ) return;
    const t = setTimeout(() => set({ q: typed.trim() || null } as Partial<Record<Key, string | null>>), SEARCH_DEBOUNCE_MS);
    return () => clearTimeout(t);
    // eslint-disable-next-line react-hooks/exhaustive-deps -- only the typed text schedules a URL change
  }, [typed]);

  return {
    qs,
    get: (k) => params.get(k) ?? "",
    set,
    clear: () => {
      setTyped("");
      go("");
    },
    anySetBut: (ignore) => keys.some((k) => !ignore.includes(k) && !!params.get(k)),
    typed,
    setTyped,
  };
}
