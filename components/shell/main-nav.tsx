"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { useEffect, useRef } from "react";
import { clsx } from "clsx";
import { SpriteIcon } from "@/components/ui/sprite-icon";
import { groupNav, isCurrent, type NavItem } from "./nav-groups";

const linkClass = "flex min-h-11 items-center whitespace-nowrap rounded-md px-3 text-sm font-medium text-ink hover:bg-resin-soft";
const currentClass = "bg-resin-soft text-resin-dark";

/**
 * The main navigation: the everyday pages as links, the rest under one "More" disclosure (a
 * <details> element, so it opens without JavaScript too; the script adds Escape, outside click,
 * focus leaving and page change to close it). Links keep their names wherever they sit.
 */
export function MainNav({ items }: { items: NavItem[] }) {
  const pathname = usePathname() ?? "";
  const { primary, more } = groupNav(items);
  const details = useRef<HTMLDetailsElement>(null);
  const navRef = useRef<HTMLElement>(null);
  const moreIsCurrent = more.some((i) => isCurrent(i.href, pathname));

  useEffect(() => {
    if (details.current) details.current.open = false;
  }, [pathname]);

  useEffect(() => {
    navRef.current?.setAttribute("data-enhanced", "true");
    const d = details.current;
    if (!d) return;
    const close = (focusSummary: boolean) => {
      if (!d.open) return;
      d.open = false;
      if (focusSummary) d.querySelector("summary")?.focus();
    };
    const onPointerDown = (e: PointerEvent) => {
      if (!d.contains(e.target as Node)) close(false);
    };
    const onKeyDown = (e: KeyboardEvent) => {
      if (e.key === "Escape" && d.open) {
        e.preventDefault();
        close(true);
      }
    };
    const onFocusOut = (e: FocusEvent) => {
      if (e.relatedTarget instanceof Node && !d.contains(e.relatedTarget)) close(false);
    };
    document.addEventListener("pointerdown", onPointerDown);
    d.addEventListener("keydown", onKeyDown);
    d.addEventListener("focusout", onFocusOut);
    return () => {
      document.removeEventListener("pointerdown", onPointerDown);
      d.removeEventListener("keydown", onKeyDown);
      d.removeEventListener("focusout", onFocusOut);
    };
  }, [more.length]);

  return (
    <nav ref={navRef} aria-label="Main" className="relative order-last -mx-2 w-full sm:order-none sm:w-auto sm:flex-1">
      <ul className="flex flex-wrap items-center gap-x-1">
        {primary.map((item) => (
          <li key={item.href}>
            <NavLink item={item} current={isCurrent(item.href, pathname)} />
          </li>
        ))}
        {more.length > 0 ? (
          <li>
            <details ref={details} className="group sm:relative">
              <summary className={clsx(linkClass, "cursor-pointer list-none gap-1 [&::-webkit-details-marker]:hidden", moreIsCurrent && currentClass)}>
                More
                <SpriteIcon name="chevron-down" className="size-4 transition-transform group-open:rotate-180" />
              </summary>
              <ul className="absolute inset-x-0 top-full z-30 mt-1 rounded-md border border-line bg-card p-1 shadow-lg sm:left-auto sm:right-0 sm:w-56">
                {more.map((item) => (
                  <li key={item.href}>
                    <NavLink item={item} current={isCurrent(item.href, pathname)} />
                  </li>
                ))}
              </ul>
            </details>
          </li>
        ) : null}
      </ul>
    </nav>
  );
}

function NavLink({ item, current }: { item: NavItem; current: boolean }) {
  return (
    <Link href={item.href} aria-current={current ? "page" : undefined} className={clsx(linkClass, current && currentClass)}>
      {item.label}
    </Link>
  );
}
