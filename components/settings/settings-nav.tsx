"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { cn } from "@/components/ui/cn";
import { SpriteIcon } from "@/components/ui/sprite-icon";

const ITEMS = [
  { href: "/studio/settings", label: "Profile and rates" },
  { href: "/studio/settings/warranty", label: "Warranty policy" },
  { href: "/studio/settings/plans", label: "Care plans" },
  { href: "/studio/settings/reminders", label: "Reminder timing" },
  { href: "/studio/settings/visits", label: "Visit booking" },
  { href: "/studio/settings/repairs", label: "Repair prices and tax" },
  { href: "/studio/settings/emails", label: "E-mail previews" },
  { href: "/studio/setup/brand", label: "Logo and colour", away: true },
  { href: "/studio/setup/mail", label: "E-mail sender", away: true },
  { href: "/studio/setup/payments", label: "Online payments", away: true },
  { href: "/studio/catalog", label: "Finish catalog", away: true },
  { href: "/studio/team", label: "Team", away: true },
];

export function SettingsNav() {
  const path = usePathname();
  return (
    <nav aria-label="Settings" className="-mx-1 flex gap-1 overflow-x-auto lg:mx-0 lg:flex-col">
      {ITEMS.map((i) => {
        const active = i.href === "/studio/settings" ? path === i.href : path.startsWith(i.href);
        return (
          <Link
            key={i.href}
            href={i.href}
            aria-current={active ? "page" : undefined}
            className={cn("flex min-h-11 items-center gap-1.5 whitespace-nowrap rounded-lg px-3 text-sm font-medium", active ? "bg-resin-soft text-resin-dark" : "text-ink hover:bg-resin-soft/60")}
          >
            {i.label}
            {i.away ? <SpriteIcon name="external-link" className="size-3.5 text-muted" /> : null}
          </Link>
        );
      })}
    </nav>
  );
}
