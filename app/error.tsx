"use client";

import { Button } from "@/components/ui/button";

export default function ErrorPage({ reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <main className="mx-auto max-w-md space-y-4 px-4 py-20 text-center">
      <h1 className="font-display text-2xl font-semibold">Something went wrong on our side</h1>
      <p className="text-muted">Nothing you saved is lost. Try again, and if it keeps happening, let the studio know.</p>
      <Button onClick={reset}>Try again</Button>
    </main>
  );
}
