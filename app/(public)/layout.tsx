import Link from "next/link";
import type { ReactNode } from "react";
import { Wordmark } from "@/components/shell/site-header";
import { getCurrentSession } from "@/lib/auth/session";

const link = "flex min-h-11 items-center whitespace-nowrap rounded-md px-3 text-sm font-medium";

export default async function PublicLayout({ children }: { children: ReactNode }) {
  const { user } = await getCurrentSession();
  return (
    <>
      <header className="border-b border-line">
        <div className="mx-auto flex max-w-6xl items-center justify-between gap-2 px-4 py-2">
          <Wordmark />
          <nav aria-label="Account" className="flex gap-1">
            {user ? (
              <Link href="/home" className={`${link} bg-resin font-semibold text-white hover:bg-resin-dark`}>
                My start page
              </Link>
            ) : (
              <>
                <Link href="/sign-in" className={`${link} hover:bg-resin-soft`}>Sign in</Link>
                <Link href="/sign-up" className={`${link} bg-resin font-semibold text-white hover:bg-resin-dark`}>
                  <span className="sm:hidden">Sign up</span>
                  <span className="hidden sm:inline">Create account</span>
                </Link>
              </>
            )}
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
