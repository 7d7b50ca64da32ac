"use client";

import { useSearchParams } from "next/navigation";
import { Notice } from "@/components/ui/notice";

/** Shown after /home?denied=1: a page the person's role may not open sent them here. */
export function DeniedNotice() {
  const params = useSearchParams();
  if (params.get("denied") === "1") {
    return (
      <Notice tone="warn" title="That page isn't open to you" className="mb-6">
        It belongs to a part of Grainward your account has no role in, so we brought you to your own start page.
      </Notice>
    );
  }
  if (params.get("verified") === "1") {
    return <Notice tone="ok" title="E-mail confirmed" className="mb-6">Thanks — your address is confirmed.</Notice>;
  }
  return null;
}
