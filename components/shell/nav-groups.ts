// How the header lays out a role's navigation (UI only: which pages a role may open is decided in
// lib/auth/navigation.ts, and this never adds or drops an item, it only places it).
export type NavItem = { href: string; label: string };

/** Pages used every day stay in the bar; everything else goes under "More" once the list is long. */
const EVERYDAY = new Set(["/studio", "/studio/today", "/studio/pieces", "/studio/claims", "/studio/jobs", "/studio/visits"]);
/** Up to this many items all fit in the bar at 1280 px, so they are shown as they are. */
const FITS = 6;

export function groupNav(items: readonly NavItem[]): { primary: NavItem[]; more: NavItem[] } {
  if (items.length <= FITS) return { primary: [...items], more: [] };
  const primary = items.filter((i) => EVERYDAY.has(i.href));
  const more = items.filter((i) => !EVERYDAY.has(i.href));
  // A list with too few everyday pages would leave the bar empty: keep the first ones in it.
  if (primary.length === 0) return { primary: items.slice(0, FITS - 1), more: items.slice(FITS - 1) };
  return { primary, more };
}

/** Whether a nav item is the page being shown (or a page below it; "/studio" only itself). */
export function isCurrent(href: string, pathname: string): boolean {
  if (pathname === href) return true;
  return href !== "/studio" && pathname.startsWith(`${href}/`);
}
