import Link from "next/link";
import type { ReactNode } from "react";
import { signOutAction } from "@/app/actions/session";

export type NavItem = { href: string; label: string };

export function Wordmark() {
  return (
    <Link href="/" className="flex min-h-11 items-center gap-2 font-display text-xl font-semibold tracking-tight text-ink">
      <svg aria-hidden viewBox="0 0 24 24" className="size-6 text-resin">
        <path fill="currentColor" d="M3 6h18v3H3zM3 11h18v3H3zM3 16h18v3H3z" opacity=".25" />
        <path fill="currentColor" d="M3 11c4 0 5 3 9 3s5-3 9-3v3c-4 0-5 3-9 3s-5-3-9-3z" />
      </svg>
      Grainward
    </Link>
  );
}

/** The header of the signed-in areas; `nav` is already filtered to what the person's role may open. */
export function SiteHeader({ nav, userName, context, children }: { nav: NavItem[]; userName: string; context?: string; children?: ReactNode }) {
  return (
    <header className="border-b border-line bg-card/80">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-2">
        <Wordmark />
        {context ? <span className="hidden text-sm text-muted sm:inline">{context}</span> : null}
        <nav aria-label="Main" className="order-last -mx-2 flex w-full gap-1 overflow-x-auto sm:order-none sm:w-auto sm:flex-1">
          {nav.map((item) => (
            <Link key={item.href} href={item.href} className="flex min-h-11 items-center whitespace-nowrap rounded-md px-3 text-sm font-medium text-ink hover:bg-resin-soft">
              {item.label}
            </Link>
          ))}
        </nav>
        <div className="ml-auto flex items-center gap-2">
          {children}
          <span className="hidden text-sm text-muted 2xl:inline">{userName}</span>
          <form action={signOutAction}>
            <button type="submit" className="min-h-11 rounded-md px-3 text-sm font-medium text-resin hover:bg-resin-soft">
              Sign out
            </button>
          </form>
        </div>
      </div>
    </header>
  );
}
