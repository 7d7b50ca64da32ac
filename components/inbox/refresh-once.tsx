"use client";

import { useRouter } from "next/navigation";
import { useEffect } from "react";

/**
 * Opening an unread conversation changes the unread count in the studio header, which a client-side
 * navigation does not render again: refresh once so the header shows the new count.
 */
export function RefreshOnce() {
  const router = useRouter();
  useEffect(() => {
    router.refresh();
  }, [router]);
  return null;
}
