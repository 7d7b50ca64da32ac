// Warranty lines as an owner sees them: each line of the piece's policy version, its term from the
// delivery date, the time left today, and whether it passed to this owner (transfersToNewOwner).
// Pure: used by the piece page, the API and the certificate PDF.
import type { WarrantyPolicy } from "@/lib/care/coverage";
import { addMonths, diffDays, type IsoDate } from "@/lib/care/dates";
import { CLAIM_CATEGORIES, type ClaimCategory, type ClaimExclusion, type ResinKind, type Use } from "@/lib/care/vocabulary";

export type WarrantyLineStatus = "active" | "ended" | "not_transferred";

export type OwnerWarrantyLine = {
  category: ClaimCategory;
  label: string;
  termMonths: number;
  endsOn: IsoDate;
  /** Days left today; negative once the term has ended. */
  daysLeft: number;
  /** Share of the term still to run, 0–100: the bar on the piece page shows time left, emptying as it runs out. */
  timeLeftPct: number;
  status: WarrantyLineStatus;
  transfersToNewOwner: boolean;
  exclusions: readonly string[];
  careLogRequired: boolean;
};

/** What of the piece decides which lines and exclusions can apply to it. */
export type WarrantyPieceFacts = { resin: ResinKind; use: Use; hasEpoxyLayer?: boolean };

/** Lines that can never apply to a piece are not shown: no resin line on a piece without resin. */
export function lineApplies(category: ClaimCategory, piece: WarrantyPieceFacts): boolean {
  if (category === "resin_clouding") return piece.resin !== "none" || Boolean(piece.hasEpoxyLayer);
  return true;
}

/** Exclusions that can apply to this piece (an outdoor piece has no "outdoor use of an indoor piece"). */
export function exclusionsFor(exclusions: readonly string[], piece: WarrantyPieceFacts): string[] {
  const hasResin = piece.resin !== "none" || Boolean(piece.hasEpoxyLayer);
  const outdoor = piece.use === "outdoor_covered";
  return exclusions.filter((e) => {
    if (e === "outdoor_use_of_indoor_piece") return !outdoor;
    if (e === "direct_sun_on_indoor_resin") return hasResin && !outdoor;
    if (e.includes("resin")) return hasResin;
    return true;
  });
}

export function warrantyLinesFor(policy: WarrantyPolicy, deliveredOn: IsoDate, today: IsoDate, isOriginalOwner: boolean, piece: WarrantyPieceFacts): OwnerWarrantyLine[] {
  const out: OwnerWarrantyLine[] = [];
  for (const category of CLAIM_CATEGORIES) {
    const line = policy.lines[category];
    if (!line || !lineApplies(category, piece)) continue;
    const endsOn = addMonths(deliveredOn, line.termMonths);
    const daysLeft = diffDays(today, endsOn);
    const termDays = Math.max(1, diffDays(deliveredOn, endsOn));
    const status: WarrantyLineStatus = !isOriginalOwner && !line.transfersToNewOwner ? "not_transferred" : daysLeft < 0 ? "ended" : "active";
    out.push({
      category,
      label: line.label,
      termMonths: line.termMonths,
      endsOn,
      daysLeft,
      timeLeftPct: Math.min(100, Math.max(0, Math.round((daysLeft / termDays) * 100))),
      status,
      transfersToNewOwner: line.transfersToNewOwner,
      exclusions: exclusionsFor(line.exclusions, piece),
      careLogRequired: Boolean(line.careLog),
    });
  }
  return out;
}

export const WARRANTY_STATUS_LABELS: Record<WarrantyLineStatus, string> = {
  active: "In force",
  ended: "Term ended",
  not_transferred: "Stayed with the first owner",
};

/** An exclusion in owner words; a stored key the vocabulary no longer knows reads as words, never as its key. */
export function exclusionLabel(e: string): string {
  return (EXCLUSION_LABELS as Record<string, string>)[e] ?? e.replace(/_/g, " ");
}

/** Every exclusion of the vocabulary in owner words (typed by it, so a new exclusion cannot ship without words). */
export const EXCLUSION_LABELS: Record<ClaimExclusion, string> = {
  heat: "heat damage",
  chemicals: "chemical damage",
  impact: "knocks and drops",
  outdoor_use_of_indoor_piece: "outdoor use of an indoor piece",
  direct_sun_on_indoor_resin: "direct sun on indoor resin",
  sun_on_resin: "sun on the resin (resin yellows in daylight)",
};
