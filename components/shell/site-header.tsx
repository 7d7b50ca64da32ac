import Link from "next/link";
import type { ReactNode } from "react";
import { signOutAction } from "@/app/actions/session";
import { MainNav } from "./main-nav";
import type { NavItem } from "./nav-groups";

export type { NavItem };

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

/**
 * The header of the signed-in areas; `nav` is already filtered to what the person's role may open.
 * A long list keeps its everyday pages in the bar and the rest under "More" (see nav-groups.ts).
 */
export function SiteHeader({ nav, userName, context, children }: { nav: NavItem[]; userName: string; context?: string; children?: ReactNode }) {
  return (
    <header className="border-b border-line bg-card/80">
      <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-6 gap-y-2 px-4 py-2">
        <Wordmark />
        {context ? <span className="hidden max-w-56 truncate align-middle text-sm text-muted sm:inline-block" title={context}>{context}</span> : null}
        <MainNav items={nav} />
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
