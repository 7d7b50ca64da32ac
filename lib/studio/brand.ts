// The studio's own brand: its name, its logo (lib/storage, re-encoded like piece photos) and one accent
// colour from a small set of our own. Every accent is dark enough that white text on it, and it as text
// on white or on the paper background, keep at least 4.5:1 (WCAG AA for normal text); the unit test
// tests/unit/brand.test.ts computes each ratio. No server-only imports: e-mails, PDFs and pages share it.

export const ACCENTS = {
  default: { label: "Resin teal", hex: "#0f5e5e" },
  walnut: { label: "Walnut brown", hex: "#6b4226" },
  oxblood: { label: "Oxblood red", hex: "#8a2b2b" },
  moss: { label: "Moss green", hex: "#3d5c2a" },
  slate: { label: "Slate blue", hex: "#3b4a5c" },
  indigo: { label: "Ink indigo", hex: "#33407a" },
  plum: { label: "Plum", hex: "#6a3462" },
  charcoal: { label: "Charcoal", hex: "#2f2f2f" },
} as const;

export type AccentName = keyof typeof ACCENTS;
export const ACCENT_NAMES = Object.keys(ACCENTS) as AccentName[];

/** Backgrounds an accent is shown on (text in the accent) or under (white text on the accent). */
export const BRAND_SURFACES = { white: "#ffffff", paper: "#faf7f2", card: "#fffdf9" } as const;

export function accentOf(name: string | null | undefined): (typeof ACCENTS)[AccentName] {
  return ACCENTS[(name ?? "default") as AccentName] ?? ACCENTS.default;
}

/** What the studio's pages, mails and PDFs show as its brand. */
export type StudioBrand = {
  name: string;
  /** Absolute or root-relative URL of the logo, or null for the name alone. */
  logoUrl: string | null;
  accent: string;
};

/** The public path of a studio's logo (app/api/studio-logo/[studioId]/route.ts); the key changes with each upload. */
export function logoPath(studio: { id: string; logoKey: string | null }): string | null {
  if (!studio.logoKey) return null;
  const version = studio.logoKey.replace(/^.*\/|\..*$/g, "").slice(0, 8);
  return `/api/studio-logo/${studio.id}?v=${version}`;
}

export function brandOf(studio: { id: string; name: string; logoKey: string | null; accent: string }, base = ""): StudioBrand {
  const path = logoPath(studio);
  return { name: studio.name, logoUrl: path ? `${base}${path}` : null, accent: accentOf(studio.accent).hex };
}

// ---- contrast (WCAG 2.2, definitions: relative luminance, contrast ratio) ----

function channel(c8: number): number {
  const c = c8 / 255;
  // WCAG 2.2, definitions: relative luminance (sRGB linearisation; 0.04045 is the sRGB standard's threshold).
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

/** WCAG 2.2, definitions: relative luminance, L = 0.2126 R + 0.7152 G + 0.0722 B. */
export function relativeLuminance(hex: string): number {
  const m = /^#([0-9a-f]{2})([0-9a-f]{2})([0-9a-f]{2})$/i.exec(hex);
  if (!m) throw new Error(`not a #rrggbb colour: ${hex}`);
  const [r, g, b] = [m[1]!, m[2]!, m[3]!].map((h) => channel(parseInt(h, 16))) as [number, number, number];
  return 0.2126 * r + 0.7152 * g + 0.0722 * b;
}

/** WCAG 2.2, definitions: contrast ratio, (L1 + 0.05) / (L2 + 0.05) with L1 the lighter. */
export function contrastRatio(a: string, b: string): number {
  const [la, lb] = [relativeLuminance(a), relativeLuminance(b)];
  return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05);
}
