import type { StudioRole } from "@/lib/care/vocabulary";
import { outboxEnabled } from "@/lib/env";

type Item = { href: string; label: string; roles: readonly StudioRole[] };

// The studio area's pages and who may open each. The pages check the same roles through lib/auth.
const STUDIO_NAV: Item[] = [
  { href: "/studio", label: "Overview", roles: ["admin", "staff"] },
  { href: "/studio/today", label: "My day", roles: ["technician"] },
  { href: "/studio/pieces", label: "Pieces", roles: ["admin", "staff"] },
  { href: "/studio/clients", label: "Clients", roles: ["admin", "staff"] },
  { href: "/studio/reminders", label: "Reminders", roles: ["admin", "staff"] },
  { href: "/studio/claims", label: "Claims", roles: ["admin", "staff"] },
  { href: "/studio/jobs", label: "Repair jobs", roles: ["admin", "staff"] },
  { href: "/studio/visits", label: "Visits", roles: ["admin", "staff"] },
  { href: "/studio/catalog", label: "Finish catalog", roles: ["admin"] },
  { href: "/studio/reports", label: "Reports", roles: ["admin", "staff"] },
  { href: "/studio/audit", label: "Audit", roles: ["admin", "staff"] },
  { href: "/studio/team", label: "Team", roles: ["admin"] },
  { href: "/studio/settings", label: "Settings", roles: ["admin"] },
  { href: "/studio/outbox", label: "Outbox", roles: ["admin"] },
];

export function studioNavFor(role: StudioRole) {
  return STUDIO_NAV.filter((i) => i.roles.includes(role) && (i.href !== "/studio/outbox" || outboxEnabled)).map(
    ({ href, label }) => ({ href, label }),
  );
}
