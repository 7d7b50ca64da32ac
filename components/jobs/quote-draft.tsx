"use client";
// The staff job page's quote form and its "Send quote to owner" button share one fact: whether the form
// holds changes not saved yet. The owner is sent the quote as last saved, so the button waits for a save
// rather than send other figures than the form shows (app/studio/jobs/[id]/page.tsx).
import { createContext, useContext, useEffect, useMemo, useState, type ReactNode } from "react";

const QuoteDraft = createContext<{ unsaved: boolean; setUnsaved: (unsaved: boolean) => void } | null>(null);

export function QuoteDraftProvider({ children }: { children: ReactNode }) {
  const [unsaved, setUnsaved] = useState(false);
  const value = useMemo(() => ({ unsaved, setUnsaved }), [unsaved]);
  return <QuoteDraft.Provider value={value}>{children}</QuoteDraft.Provider>;
}

/** The quote form tells the page whether it holds unsaved changes. */
export function useReportQuoteDraft(unsaved: boolean) {
  const setUnsaved = useContext(QuoteDraft)?.setUnsaved;
  useEffect(() => setUnsaved?.(unsaved), [setUnsaved, unsaved]);
}

/** Whether the page's quote form holds changes not saved yet (false outside a provider). */
export function useQuoteDraftUnsaved(): boolean {
  return useContext(QuoteDraft)?.unsaved ?? false;
}
