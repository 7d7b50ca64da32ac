import Link from "next/link";
import type { ReactNode } from "react";
import { Wordmark } from "@/components/shell/site-header";

export default function PublicLayout({ children }: { children: ReactNode }) {
  return (
    <>
      <header className="border-b border-line">
        <div className="mx-auto flex max-w-6xl items-center justify-between gap-4 px-4 py-2">
          <Wordmark />
          <nav aria-label="Account" className="flex gap-1">
            <Link href="/sign-in" className="flex min-h-11 items-center rounded-md px-3 text-sm font-medium hover:bg-resin-soft">Sign in</Link>
            <Link href="/sign-up" className="flex min-h-11 items-center rounded-md bg-resin px-3 text-sm font-semibold text-white hover:bg-resin-dark">Create account</Link>
          </nav>
        </div>
      </header>
      <main>{children}</main>
      <footer className="mt-16 border-t border-line">
        <p className="mx-auto max-w-6xl px-4 py-6 text-sm text-muted">Grainward — aftercare for one-off furniture.</p>
      </footer>
    </>
  );
}
